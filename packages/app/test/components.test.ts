import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter } from 'vue-router';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '@loopwright/dsp';
import SpecForm from '../src/components/SpecForm.vue';
import MarginsSummary from '../src/components/MarginsSummary.vue';
import VerdictStrip from '../src/components/VerdictStrip.vue';
import SignInView from '../src/views/SignInView.vue';
import { specToDraft } from '../src/form/specDraft.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';
import { bodeMarkers } from '../src/components/analysisView.ts';
import { sessionApi } from '../src/api/sessionApi.ts';
import { ApiError } from '../src/api/client.ts';

/** Element Plus shows a form item's message after a short debounce. */
async function settle(): Promise<void> {
  await flushPromises();
  await new Promise((r) => setTimeout(r, 250));
  await flushPromises();
}

describe('spec form', () => {
  it('shows a unit beside every input field', () => {
    const wrapper = mount(SpecForm, { props: { draft: specToDraft(mainsSyncSpec), errors: {} } });
    const inputs = wrapper.findAll('.el-input');
    expect(inputs.length).toBeGreaterThan(15);
    for (const input of inputs) expect(input.find('.unit').text()).not.toBe('');
    const clock = wrapper.find('input[data-test="clock-hz"]');
    expect(clock.element.closest('.el-input')?.querySelector('.unit')?.textContent).toBe('Hz');
  });

  it('shows the fields of the chosen filter setting only', () => {
    const byTargets = mount(SpecForm, { props: { draft: specToDraft(mainsSyncSpec), errors: {} } });
    expect(byTargets.find('input[data-test="filter-natural-hz"]').exists()).toBe(true);
    expect(byTargets.find('input[data-test="filter-tau1-s"]').exists()).toBe(false);
    const singlePole = mount(SpecForm, { props: { draft: specToDraft(ultrasonicSinglePoleSpec), errors: {} } });
    expect(singlePole.find('input[data-test="filter-cutoff-hz"]').exists()).toBe(true);
    expect(singlePole.find('input[data-test="filter-damping"]').exists()).toBe(false);
  });

  it('puts each message under its field and emits edits by spec path', async () => {
    const wrapper = mount(SpecForm, { props: { draft: specToDraft(mainsSyncSpec), errors: { centerHz: 'must be below sampleRateHz/2' } } });
    await settle();
    const item = wrapper.find('input[data-test="center-hz"]').element.closest('.el-form-item')!;
    expect(item.querySelector('.el-form-item__error')?.textContent).toContain('must be below sampleRateHz/2');
    await wrapper.find('input[data-test="center-hz"]').setValue('60');
    expect(wrapper.emitted('change')?.at(-1)).toEqual(['centerHz', '60']);
  });

  it('lists a schema message that no visible field shows, rather than dropping it', () => {
    const wrapper = mount(SpecForm, { props: { draft: specToDraft(mainsSyncSpec), errors: { 'filter.tau1S': 'needs tau2S' } } });
    expect(wrapper.text()).toContain('τ1 needs τ2.');
  });
});

