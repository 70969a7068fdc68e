/**
 * The Conformance screen after a refused upload: the error stands alone (the previous file's verdict
 * is not left under it as if it were this file's), and picking an earlier upload shows its result again.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter } from 'vue-router';
import { releasesApi } from '../src/api/releasesApi.ts';
import { projectsApi } from '../src/api/projectsApi.ts';
import { ApiError } from '../src/api/client.ts';
import type { ConformanceRecord } from '../src/api/types.ts';

vi.mock('../src/components/MismatchPlot.vue', () => ({ default: { render: () => null } }));
const { default: ConformanceView } = await import('../src/views/ConformanceView.vue');

const earlier: ConformanceRecord = {
  id: 7, releaseId: 3, uploadedById: 2, uploadedByName: 'Finn Firmware', fileName: 'sim_out.csv', sizeBytes: 100, sha256: 'a'.repeat(64),
  verdict: 'bit-exact', samplesCompared: 4096, mismatchCount: 0, firstMismatches: [], createdAt: '2026-12-01T10:00:00Z',
};

async function mountAt() {
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/conformance/:releaseId?', name: 'conformance', component: ConformanceView }] });
  await router.push('/conformance/3');
  const wrapper = mount(ConformanceView, { global: { plugins: [router] } });
  await flushPromises();
  return wrapper;
}

describe('conformance screen', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
    vi.spyOn(releasesApi, 'approved').mockResolvedValue([]);
    vi.spyOn(projectsApi, 'list').mockResolvedValue([]);
    vi.spyOn(releasesApi, 'conformance').mockResolvedValue([earlier]);
  });

  it('drops the previous verdict when an upload is refused, and shows it again when picked from the list', async () => {
    const message = 'empty_run.csv: the file has the wrong length: expected 4,096 samples (one row each after the header, as in the release\u2019s golden vectors), found none (the file holds the header only)';
    vi.spyOn(releasesApi, 'uploadCapture').mockRejectedValue(new ApiError(400, 'invalid_input', message, 'file'));
    const wrapper = await mountAt();
    expect(wrapper.find('[data-test="conformance-verdict"]').text()).toContain('Bit-exact');
    const input = wrapper.find('input[data-test="capture-file"]');
    Object.defineProperty(input.element, 'files', { value: [new File(['sample\n'], 'empty_run.csv', { type: 'text/csv' })] });
    await input.trigger('change');
    await wrapper.find('[data-test="upload-capture"]').trigger('click');
    await flushPromises();
    expect(wrapper.find('[data-test="conformance-error"]').text()).toContain('wrong length: expected 4,096 samples');
    expect(wrapper.find('[data-test="conformance-verdict"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="conformance-refused-note"]').exists()).toBe(true);
    // The earlier upload is still listed; clicking it shows its verdict and clears the refusal.
    await wrapper.find('[data-test="conformance-runs"] tbody tr').trigger('click');
    await flushPromises();
    expect(wrapper.find('[data-test="conformance-verdict"]').text()).toContain('Bit-exact');
    expect(wrapper.find('[data-test="conformance-error"]').exists()).toBe(false);
  });
});
