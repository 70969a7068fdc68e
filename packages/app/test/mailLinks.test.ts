/**
 * The pages mail links open: the reviewer's list of what waits, Downloads opened on the release the
 * approved mail names (?release=<id>), and its notice when that release is no longer approved.
 * Expected rows are written from the mocked API answers (common practice, no source).
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter } from 'vue-router';
import { mainsSyncSpec } from '@loopwright/dsp';
import { releasesApi } from '../src/api/releasesApi.ts';
import { projectsApi } from '../src/api/projectsApi.ts';
import type { ReleaseRecord } from '../src/api/types.ts';
import ReviewsView from '../src/views/ReviewsView.vue';
import DownloadsView from '../src/views/DownloadsView.vue';
import { linkedReleaseId } from '../src/components/releaseView.ts';
import { navItemsFor } from '../src/lib/navigation.ts';

const Blank = { render: () => null };

function router() {
  return createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/reviews', name: 'reviews', component: ReviewsView },
      { path: '/downloads', name: 'downloads', component: DownloadsView },
      { path: '/designs/:designId/releases', name: 'releases', component: Blank },
      { path: '/conformance/:releaseId?', name: 'conformance', component: Blank },
    ],
  });
}

function approved(id: number, label: string): ReleaseRecord {
  return {
    id, designId: 3, number: Number(label.slice(1)), label, state: 'approved', manifestSha256: 'a'.repeat(64), specSha256: 'b'.repeat(64), designRevision: 1,
    createdById: 1, createdByName: 'Dana Designer', createdAt: '2026-01-01T00:00:00Z', stateChangedAt: `2026-01-0${id}T00:00:00Z`, designName: 'Mains sync PI loop',
    projectId: 1, spec: mainsSyncSpec, results: null, files: [{ name: 'manifest.json', mediaType: 'application/json', sizeBytes: 10, sha256: 'c'.repeat(64) }],
    approvalsRequired: 1, approvals: 1, reviews: [], allowedEvents: [], caution: 'design aid', withdrawnReason: null,
    verification: { state: 'done', progress: null, verdict: 'passed', summary: 'ok', verification: null, estimate: null, attempts: 1, startedAt: null, finishedAt: null, approvable: true, blockedReason: null },
  } as ReleaseRecord;
}

describe('pages the mails open', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
  });

  it('lists the reviews waiting for the reviewer, each opening its release', async () => {
    vi.spyOn(releasesApi, 'waitingReviews').mockResolvedValue([
      { releaseId: 42, designId: 3, projectName: 'Inverter mains sync', designName: 'Mains sync PI loop', label: 'v4', requestedByName: 'Dana Designer', requestedAt: '2026-12-01T09:00:00.000Z', expiresAt: '2026-12-08T09:00:00.000Z' },
    ]);
    const r = router();
    await r.push('/reviews');
    const wrapper = mount(ReviewsView, { global: { plugins: [r] } });
    await flushPromises();
    const cells = wrapper.findAll('[data-test="waiting-reviews"] .el-table__body tr td').map((td) => td.text());
    expect(cells.slice(0, 4)).toEqual(['Inverter mains sync', 'Mains sync PI loop', 'v4', 'Dana Designer']);
    expect(wrapper.find('[data-test="open-review-42"]').attributes('href')).toBe('/designs/3/releases?release=42');
    expect(navItemsFor(['reviewer']).map((i) => i.label)).toContain('My reviews');
    expect(navItemsFor(['firmware']).map((i) => i.label)).not.toContain('My reviews');
  });

  it('opens Downloads on the release the approved mail names', async () => {
    vi.spyOn(releasesApi, 'approved').mockResolvedValue([approved(7, 'v1'), approved(8, 'v2')]);
    vi.spyOn(releasesApi, 'get').mockImplementation(async (id: number) => approved(id, id === 7 ? 'v1' : 'v2'));
    vi.spyOn(projectsApi, 'list').mockResolvedValue([]);
    const r = router();
    await r.push('/downloads?release=7');
    const wrapper = mount(DownloadsView, { global: { plugins: [r] } });
    await flushPromises();
    const linked = wrapper.findAll('[data-test="downloads-table"] tr.is-linked');
    expect(linked).toHaveLength(1);
    expect(linked[0]!.text()).toContain('v1');
    expect(wrapper.find('[data-test="downloads-table"] .el-table__expanded-cell').text()).toContain('manifest.json');
    expect(wrapper.find('[data-test="linked-release-missing"]').exists()).toBe(false);

    await r.push('/downloads?release=99');
    await flushPromises();
    expect(wrapper.find('[data-test="linked-release-missing"]').text()).toMatch(/not among the approved releases/);
  });

  it('reads only a plain release id from the link', () => {
    expect([linkedReleaseId('42'), linkedReleaseId(['5']), linkedReleaseId('0'), linkedReleaseId('4x'), linkedReleaseId(undefined)]).toEqual([42, 5, null, null, null]);
  });
});