describe('margins summary and verdict', () => {
  // The worker's own job function, run here in-process on demo specs. Phase margin of the second-order
  // loop as a function of damping (Og5): 65.5° at ζ = 0.707, 22.6° at ζ = 0.2; the 2nd-order ripple
  // filter of the mains demo takes some of it (49.5° and 11.9° here), so one passes 45° and one fails.
  const analysis = analyzeJob(mainsSyncSpec);
  const weak = analyzeJob({ ...mainsSyncSpec, filter: { kind: 'pi', naturalHz: 5, damping: 0.2 } });
  // A single-pole loop with K·T = 0.5·2π·1e6 / 1e6 = π > 2: past the limit K·T < 2 of even a first-order
  // sampled loop, so the discrete loop is unstable while its analog prototype is not (common practice, no source).
  const unstable = analyzeJob({ ...ultrasonicSinglePoleSpec, nco: { ...ultrasonicSinglePoleSpec.nco, gainHzPerUnit: 1e6 } });

  it('shows the discrete phase margin the analysis computed and passes it against the 45° target', () => {
    const wrapper = mount(MarginsSummary, { props: { analysis } });
    const pm = analysis.analysis.margins.discrete.phaseMarginDeg!;
    expect(pm).toBeGreaterThan(45);
    expect(wrapper.find('[data-test="row-phase-margin-discrete"]').text()).toBe(`${pm.toFixed(1)} °`);
    expect(wrapper.find('[data-test="row-phase-margin"] td:last-child').text()).toBe('✓ ≥ 45°');
  });

  it('fails the phase-margin row of a weakly damped loop', () => {
    const wrapper = mount(MarginsSummary, { props: { analysis: weak } });
    expect(weak.analysis.margins.discrete.phaseMarginDeg!).toBeLessThan(45);
    expect(wrapper.find('[data-test="row-phase-margin"] td:last-child').text()).toBe('✗ ≥ 45°');
  });

  it('says margins met for the demo loop', () => {
    const wrapper = mount(VerdictStrip, { props: { analysis, stale: false, error: '' } });
    expect(wrapper.find('[data-test="verdict-label"]').text()).toBe('Stable — margins met');
  });

  it('says stable but margins not met, with the reason, for the weak loop, and marks a stale spec', () => {
    const wrapper = mount(VerdictStrip, { props: { analysis: weak, stale: true, error: '' } });
    expect(wrapper.find('[data-test="verdict-label"]').text()).toBe('Stable — margins not met');
    expect(wrapper.text()).toContain('below 45°');
    expect(wrapper.text()).toContain('showing the last valid spec');
  });

  // 6-bit coefficients round the mains loop's filter until a closed-loop pole leaves the unit circle
  // (the dsp verdict says so); a margin is only defined for a stable loop (common practice, no source).
  const quantisedUnstable = analyzeJob({ ...mainsSyncSpec, fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 6 } });

  it('shows no margin and no pass mark for a loop whose quantised coefficients make it unstable', () => {
    expect(quantisedUnstable.analysis.quantization.loop?.stable).toBe(false);
    const wrapper = mount(MarginsSummary, { props: { analysis: quantisedUnstable } });
    for (const row of ['row-stability', 'row-phase-margin', 'row-gain-margin']) {
      expect(wrapper.find(`[data-test="${row}"] td:last-child`).text()).toMatch(/^✗/);
    }
    const gm = wrapper.findAll('[data-test="row-gain-margin"] td');
    expect(gm[2]!.text()).toBe('none (unstable)');
    expect(wrapper.find('[data-test="row-phase-margin"]').findAll('td')[2]!.text()).toBe('none (unstable)');
    expect(wrapper.find('[data-test="margins-table"]').text()).not.toContain('✓');
    expect(wrapper.find('[data-test="margins-table"]').text()).not.toContain('unbounded');
    const strip = mount(VerdictStrip, { props: { analysis: quantisedUnstable, stale: false, error: '' } });
    expect(strip.find('[data-test="verdict-label"]').text()).toBe('Unstable');
    expect(strip.find('[data-test="verdict-phase-margin"]').exists()).toBe(false);
    expect(strip.find('[data-test="verdict-no-margin"]').text()).toBe('no margin: the loop is unstable');
  });

  it('marks no margin on the Bode plot of an unstable discrete loop', () => {
    const m = bodeMarkers(unstable.analysis, 1e6);
    expect(m.phaseMarginDeg).toBeNull();
    expect(m.gainMarginDb).toBeNull();
    expect(bodeMarkers(analysis.analysis, 1e4).phaseMarginDeg).toBe(analysis.analysis.margins.discrete.phaseMarginDeg);
  });

  it('says unstable for a loop whose discrete poles leave the unit circle', () => {
    const wrapper = mount(VerdictStrip, { props: { analysis: unstable, stale: false, error: '' } });
    expect(wrapper.find('[data-test="verdict-label"]').text()).toBe('Unstable');
    expect(wrapper.text()).toContain('The discrete loop is unstable');
  });
});

describe('sign-in view', () => {
  it('shows the server refusal in the form, and stays on the page', async () => {
    setActivePinia(createPinia());
    vi.spyOn(sessionApi, 'signIn').mockRejectedValue(new ApiError(401, 'unauthenticated', 'wrong e-mail or password, or the account is disabled'));
    const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/sign-in', name: 'sign-in', component: SignInView }] });
    await router.push('/sign-in');
    const wrapper = mount(SignInView, { global: { plugins: [router] }, attachTo: document.body });
    await wrapper.find('input[data-test="email"]').setValue('designer@example.test');
    await wrapper.find('input[data-test="password"]').setValue('nope');
    await wrapper.find('[data-test="sign-in"]').trigger('click');
    await settle();
    expect(wrapper.find('[data-test="sign-in-error"]').text()).toBe('Wrong e-mail or password, or the account is disabled.');
    expect(router.currentRoute.value.name).toBe('sign-in');
    wrapper.unmount();
  });

  it('does not call the server when the e-mail is not an address', async () => {
    setActivePinia(createPinia());
    const signIn = vi.spyOn(sessionApi, 'signIn');
    signIn.mockClear();
    const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/sign-in', name: 'sign-in', component: SignInView }] });
    await router.push('/sign-in');
    const wrapper = mount(SignInView, { global: { plugins: [router] }, attachTo: document.body });
    await wrapper.find('input[data-test="email"]').setValue('not-an-address');
    await wrapper.find('input[data-test="password"]').setValue('x');
    await wrapper.find('[data-test="sign-in"]').trigger('click');
    await settle();
    expect(signIn).not.toHaveBeenCalled();
    expect(wrapper.text()).toContain('That is not an e-mail address');
    wrapper.unmount();
  });
});
