/**
 * Releases, reviews, review links, downloads and conformance (/api/releases/..., /api/review-links/:token).
 */
import { z } from 'zod';
import { idParamsSchema, idSchema, mismatchSchema, sha256Schema } from './common.ts';
import { releaseVerificationSchema } from './rtl.ts';
import { releaseEventSchema, releaseStateSchema, reviewDecisionValueSchema } from './vocabulary.ts';

export const releaseFileRecordSchema = z.object({
  name: z.string(),
  mediaType: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
});
export type ReleaseFileRecord = z.infer<typeof releaseFileRecordSchema>;

export const reviewRecordSchema = z.object({
  id: z.number().int(),
  reviewerId: z.number().int(),
  reviewerName: z.string(),
  decision: reviewDecisionValueSchema.nullable(),
  comment: z.string().nullable(),
  decidedAt: z.string().nullable(),
  expiresAt: z.string(),
  /**
   * The review-request e-mail: `sent`, or `waiting` in the outbox while the mail relay does not take it
   * (it is retried with backoff); null for a review requested before this was recorded.
   */
  mail: z
    .object({
      state: z.enum(['sent', 'waiting']),
      /** Delivery attempts so far (a waiting mail has failed this many times). */
      attempts: z.number().int(),
      sentAt: z.string().nullable(),
      /** While waiting: when the next attempt is due. */
      nextAttemptAt: z.string().nullable(),
    })
    .nullable(),
});
export type ReviewRecord = z.infer<typeof reviewRecordSchema>;

export const releaseSummarySchema = z.object({
  id: z.number().int(),
  designId: z.number().int(),
  number: z.number().int(),
  /** "v1", "v2", … */
  label: z.string(),
  state: releaseStateSchema,
  manifestSha256: z.string(),
  specSha256: z.string(),
  designRevision: z.number().int(),
  createdById: z.number().int(),
  createdByName: z.string(),
  createdAt: z.string(),
  stateChangedAt: z.string(),
});
export type ReleaseSummary = z.infer<typeof releaseSummarySchema>;

export const releaseRecordSchema = releaseSummarySchema.extend({
  designName: z.string(),
  projectId: z.number().int(),
  spec: z.unknown(),
  results: z.unknown(),
  files: z.array(releaseFileRecordSchema),
  approvalsRequired: z.number().int().nullable(),
  approvals: z.number().int(),
  reviews: z.array(reviewRecordSchema),
  /** What may happen next (the app shows only these actions). */
  allowedEvents: z.array(releaseEventSchema),
  /** DESIGN.md "Safety": the app shows it on the release page. */
  caution: z.string(),
  /** The server's verification of the reference RTL, made after the cut beside the immutable files. */
  verification: releaseVerificationSchema,
  /** Why a withdrawn release was withdrawn (the reason its withdrawal recorded; null when none was given or it is not withdrawn). */
  withdrawnReason: z.string().nullable(),
});
export type ReleaseRecord = z.infer<typeof releaseRecordSchema>;
export const releaseListResponseSchema = z.object({ releases: z.array(releaseSummarySchema) });
export type ReleaseListResponse = z.infer<typeof releaseListResponseSchema>;

export const releaseParamsSchema = idParamsSchema;
export const releaseFileParamsSchema = z.strictObject({
  id: idSchema,
  name: z.string().regex(/^[A-Za-z0-9_.-]{1,80}$/, 'must be a file name of the release'),
});

export const reviewRequestSchema = z.strictObject({
  /** User ids of the reviewers (each must hold the reviewer role). */
  reviewerIds: z
    .array(idSchema)
    .min(1, 'name at least one reviewer')
    .max(20, 'at most 20 reviewers')
    .refine((ids) => new Set(ids).size === ids.length, 'each reviewer once'),
  approvalsRequired: z.number().int().min(1),
});
export type ReviewRequest = z.infer<typeof reviewRequestSchema>;

export const reviewTokenParamsSchema = z.strictObject({ token: z.string().min(1).max(200) });
/** A file of the release a review link is for (GET /api/review-links/:token/files/:name). */
export const reviewFileParamsSchema = z.strictObject({ token: reviewTokenParamsSchema.shape.token, name: releaseFileParamsSchema.shape.name });

export const reviewDecisionSchema = z.strictObject({
  decision: reviewDecisionValueSchema,
  comment: z.string().max(4000).optional(),
  /** The manifest hash the reviewer read; a decision on other content is refused. */
  manifestSha256: sha256Schema,
});
export type ReviewDecisionRequest = z.infer<typeof reviewDecisionSchema>;

