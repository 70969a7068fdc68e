import type { DesignSummary, Project } from '../api/types.ts';

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
}

export function formatDate(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return d.toISOString().slice(0, 16).replace('T', ' ');
}

export function projectCards(projects: readonly Project[], designs: Readonly<Record<number, readonly DesignSummary[]>>): ProjectCard[] {
  return projects.map((p) => {
    const list = designs[p.id] ?? [];
    return {
      id: p.id,
      name: p.name,
      description: p.description,
      countText: list.length === 1 ? '1 design' : `${list.length} designs`,
      designs: list.map((d) => ({
        id: d.id,
        name: d.name,
        revisionText: `rev ${d.revision}`,
        updatedText: formatDate(d.updatedAt),
        owner: d.ownerName,
      })),
    };
  });
}
