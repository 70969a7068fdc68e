import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { mainsSyncSpec } from '@loopwright/dsp';
import { useReleasesStore } from '../src/stores/useReleasesStore.ts';
import { useDownloadsStore } from '../src/stores/useDownloadsStore.ts';
import { releasesApi } from '../src/api/releasesApi.ts';
import { designsApi } from '../src/api/designsApi.ts';
import { projectsApi } from '../src/api/projectsApi.ts';
import { ApiError } from '../src/api/client.ts';
import type { ReleaseRecord, ReleaseSummary, ReleaseVerificationRecord } from '../src/api/types.ts';

const PASSED: ReleaseVerificationRecord = {
  state: 'done', progress: null, verdict: 'passed', summary: 'reference RTL bit-exact in GHDL and Icarus on 4096 samples', verification: null, estimate: null,
  attempts: 1, startedAt: null, finishedAt: null, approvable: true, blockedReason: null,
};


function summary(id: number, number: number, stateChangedAt = '2026-01-01T00:00:00Z'): ReleaseSummary {
  return {
    id, designId: 1, number, label: `v${number}`, state: 'approved', manifestSha256: 'a'.repeat(64), specSha256: 'b'.repeat(64),
    designRevision: number, createdById: 1, createdByName: 'Dana Designer', createdAt: stateChangedAt, stateChangedAt,
  };
}

function record(s: ReleaseSummary, projectId = 1): ReleaseRecord {
  return { ...s, designName: 'Mains sync', projectId, spec: mainsSyncSpec, results: null, files: [], approvalsRequired: 1, approvals: 1, reviews: [], allowedEvents: [], caution: 'design aid', verification: PASSED, withdrawnReason: null };
}

describe('releases store', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
    vi.spyOn(designsApi, 'get').mockResolvedValue({ id: 1, projectId: 1, name: 'Mains sync', revision: 4, ownerId: 1, ownerName: 'Dana', archived: false, createdAt: '', updatedAt: '', spec: mainsSyncSpec });
  });

  it('follows a release verification until the server is done with it', async () => {
    const running: ReleaseVerificationRecord = { ...PASSED, state: 'running', verdict: null, summary: 'reference RTL verification running: starting', approvable: false };
    vi.spyOn(releasesApi, 'forDesign').mockResolvedValue([summary(10, 1)]);
    vi.spyOn(releasesApi, 'get').mockResolvedValue({ ...record(summary(10, 1)), verification: running });
    const polled = vi.spyOn(releasesApi, 'verification').mockResolvedValueOnce(running).mockResolvedValueOnce(PASSED);
    const store = useReleasesStore();
    await store.load(1);
    await store.pollVerification(10, 1);
    expect(polled).toHaveBeenCalledTimes(2);
    expect(store.records[10]?.verification.summary).toBe('reference RTL bit-exact in GHDL and Icarus on 4096 samples');
  });

  it('lists the newest release first, with each full record', async () => {
    vi.spyOn(releasesApi, 'forDesign').mockResolvedValue([summary(10, 1), summary(12, 3), summary(11, 2)]);
    vi.spyOn(releasesApi, 'get').mockImplementation(async (id) => record(summary(id, id - 9)));
    const store = useReleasesStore();
    await store.load(1);
    expect(store.releases.map((r) => r.label)).toEqual(['v3', 'v2', 'v1']);
    expect(Object.keys(store.records).sort()).toEqual(['10', '11', '12']);
  });

  it('names the newest release whose spec a cut would repeat, and none once the spec changed (common practice, no source)', async () => {
    vi.spyOn(releasesApi, 'forDesign').mockResolvedValue([summary(10, 1), summary(11, 2)]);
    vi.spyOn(releasesApi, 'get').mockImplementation(async (id) => record(summary(id, id - 9)));
    const store = useReleasesStore();
    await store.load(1);
    expect(await store.unchangedSince()).toBe('v2');
    const edited = { id: 1, projectId: 1, name: 'Mains sync', revision: 5, ownerId: 1, ownerName: 'Dana', archived: false, createdAt: '', updatedAt: '', spec: { ...mainsSyncSpec, centerHz: 60 } };
    vi.spyOn(designsApi, 'get').mockResolvedValue(edited);
    expect(await store.unchangedSince()).toBeNull();
    expect(store.design?.revision).toBe(5);
  });

  it('asks nothing before the first release', async () => {
    vi.spyOn(releasesApi, 'forDesign').mockResolvedValue([]);
    const store = useReleasesStore();
    await store.load(1);
    expect(await store.unchangedSince()).toBeNull();
  });

  it('puts a freshly cut release at the top', async () => {
    vi.spyOn(releasesApi, 'forDesign').mockResolvedValue([summary(10, 1)]);
    vi.spyOn(releasesApi, 'get').mockResolvedValue(record(summary(10, 1)));
    vi.spyOn(releasesApi, 'cut').mockResolvedValue({ ...record(summary(11, 2)), state: 'draft' });
    const store = useReleasesStore();
    await store.load(1);
    await store.cut();
    expect(store.releases.map((r) => `${r.label}:${r.state}`)).toEqual(['v2:draft', 'v1:approved']);
    expect(store.cutting).toBe(false);
  });

  it('keeps a refused cut out of the list and passes the error on', async () => {
    vi.spyOn(releasesApi, 'forDesign').mockResolvedValue([]);
    vi.spyOn(releasesApi, 'cut').mockRejectedValue(new ApiError(400, 'invalid_input', 'the loop filter cannot be quantised', 'fixedPoint'));
    const store = useReleasesStore();
    await store.load(1);
    await expect(store.cut()).rejects.toMatchObject({ field: 'fixedPoint' });
    expect(store.releases).toEqual([]);
  });
});

describe('downloads store', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
  });

  it('orders approved releases by approval time, newest first, with project names', async () => {
    const older = summary(1, 1, '2026-01-01T10:00:00Z');
    const newer = summary(2, 2, '2026-02-01T10:00:00Z');
    vi.spyOn(releasesApi, 'approved').mockResolvedValue([older, newer]);
    vi.spyOn(releasesApi, 'get').mockImplementation(async (id) => record(id === 1 ? older : newer, id === 1 ? 5 : 6));
    vi.spyOn(projectsApi, 'list').mockResolvedValue([
      { id: 5, name: 'Inverter mains sync', description: '', archived: false, designCount: 1, createdAt: '', updatedAt: '' },
      { id: 6, name: 'IF FM demodulator', description: '', archived: false, designCount: 1, createdAt: '', updatedAt: '' },
    ]);
    const store = useDownloadsStore();
    await store.load();
    expect(store.releases.map((r) => r.id)).toEqual([2, 1]);
    expect(store.projectNames).toEqual({ 5: 'Inverter mains sync', 6: 'IF FM demodulator' });
  });

  it('shows the newest conformance run first after an upload', async () => {
    const run = (id: number) => ({ id, releaseId: 3, uploadedById: 1, uploadedByName: 'F', fileName: `${id}.csv`, sizeBytes: 1, sha256: 'c', verdict: 'bit-exact' as const, samplesCompared: 4096, mismatchCount: 0, firstMismatches: [], createdAt: '' });
    vi.spyOn(releasesApi, 'conformance').mockResolvedValue([run(1)]);
    vi.spyOn(releasesApi, 'uploadCapture').mockResolvedValue(run(2));
    const store = useDownloadsStore();
    await store.loadRuns(3);
    await store.upload(3, new File(['x'], '2.csv'));
    expect(store.runs[3]!.map((r) => r.id)).toEqual([2, 1]);
    expect(store.uploading).toBe(false);
  });
});
