/**
 * Wording of the hand-off e-mails (plain text). Only our own words, the validated spec name, the
 * release label, people's, projects' and designs' display names and URLs we built enter a message.
 * A subject names project, design and release: several designs may share one identifier.
 * Every link opens the page its reader works on (checked in the browser by tests/e2e/mail-links).
 */
import { HIDDEN_TEXT_CHARACTERS } from '@loopwright/contract';
import { CAUTION } from '../render/caution.ts';
import type { MailMessage } from '../mail/outbox.ts';

const HIDDEN_ALL = new RegExp(HIDDEN_TEXT_CHARACTERS.source, 'g');

/**
 * A person's name as plain e-mail text: names are checked when they are set (contract titleSchema),
 * but one stored before that check could hold characters that break the line or reorder the words
 * around it; each becomes a space.
 */
function plainName(name: string): string {
  return name.replace(HIDDEN_ALL, ' ').replace(/ {2,}/g, ' ').trim();
}

/** Which release a mail is about, as people name it. */
export interface MailedRelease {
  readonly projectName: string;
  readonly designName: string;
  /** The spec `name`, the identifier of the generated code. */
  readonly specName: string;
  readonly label: string;
}

/** "Grid-tie inverter / Mains sync PI loop v2". */
export function releaseTitle(r: MailedRelease): string {
  return `${plainName(r.projectName)} / ${plainName(r.designName)} ${r.label}`;
}

function aboutLine(r: MailedRelease): string {
  return `Project ${plainName(r.projectName)}, design ${plainName(r.designName)} (identifier ${r.specName}), release ${r.label}.`;
}

export interface ReviewMailInput extends MailedRelease {
  readonly to: string;
  readonly reviewerName: string;
  readonly requesterName: string;
  readonly link: string;
  readonly expiresAt: Date;
  readonly approvalsRequired: number;
  readonly manifestSha256: string;
  /** The verification record's sentence when the mail is written (it may still be running). */
  readonly verificationSummary: string;
}

export function reviewRequestMail(m: ReviewMailInput): MailMessage {
  return {
    kind: 'review-request',
    to: m.to,
    subject: `Review requested: ${releaseTitle(m)}`,
    text: [
      `Hello ${plainName(m.reviewerName)},`,
      '',
      `${plainName(m.requesterName)} asks you to review release ${m.label} of design ${plainName(m.designName)}.`,
      aboutLine(m),
      `${m.approvalsRequired} approval(s) are needed.`,
      '',
      `Server verification: ${m.verificationSummary}.`,
      'A release whose reference RTL fails verification cannot be approved; the review page shows the current verdict.',
      '',
      `Open the release to approve it or ask for changes:`,
      m.link,
      '',
      `The link is for you alone, works once and expires at ${m.expiresAt.toISOString()}.`,
      `Release manifest SHA-256: ${m.manifestSha256}`,
      '',
      CAUTION,
    ].join('\n'),
  };
}

export interface ApprovedMailInput extends MailedRelease {
  readonly to: string;
  readonly name: string;
  /** The firmware engineer's page of the release: Downloads, this release opened. */
  readonly downloadsUrl: string;
  readonly manifestSha256: string;
}

export function releaseApprovedMail(m: ApprovedMailInput): MailMessage {
  return {
    kind: 'release-approved',
    to: m.to,
    subject: `Release approved: ${releaseTitle(m)}`,
    text: [
      `Hello ${plainName(m.name)},`,
      '',
      `Release ${m.label} of design ${plainName(m.designName)} is approved and ready to download:`,
      m.downloadsUrl,
      aboutLine(m),
      '',
      `Manifest SHA-256: ${m.manifestSha256}`,
      'Check the SHA-256 of every file against manifest.json, and upload your simulation output for a conformance check.',
      '',
      CAUTION,
    ].join('\n'),
  };
}

export interface DecidedMailInput extends MailedRelease {
  readonly to: string;
  readonly name: string;
  readonly reviewerName: string;
  readonly decision: 'approve' | 'request-changes';
  readonly comment: string | null;
  /** Where the release stands after the decision, in words ("approved", "in review: 1 of 2 approvals"). */
  readonly standing: string;
  /** The designer's page of the release: the design's releases, this one opened. */
  readonly releaseUrl: string;
}

/** To the designer who asked for the review (and whoever cut the release): a reviewer has decided. */
export function reviewDecidedMail(m: DecidedMailInput): MailMessage {
  const verb = m.decision === 'approve' ? 'approved' : 'asked for changes to';
  return {
    kind: 'review-decided',
    to: m.to,
    subject: `${m.decision === 'approve' ? 'Approved' : 'Changes requested'} by ${plainName(m.reviewerName)}: ${releaseTitle(m)}`,
    text: [
      `Hello ${plainName(m.name)},`,
      '',
      `${plainName(m.reviewerName)} ${verb} release ${m.label} of design ${plainName(m.designName)}.`,
      aboutLine(m),
      ...(m.comment ? ['', 'Comment:', m.comment.replace(HIDDEN_ALL, (c) => (c === '\n' ? c : ' '))] : []),
      '',
      `The release is now ${m.standing}. Open it:`,
      m.releaseUrl,
      '',
      CAUTION,
    ].join('\n'),
  };
}
