import type { WaitingReview } from '../api/types.ts';
import { formatDate } from './projectsView.ts';

export interface WaitingRow {
  readonly releaseId: number;
  readonly designId: number;
  readonly project: string;
  readonly design: string;
  readonly label: string;
  readonly askedBy: string;
  readonly asked: string;
  readonly expires: string;
}

export function waitingRows(list: readonly WaitingReview[]): WaitingRow[] {
  return list.map((r) => ({
    releaseId: r.releaseId,
    designId: r.designId,
    project: r.projectName,
    design: r.designName,
    label: r.label,
    askedBy: r.requestedByName,
    asked: formatDate(r.requestedAt),
    expires: formatDate(r.expiresAt),
  }));
}
