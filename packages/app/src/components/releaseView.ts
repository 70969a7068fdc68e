/** Display data for releases: state tags, hashes, sizes, the diff as rows. */
import type { ReleaseDiff, ReleaseFileRecord, ReleaseRecord, ReleaseState, ReleaseSummary, ReviewRecord } from '../api/types.ts';
import { formatDate } from '../views/projectsView.ts';
import { SPEC_SECTIONS } from '../form/specFields.ts';

/** The release a link asks for (`?release=<id>`, the approved mail's link), or null for none or a malformed one. */
export function linkedReleaseId(query: unknown): number | null {
  const text = Array.isArray(query) ? query[0] : query;
  return typeof text === 'string' && /^[1-9][0-9]{0,15}$/.test(text) ? Number(text) : null;
}

export type TagType = 'primary' | 'success' | 'warning' | 'info' | 'danger';

const STATE_TEXT: Record<ReleaseState, { text: string; tag: TagType }> = {
  draft: { text: 'draft', tag: 'info' },
  'in-review': { text: 'in review', tag: 'warning' },
  approved: { text: 'approved', tag: 'success' },
  'changes-requested': { text: 'changes requested', tag: 'danger' },
  withdrawn: { text: 'withdrawn', tag: 'info' },
};

export function stateTag(state: ReleaseState): { text: string; tag: TagType } {
  return STATE_TEXT[state];
}

export interface ReleaseRow {
  readonly id: number;
  readonly label: string;
  readonly state: ReleaseState;
  readonly stateText: string;
  readonly stateTag: TagType;
  readonly date: string;
  readonly author: string;
  readonly approvals: string;
  readonly sha256: string;
  readonly shortSha: string;
  readonly revision: string;
}

export function releaseRows(list: readonly ReleaseSummary[], records: Readonly<Record<number, ReleaseRecord>>): ReleaseRow[] {
  return list.map((r) => {
    const full = records[r.id];
    const tag = stateTag(r.state);
    return {
      id: r.id,
      label: r.label,
      state: r.state,
      stateText: tag.text,
      stateTag: tag.tag,
      date: formatDate(r.createdAt),
      author: r.createdByName,
      approvals: approvalsText(full),
      sha256: r.manifestSha256,
      shortSha: `${r.manifestSha256.slice(0, 12)}…`,
      revision: `rev ${r.designRevision}`,
    };
  });
}

export function approvalsText(r: ReleaseRecord | undefined): string {
  if (!r) return '…';
  if (r.approvalsRequired === null) return '—';
  return `${r.approvals} of ${r.approvalsRequired}`;
}

export function sizeText(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / 1024 / 1024).toFixed(2)} MiB`;
}

export interface FileRow extends ReleaseFileRecord {
  readonly sizeText: string;
}

export function fileRows(files: readonly ReleaseFileRecord[]): FileRow[] {
  return files.map((f) => ({ ...f, sizeText: sizeText(f.sizeBytes) }));
}

export interface ReviewRow {
  readonly id: number;
  readonly reviewer: string;
  readonly decision: string;
  readonly tone: TagType;
  readonly comment: string;
  readonly when: string;
  readonly mail: string;
  readonly mailTone: TagType;
}

/** What became of a review's request e-mail. */
export function mailText(mail: ReviewRecord['mail']): { text: string; tone: TagType } {
  if (mail === null) return { text: 'not recorded', tone: 'info' };
  if (mail.state === 'sent') return { text: mail.sentAt ? `sent ${formatDate(mail.sentAt)}` : 'sent', tone: 'success' };
  const next = mail.nextAttemptAt ? `; next try ${formatDate(mail.nextAttemptAt)}` : '';
  return { text: `waiting to be sent (${mail.attempts} failed attempt${mail.attempts === 1 ? '' : 's'}${next})`, tone: 'warning' };
}

export function reviewRows(reviews: readonly ReviewRecord[]): ReviewRow[] {
  return reviews.map((r) => {
    const mail = mailText(r.mail);
    return {
      id: r.id,
      reviewer: r.reviewerName,
      decision: r.decision === null ? 'pending' : r.decision === 'approve' ? 'approved' : 'changes requested',
      tone: r.decision === null ? 'info' : r.decision === 'approve' ? 'success' : 'danger',
      comment: r.comment ?? '',
      when: r.decidedAt ? formatDate(r.decidedAt) : `link expires ${formatDate(r.expiresAt)}`,
      mail: mail.text,
      mailTone: mail.tone,
    };
  });
}

/**
 * The release page's notice while review e-mails wait in the outbox (the mail relay does not take
 * them): the request is recorded and the links will go out, just not yet. Null when none waits.
 */
export function waitingMailNotice(reviews: readonly ReviewRecord[]): string | null {
  const waiting = reviews.filter((r) => r.mail?.state === 'waiting').map((r) => r.reviewerName);
  if (waiting.length === 0) return null;
  return `The review e-mail to ${waiting.join(', ')} is waiting to be sent: the mail server has not accepted it yet. The review request is recorded, and Loopwright keeps trying to send the link.`;
}

export interface DiffRow {
  readonly group: string;
  readonly label: string;
  readonly unit: string;
  /** The constant's name or the spec path, for whoever searches the files for it. */
  readonly key: string;
  readonly before: string;
  readonly after: string;
}

/** Form label and unit of each spec path: a spec change reads as the editor names the field. */
const SPEC_FIELDS = new Map(SPEC_SECTIONS.flatMap((s) => s.fields.map((f) => [f.path, f] as const)));

function specLabel(path: string): { label: string; unit: string } {
  const field = SPEC_FIELDS.get(path);
  if (!field) return { label: path, unit: '' };
  return { label: field.label, unit: field.unit === '—' || field.unit === 'id' ? '' : field.unit };
}

/** Every changed figure in the server's order (formats and widths first), one row each. */
export function diffRows(d: ReleaseDiff): DiffRow[] {
  return d.sections.flatMap((s) =>
    s.rows.map((r) => ({
      group: s.title,
      ...(s.id === 'spec' ? specLabel(r.key) : { label: r.label, unit: r.unit }),
      key: r.key,
      before: r.before ?? '—',
      after: r.after ?? '—',
    })),
  );
}

/** "Word formats 2, Widths and counts 3, …": what changed, section by section. */
export function diffSummary(d: ReleaseDiff): string {
  const changed = d.sections.filter((s) => s.rows.length > 0).map((s) => `${s.title} ${s.rows.length}`);
  return `${d.from.label} → ${d.to.label}: ${changed.length ? `changed ${changed.join(', ')}` : 'nothing changed'}`;
}
