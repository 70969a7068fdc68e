import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { mainsSyncSpec } from '@loopwright/dsp';
import { useDesignStore } from '../src/stores/useDesignStore.ts';
import { designsApi } from '../src/api/designsApi.ts';
import { ApiError } from '../src/api/client.ts';
import type { Design } from '../src/api/types.ts';

function design(revision: number, spec = mainsSyncSpec, ownerName = 'Dana Designer'): Design {
  return { id: 7, projectId: 1, name: 'Mains sync', revision, ownerId: 1, ownerName, archived: false, createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-01T00:00:00Z', spec };
}

describe('design store', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
  });

  it('saves the edited spec against the revision it started from and adopts the answer', async () => {
    vi.spyOn(designsApi, 'get').mockResolvedValue(design(3));
    const save = vi.spyOn(designsApi, 'save').mockImplementation(async (_id, req) => design(4, req.spec as typeof mainsSyncSpec));
    const store = useDesignStore();
    await store.load(7);
    expect(store.dirty).toBe(false);
    store.setField('centerHz', '60');
    expect(store.dirty).toBe(true);
    expect(await store.save()).toBe('saved');
    expect(save.mock.calls[0]![1]).toMatchObject({ baseRevision: 3, spec: { centerHz: 60 } });
    expect(store.design?.revision).toBe(4);
    expect(store.dirty).toBe(false);
  });

  it('fills the fields a "set by" switch brings up from the design, so the spec stays valid', async () => {
    vi.spyOn(designsApi, 'get').mockResolvedValue(design(1));
    const store = useDesignStore();
    await store.load(7);
    store.setField('filter.mode', 'time-constants');
    // τ1 = K/ωn², τ2 = 2ζ/ωn with K = 62.832 1/s, ωn = 2π·5 Hz (G3 Ch. 2; test/filterSwitch.test.ts works them out).
    expect(Number(store.draft['filter.tau1S'])).toBeCloseTo(0.063662, 5);
    expect(Number(store.draft['filter.tau2S'])).toBeCloseTo(0.045009, 5);
    expect(store.check.errors).toEqual({});
    store.setField('filter.kind', 'single-pole');
    expect(Number(store.draft['filter.cutoffHz'])).toBeCloseTo(2.5, 5);
    expect(store.check.errors).toEqual({});
  });

  it('refuses to save an invalid draft without calling the server', async () => {
    vi.spyOn(designsApi, 'get').mockResolvedValue(design(1));
    const save = vi.spyOn(designsApi, 'save');
    const store = useDesignStore();
    await store.load(7);
    store.setField('clockHz', '-5');
    expect(await store.save()).toBe('invalid');
    expect(save).not.toHaveBeenCalled();
  });

  it('on a stale revision keeps my draft and shows what each side changed', async () => {
    vi.spyOn(designsApi, 'get').mockResolvedValue(design(1));
    const theirs = design(2, { ...mainsSyncSpec, centerHz: 60, sampleRateHz: 12_000 }, 'Sam Other');
    vi.spyOn(designsApi, 'save').mockRejectedValueOnce(
      new ApiError(409, 'stale_revision', 'revision moved', undefined, { error: { code: 'stale_revision', message: 'moved', current: theirs } }),
    );
    const store = useDesignStore();
    await store.load(7);
    store.setField('centerHz', '55');
    expect(await store.save()).toBe('conflict');
    expect(store.draft['centerHz']).toBe('55');
    const byPath = Object.fromEntries(store.conflict!.changes.map((c) => [c.path, c]));
    expect(byPath['centerHz']).toMatchObject({ base: '50', mine: '55', theirs: '60', clash: true });
    expect(byPath['sampleRateHz']).toMatchObject({ mine: '10000', theirs: '12000', clash: false });
  });

  it('"save mine" puts my edits on their revision and keeps their other changes; "take theirs" drops mine', async () => {
    vi.spyOn(designsApi, 'get').mockResolvedValue(design(1));
    const theirs = design(2, { ...mainsSyncSpec, centerHz: 60, sampleRateHz: 12_000 });
    const save = vi
      .spyOn(designsApi, 'save')
      .mockRejectedValueOnce(new ApiError(409, 'stale_revision', 'moved', undefined, { error: { current: theirs } }))
      .mockResolvedValueOnce(design(3, { ...mainsSyncSpec, centerHz: 55 }));
    const store = useDesignStore();
    await store.load(7);
    store.setField('centerHz', '55');
    await store.save();
    expect(await store.keepMine()).toBe('saved');
    expect(save.mock.calls[1]![1]).toMatchObject({ baseRevision: 2, spec: { centerHz: 55, sampleRateHz: 12_000 } });

    const other = useDesignStore();
    other.conflict = { theirs, changes: [] };
    other.takeTheirs();
    expect(other.draft['centerHz']).toBe('60');
    expect(other.conflict).toBeNull();
  });

  it('passes errors other than a stale revision on to the view', async () => {
    vi.spyOn(designsApi, 'get').mockResolvedValue(design(1));
    vi.spyOn(designsApi, 'save').mockRejectedValue(new ApiError(403, 'forbidden', 'designers only'));
    const store = useDesignStore();
    await store.load(7);
    store.setField('centerHz', '55');
    await expect(store.save()).rejects.toMatchObject({ status: 403 });
    expect(store.conflict).toBeNull();
  });
});
