import type { DesignListItem, Project } from '../api/types.ts';

export interface ProjectCard {
  readonly id: number;
  readonly name: string;
  readonly description: string;
  readonly designs: readonly DesignRow[];
  readonly countText: string;
}

export interface DesignRow {
  readonly id: number;
  readonly name: string;
  readonly revisionText: string;
  readonly updatedText: string;
  readonly owner: string;
  readonly archived: boolean;
  /** "2 releases", "no release yet". */
  readonly releasesText: string;
  /** Only a design without releases may be deleted; one with releases is archived instead. */
  readonly canDelete: boolean;
  /** The menu entry: "Delete", or why not. */
  readonly deleteLabel: string;
}

export function formatDate(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return d.toISOString().slice(0, 16).replace('T', ' ');
}

function releasesText(n: number): string {
  return n === 0 ? 'no release yet' : n === 1 ? '1 release' : `${n} releases`;
}

export function projectCards(projects: readonly Project[], designs: Readonly<Record<number, readonly DesignListItem[]>>): ProjectCard[] {
  return projects.map((p) => {
    const all = designs[p.id] ?? [];
    // Active designs first, archived ones (listed only on request) after them.
    const list = [...all.filter((d) => !d.archived), ...all.filter((d) => d.archived)];
    const archivedCount = all.filter((d) => d.archived).length;
    const active = all.length - archivedCount;
    return {
      id: p.id,
      name: p.name,
      description: p.description,
      countText: `${active === 1 ? '1 design' : `${active} designs`}${archivedCount > 0 ? ` · ${archivedCount} archived` : ''}`,
      designs: list.map((d) => ({
        id: d.id,
        name: d.name,
        revisionText: `rev ${d.revision}`,
        updatedText: formatDate(d.updatedAt),
        owner: d.ownerName,
        archived: d.archived,
        releasesText: releasesText(d.releaseCount),
        canDelete: d.releaseCount === 0,
        deleteLabel: d.releaseCount === 0 ? 'Delete' : `Delete: no, it has ${releasesText(d.releaseCount)} (archive it)`,
      })),
    };
  });
}
