/**
 * Wording of the hand-off e-mails (plain text). Only our own words, the validated spec name, the
 * release label, people's display names and URLs we built enter a message.
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

export interface ReviewMailInput {
  readonly to: string;
  readonly reviewerName: string;
  readonly requesterName: string;
  readonly specName: string;
  readonly label: string;
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
    subject: `Review requested: ${m.specName} ${m.label}`,
    text: [
      `Hello ${plainName(m.reviewerName)},`,
      '',
      `${plainName(m.requesterName)} asks you to review release ${m.label} of loop design ${m.specName}.`,
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

export interface ApprovedMailInput {
  readonly to: string;
  readonly name: string;
  readonly specName: string;
  readonly label: string;
  readonly releaseUrl: string;
  readonly manifestSha256: string;
}

export function releaseApprovedMail(m: ApprovedMailInput): MailMessage {
  return {
    kind: 'release-approved',
    to: m.to,
    subject: `Release approved: ${m.specName} ${m.label}`,
    text: [
      `Hello ${plainName(m.name)},`,
      '',
      `Release ${m.label} of loop design ${m.specName} is approved and ready to download:`,
      m.releaseUrl,
      '',
      `Manifest SHA-256: ${m.manifestSha256}`,
      'Check the SHA-256 of every file against manifest.json, and upload your simulation output for a conformance check.',
      '',
      CAUTION,
    ].join('\n'),
  };
}
