/** Plain records of the release tables: what leaves the data layer (entities never do). */
import type { ReleaseFileRecord, ReleaseSummary, ReviewRecord } from '@loopwright/contract';
import type { ReleaseState } from '@loopwright/contract';

export interface ReleaseRow {
  id: number;
  designId: number;
  number: number;
  state: ReleaseState;
  manifestSha256: string;
  specSha256: string;
  designRevision: number;
  approvalsRequired: number | null;
  createdById: number;
  createdByName: string;
  createdAt: Date | string;
  stateChangedAt: Date | string;
  designName: string;
  projectId: number;
  projectName: string;
  organizationId: number;
  specJson?: string;
  resultsJson?: string;
}

export const releaseLabel = (n: number) => `v${n}`;
const iso = (d: Date | string) => new Date(d).toISOString();

export function toSummary(row: ReleaseRow): ReleaseSummary {
  return {
    id: Number(row.id),
    designId: Number(row.designId),
    number: Number(row.number),
    label: releaseLabel(Number(row.number)),
    state: row.state,
    manifestSha256: row.manifestSha256,
    specSha256: row.specSha256,
    designRevision: Number(row.designRevision),
    createdById: Number(row.createdById),
    createdByName: row.createdByName,
    createdAt: iso(row.createdAt),
    stateChangedAt: iso(row.stateChangedAt),
  };
}

export interface FileRow {
  name: string;
  mediaType: string;
  sizeBytes: number;
  sha256: string;
}

export function toFileRecord(row: FileRow): ReleaseFileRecord {
  return { name: row.name, mediaType: row.mediaType, sizeBytes: Number(row.sizeBytes), sha256: row.sha256 };
}

export interface ReviewRow {
  id: number;
  reviewerId: number;
  reviewerName: string;
  decision: 'approve' | 'request-changes' | null;
  comment: string | null;
  usedAt: Date | string | null;
  expiresAt: Date | string;
  /** The request mail's outbox row (LEFT JOIN: all null when the review has no mail recorded). */
  mailId: string | null;
  mailSentAt: Date | string | null;
  mailAttempts: number | string | null;
  mailNextAttemptAt: Date | string | null;
}

export function toReviewRecord(row: ReviewRow): ReviewRecord {
  return {
    id: Number(row.id),
    reviewerId: Number(row.reviewerId),
    reviewerName: row.reviewerName,
    decision: row.decision,
    comment: row.comment,
    decidedAt: row.usedAt === null ? null : iso(row.usedAt),
    expiresAt: iso(row.expiresAt),
    mail:
      row.mailId === null
        ? null
        : {
            state: row.mailSentAt === null ? 'waiting' : 'sent',
            attempts: Number(row.mailAttempts ?? 0),
            sentAt: row.mailSentAt === null ? null : iso(row.mailSentAt),
            nextAttemptAt: row.mailSentAt === null && row.mailNextAttemptAt !== null ? iso(row.mailNextAttemptAt) : null,
          },
  };
}
