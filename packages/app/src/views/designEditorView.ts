import type { Design } from '../api/types.ts';
import { formatDate } from './projectsView.ts';

export interface EditorHeader {
  readonly title: string;
  readonly subtitle: string;
  readonly dirty: boolean;
  readonly canSave: boolean;
  readonly status: string;
}

export function editorHeader(design: Design | null, dirty: boolean, issueCount: number, analysing: boolean): EditorHeader {
  if (!design) return { title: 'Loading…', subtitle: '', dirty: false, canSave: false, status: '' };
  const status =
    issueCount > 0
      ? `${issueCount} field${issueCount === 1 ? '' : 's'} to fix — plots show the last valid spec`
      : analysing
        ? 'Analysing…'
        : 'Analysis up to date';
  return {
    title: design.name,
    subtitle: `${design.spec.name} · revision ${design.revision} · ${design.ownerName} · ${formatDate(design.updatedAt)}`,
    dirty,
    canSave: dirty && issueCount === 0,
    status,
  };
}
