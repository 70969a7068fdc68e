import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter } from 'vue-router';
import { analyzeDesign, mainsSyncSpec, ultrasonicSinglePoleSpec } from '@loopwright/dsp';
import SpecForm from '../src/components/SpecForm.vue';
import MarginsSummary from '../src/components/MarginsSummary.vue';
import VerdictStrip from '../src/components/VerdictStrip.vue';
import SignInView from '../src/views/SignInView.vue';
import { specToDraft } from '../src/form/specDraft.ts';
import { analyzeJob } from '../src/workers/dspJobs.ts';
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
    expect(wrapper.text()).toContain('filter.tau1S: needs tau2S');
  });
});

describe('margins summary and verdict', () => {
  // The worker's own job function, run here in-process on a demo spec.
  const analysis = analyzeJob(mainsSyncSpec);

  it('shows the discrete phase margin the analysis computed, judged against the 45° target', () => {
    const wrapper = mount(MarginsSummary, { props: { analysis } });
    const pm = analyzeDesign(mainsSyncSpec).margins.discrete.phaseMarginDeg!;
    expect(wrapper.find('[data-test="row-phase-margin-discrete"]').text()).toBe(`${pm.toFixed(1)} °`);
    const target = wrapper.find('[data-test="row-phase-margin"] td:last-child').text();
    expect(target).toBe(pm >= 45 ? '✓ ≥ 45°' : '✗ ≥ 45°');
  });

  it('says fail with the reasons when a margin is missed, and marks a stale spec', () => {
    const weak = analyzeJob({ ...mainsSyncSpec, filter: { kind: 'pi', naturalHz: 5, damping: 0.2 } });
    const wrapper = mount(VerdictStrip, { props: { analysis: weak, stale: true, error: '' } });
    expect(wrapper.find('[data-test="verdict-label"]').text()).toMatch(/margins not met|Unstable/);
    expect(wrapper.text()).toContain('below 45°');
    expect(wrapper.text()).toContain('showing the last valid spec');
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
    expect(wrapper.find('[data-test="sign-in-error"]').text()).toContain('wrong e-mail or password');
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