export const reviewLinkViewSchema = z.object({
  reviewerName: z.string(),
  expiresAt: z.string(),
  release: releaseRecordSchema,
  /** Diff against the design's previous release, when there is one. */
  diff: z.unknown().nullable(),
  /** That previous release's label and stored spec, so the page can overlay both releases' plots. */
  previous: z.object({ id: z.number().int(), label: z.string(), spec: z.unknown() }).nullable().default(null),
});
export type ReviewLinkView = z.infer<typeof reviewLinkViewSchema>;

export const reviewDecisionResponseSchema = z.object({
  decision: reviewDecisionValueSchema,
  state: releaseStateSchema,
  approvals: z.number().int(),
  approvalsRequired: z.number().int(),
});
export type ReviewDecisionResponse = z.infer<typeof reviewDecisionResponseSchema>;

/** A review that waits for the signed-in reviewer: the release is in review and their link is unused and unexpired. */
export const waitingReviewSchema = z.object({
  releaseId: z.number().int(),
  designId: z.number().int(),
  projectName: z.string(),
  designName: z.string(),
  label: z.string(),
  requestedByName: z.string(),
  requestedAt: z.string(),
  expiresAt: z.string(),
});
export type WaitingReview = z.infer<typeof waitingReviewSchema>;
export const waitingReviewListSchema = z.object({ reviews: z.array(waitingReviewSchema) });
export type WaitingReviewList = z.infer<typeof waitingReviewListSchema>;

export const diffQuerySchema = z.strictObject({ against: idSchema });

/** One figure that differs between two releases, as a reader sees it: label, unit, both values as text. */
export const diffRowSchema = z.object({
  /** Stable key: the constant's full name, or the spec / results dot path. */
  key: z.string(),
  label: z.string(),
  /** '' when the figure has no unit (a mode, a code). */
  unit: z.string(),
  /** null: the figure does not exist on that side. */
  before: z.string().nullable(),
  after: z.string().nullable(),
});
export type DiffRow = z.infer<typeof diffRowSchema>;
/**
 * Sections in reading order: word formats and widths first, then integer codes, tables, spec fields
 * and margins. New figures of a release (measured results) add a section of their own.
 */
export const diffSectionSchema = z.object({ id: z.string(), title: z.string(), rows: z.array(diffRowSchema) });
export type DiffSection = z.infer<typeof diffSectionSchema>;
export const releaseDiffSchema = z.object({
  from: z.object({ id: z.number().int(), label: z.string() }),
  to: z.object({ id: z.number().int(), label: z.string() }),
  /** Every section, empty ones included, so a reader sees what was compared. */
  sections: z.array(diffSectionSchema),
});
export type ReleaseDiff = z.infer<typeof releaseDiffSchema>;

export const CONFORMANCE_UPLOAD_FIELD = 'file';
/** A capture of a release's 65 536 samples is 2.7–3.0 MB (the demo releases' golden CSVs), under 3.7 MB with 64-bit phase words; 8 MiB leaves room for CRLF line ends and padded cells. */
export const CONFORMANCE_UPLOAD_LIMIT_BYTES = 8 * 1024 * 1024;

export const conformanceRecordSchema = z.object({
  id: z.number().int(),
  releaseId: z.number().int(),
  uploadedById: z.number().int(),
  uploadedByName: z.string(),
  fileName: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
  verdict: z.enum(['bit-exact', 'mismatch']),
  samplesCompared: z.number().int(),
  mismatchCount: z.number().int(),
  firstMismatches: z.array(mismatchSchema),
  createdAt: z.string(),
});
export type ConformanceRecord = z.infer<typeof conformanceRecordSchema>;
export const conformanceListResponseSchema = z.object({ runs: z.array(conformanceRecordSchema) });
export type ConformanceListResponse = z.infer<typeof conformanceListResponseSchema>;

export const downloadRecordSchema = z.object({
  id: z.number().int(),
  releaseId: z.number().int(),
  userId: z.number().int(),
  userEmail: z.string(),
  fileName: z.string(),
  at: z.string(),
});
export type DownloadRecord = z.infer<typeof downloadRecordSchema>;
export const downloadListResponseSchema = z.object({ downloads: z.array(downloadRecordSchema) });
export type DownloadListResponse = z.infer<typeof downloadListResponseSchema>;
