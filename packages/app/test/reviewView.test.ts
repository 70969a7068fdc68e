import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter } from 'vue-router';
import { mainsSyncSpec } from '@loopwright/dsp';
import { reviewLinksApi } from '../src/api/reviewLinksApi.ts';
import { ApiError } from '../src/api/client.ts';
import type { ReleaseVerificationRecord, ReviewLinkView } from '../src/api/types.ts';

// The release report draws plots through the worker, and the evidence reads the release's files over
// HTTP; this test is about the decision.
vi.mock('../src/components/ReleaseReport.vue', () => ({ default: { render: () => null } }));
vi.mock('../src/components/ReviewEvidence.vue', () => ({ default: { render: () => null } }));
const { default: ReviewView } = await import('../src/views/ReviewView.vue');

const SHA = 'f'.repeat(64);
const PASSED: ReleaseVerificationRecord = {
  state: 'done', progress: null, verdict: 'passed', summary: 'reference RTL bit-exact in GHDL and Icarus on 4096 samples', verification: null, estimate: null,
  attempts: 1, startedAt: null, finishedAt: null, approvable: true, blockedReason: null,
};
const view: ReviewLinkView = {
  reviewerName: 'Robin Reviewer',
  expiresAt: '2026-12-09T00:00:00Z',
  diff: null,
  previous: null,
  release: {
    id: 3, designId: 1, number: 1, label: 'v1', state: 'in-review', manifestSha256: SHA, specSha256: 'e'.repeat(64), designRevision: 2,
    createdById: 1, createdByName: 'Dana Designer', createdAt: '', stateChangedAt: '', designName: 'Mains sync PI loop', projectId: 1,
    spec: mainsSyncSpec, results: null, files: [], approvalsRequired: 1, approvals: 0, reviews: [], allowedEvents: ['approve', 'request-changes'],
    caution: 'A release is a design aid.', verification: PASSED, withdrawnReason: null,
  },
};

async function mountAt(token: string) {
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/review/:token', name: 'review', component: ReviewView }] });
  await router.push(`/review/${token}`);
  const wrapper = mount(ReviewView, { global: { plugins: [router] } });
  await flushPromises();
  return wrapper;
}

async function settle(): Promise<void> {
  await flushPromises();
  await new Promise((r) => setTimeout(r, 250));
  await flushPromises();
}

describe('review page', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
  });

  it('shows the caution and decides with a POST bound to the manifest hash', async () => {
    vi.spyOn(reviewLinksApi, 'read').mockResolvedValue(view);
    const decide = vi.spyOn(reviewLinksApi, 'decide').mockResolvedValue({ decision: 'approve', state: 'approved', approvals: 1, approvalsRequired: 1 });
    const wrapper = await mountAt('tok.en');
    expect(wrapper.find('[data-test="safety-notice"]').text()).toBe('A release is a design aid.');
    await wrapper.find('[data-test="submit-decision"]').trigger('click');
    await flushPromises();
    expect(decide).toHaveBeenCalledWith('tok.en', { decision: 'approve', manifestSha256: SHA });
    expect(wrapper.find('[data-test="review-outcome"]').text()).toContain('approved');
  });

  it('stops reading the link once the decision is sent, while the yosys estimate is still running', async () => {
    // The page reads the link every 2 s until verification is done; a spent link must not be read again.
    const running = { ...view, release: { ...view.release, verification: { ...PASSED, state: 'running' as const } } };
    const read = vi.spyOn(reviewLinksApi, 'read').mockResolvedValue(running);
    vi.spyOn(reviewLinksApi, 'decide').mockResolvedValue({ decision: 'approve', state: 'approved', approvals: 1, approvalsRequired: 1 });
    const wrapper = await mountAt('tok.en');
    await wrapper.find('[data-test="submit-decision"]').trigger('click');
    await flushPromises();
    await new Promise((r) => setTimeout(r, 2500));
    await flushPromises();
    expect(read).toHaveBeenCalledTimes(1);
    expect(wrapper.find('[data-test="review-outcome"]').text()).toContain('approved');
  });

  it('asks for a comment before sending "ask for changes"', async () => {
    vi.spyOn(reviewLinksApi, 'read').mockResolvedValue(view);
    const decide = vi.spyOn(reviewLinksApi, 'decide').mockResolvedValue({ decision: 'request-changes', state: 'changes-requested', approvals: 0, approvalsRequired: 1 });
    const wrapper = await mountAt('t');
    await wrapper.find('input[value="request-changes"]').setValue(true);
    await settle();
    expect(wrapper.find('[data-test="submit-decision"]').attributes('disabled')).toBeDefined();
    expect(wrapper.text()).toContain('Say what should change');
    await wrapper.find('textarea[data-test="review-comment"]').setValue('  Raise the damping.  ');
    await wrapper.find('[data-test="submit-decision"]').trigger('click');
    await flushPromises();
    expect(decide).toHaveBeenCalledWith('t', { decision: 'request-changes', manifestSha256: SHA, comment: 'Raise the damping.' });
  });

  it('shows why a used or expired link cannot open', async () => {
    vi.spyOn(reviewLinksApi, 'read').mockRejectedValue(new ApiError(410, 'conflict', 'this review link was already used', 'token'));
    const wrapper = await mountAt('used');
    expect(wrapper.find('[data-test="review-error"]').text()).toContain('already used');
    expect(wrapper.find('[data-test="submit-decision"]').exists()).toBe(false);
  });

  it('shows the server verification and refuses to send an approval of RTL that failed it', async () => {
    const failed: ReleaseVerificationRecord = {
      ...PASSED,
      verdict: 'failed',
      summary: 'reference RTL FAILED: GHDL at sample 17, filter_code expected 5 got 6',
      approvable: false,
      blockedReason: 'reference RTL FAILED: GHDL at sample 17, filter_code expected 5 got 6; approval is blocked: the designer must withdraw this release and cut a new one',
    };
    vi.spyOn(reviewLinksApi, 'read').mockResolvedValue({ ...view, release: { ...view.release, verification: failed } });
    const decide = vi.spyOn(reviewLinksApi, 'decide').mockResolvedValue({ decision: 'request-changes', state: 'changes-requested', approvals: 0, approvalsRequired: 1 });
    const wrapper = await mountAt('t');
    expect(wrapper.find('[data-test="rtl-verification-summary"]').text()).toBe(failed.summary);
    expect(wrapper.find('[data-test="approval-blocked"]').text()).toContain('the designer must withdraw this release');
    expect(wrapper.find('[data-test="submit-decision"]').attributes('disabled')).toBeDefined();
    // Asking for changes stays possible.
    await wrapper.find('input[value="request-changes"]').setValue(true);
    await wrapper.find('textarea[data-test="review-comment"]').setValue('The RTL fails in GHDL.');
    await settle();
    expect(wrapper.find('[data-test="approval-blocked"]').exists()).toBe(false);
    await wrapper.find('[data-test="submit-decision"]').trigger('click');
    await flushPromises();
    expect(decide).toHaveBeenCalledWith('t', { decision: 'request-changes', manifestSha256: SHA, comment: 'The RTL fails in GHDL.' });
  });
});
