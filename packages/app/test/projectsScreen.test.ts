import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { mainsSyncSpec } from '@loopwright/dsp';
import { projectCards } from '../src/views/projectsView.ts';
import { useProjectsStore } from '../src/stores/useProjectsStore.ts';
import { projectsApi } from '../src/api/projectsApi.ts';
import { designsApi } from '../src/api/designsApi.ts';
import type { Design, DesignListItem, Project } from '../src/api/types.ts';

const project: Project = { id: 1, name: 'Inverter mains sync', description: '', archived: false, designCount: 3, createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-01T00:00:00Z' };

function item(id: number, name: string, archived: boolean, releaseCount: number): DesignListItem {
  return { id, projectId: 1, name, revision: 2, ownerId: 1, ownerName: 'Dana Designer', archived, releaseCount, createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-02T03:04:00Z' };
}

function record(id: number, archived: boolean): Design {
  const { releaseCount: _n, ...summary } = item(id, `Design ${id}`, archived, 0);
  return { ...summary, spec: mainsSyncSpec };
}

describe('project cards', () => {
  it('lists active designs first, counts the archived apart, and offers delete only without releases', () => {
    const [card] = projectCards([project], { 1: [item(3, 'Old loop', true, 2), item(4, 'PI loop', false, 5), item(5, 'Scratch', false, 0)] });
    expect(card!.countText).toBe('2 designs · 1 archived');
    expect(card!.designs.map((d) => [d.name, d.archived, d.releasesText, d.canDelete])).toEqual([
      ['PI loop', false, '5 releases', false],
      ['Scratch', false, 'no release yet', true],
      ['Old loop', true, '2 releases', false],
    ]);
    expect(card!.designs[0]!.deleteLabel).toMatch(/has 5 releases \(archive it\)/);
    expect(card!.designs[1]!.deleteLabel).toBe('Delete');
  });
});

describe('projects store: design actions', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
    vi.spyOn(projectsApi, 'list').mockResolvedValue([project]);
  });

  it('drops an archived design from the list unless archived ones are shown, keeping its release count', async () => {
    const designs = vi.spyOn(projectsApi, 'designs').mockResolvedValue([item(4, 'PI loop', false, 5)]);
    vi.spyOn(designsApi, 'setArchived').mockImplementation(async (id, archived) => record(id, archived));
    const store = useProjectsStore();
    await store.load();
    expect(designs).toHaveBeenLastCalledWith(1, 'false');
    await store.setArchived(4, true);
    expect(store.designsByProject[1]).toEqual([]);

    designs.mockResolvedValue([item(4, 'PI loop', true, 5)]);
    await store.setShowArchived(true);
    expect(designs).toHaveBeenLastCalledWith(1, 'all');
    await store.setArchived(4, false);
    expect(store.designsByProject[1]?.map((d) => [d.id, d.archived, d.releaseCount])).toEqual([[4, false, 5]]);
  });

  it('adds a duplicate to the project it went into and removes a deleted design', async () => {
    vi.spyOn(projectsApi, 'designs').mockResolvedValue([item(5, 'Scratch', false, 0)]);
    vi.spyOn(designsApi, 'duplicate').mockResolvedValue(record(9, false));
    const remove = vi.spyOn(designsApi, 'remove').mockResolvedValue();
    const store = useProjectsStore();
    await store.load();
    await store.duplicate(5, { name: 'Scratch (copy)', projectId: 1 });
    expect(store.designsByProject[1]?.map((d) => d.id)).toEqual([5, 9]);
    await store.remove(5);
    expect(remove).toHaveBeenCalledWith(5);
    expect(store.designsByProject[1]?.map((d) => d.id)).toEqual([9]);
  });
});

describe('spec import', () => {
  it('sends the file as multipart in the field the API reads, with the title, and CSRF header', async () => {
    const seen: { url?: string; init?: RequestInit } = {};
    vi.stubGlobal('fetch', async (url: string, init: RequestInit) => {
      seen.url = url;
      seen.init = init;
      return new Response(JSON.stringify(record(12, false)), { status: 201, headers: { 'Content-Type': 'application/json' } });
    });
    const file = new File([JSON.stringify(mainsSyncSpec)], 'mains.spec.json', { type: 'application/json' });
    const design = await designsApi.importSpec(3, file, 'Imported mains loop');
    vi.unstubAllGlobals();
    expect(design.id).toBe(12);
    expect(seen.url).toBe('/api/projects/3/designs/upload');
    expect(seen.init?.method).toBe('POST');
    const form = seen.init?.body as FormData;
    expect(form.get('name')).toBe('Imported mains loop');
    expect((form.get('file') as File).name).toBe('mains.spec.json');
    expect((seen.init?.headers as Record<string, string>)['X-Requested-With']).toBe('loopwright');
  });
});
