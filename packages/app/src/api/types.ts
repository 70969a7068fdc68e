/**
 * Request and response types of the API as the app uses them (DESIGN.md "API shape").
 * Kept in one place so that switching to the API package's contract types is one edit.
 */

import type { LoopSpec, LoopSpecInput } from '@loopwright/dsp';

export const ROLES = ['designer', 'reviewer', 'firmware', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export interface SessionUser {
  readonly id: number;
  readonly email: string;
  readonly displayName: string;
  readonly roles: readonly Role[];
  readonly organizationId: number;
}

export interface SignInRequest {
  readonly email: string;
  readonly password: string;
}

export interface Project {
  readonly id: number;
  readonly name: string;
  readonly description: string;
  readonly archived: boolean;
  readonly designCount: number;
  readonly createdAt: string;
  readonly updatedAt: string;
}

export interface DesignSummary {
  readonly id: number;
  readonly projectId: number;
  readonly name: string;
  readonly revision: number;
  readonly ownerId: number;
  readonly ownerName: string;
  readonly createdAt: string;
  readonly updatedAt: string;
}

export interface Design extends DesignSummary {
  readonly spec: LoopSpec;
}

export interface SaveDesignRequest {
  readonly spec?: LoopSpecInput;
  /** The revision the edit started from; the server answers 409 stale_revision when it moved on. */
  readonly baseRevision: number;
  readonly name?: string;
}

export type ReleaseState = 'in-review' | 'approved' | 'changes-requested' | 'draft';

export interface ReleaseFile {
  readonly name: string;
  readonly sha256: string;
  readonly bytes: number;
}

export interface Release {
  readonly id: number;
  readonly designId: number;
  readonly designName?: string;
  readonly projectId?: number;
  readonly projectName?: string;
  /** v1, v2, … per design. */
  readonly version: number;
  readonly state: ReleaseState;
  readonly createdAt: string;
  readonly author: string;
  readonly approvals: number;
  readonly approvalsRequired: number;
  readonly sha256: string;
  readonly files: readonly ReleaseFile[];
  readonly spec?: unknown;
  readonly results?: unknown;
}

export interface ReviewRequest {
  readonly reviewerIds: readonly number[];
  readonly approvalsRequired: number;
}

export type ReviewDecision = 'approve' | 'request-changes';

export interface Review {
  readonly id: number;
  readonly reviewer: string;
  readonly decision: ReviewDecision | 'pending';
  readonly comment: string;
  readonly decidedAt: string | null;
}

export interface ReviewLinkView {
  readonly release: Release;
  readonly previous: Release | null;
  readonly reviewer: { readonly email: string; readonly displayName: string };
  readonly reviews?: readonly Review[];
}

export interface ReviewDecisionRequest {
  readonly decision: ReviewDecision;
  readonly comment: string;
}

export interface ConformanceMismatch {
  readonly sample: number;
  readonly column: string;
  readonly expected: string | number;
  readonly actual: string | number;
}

export interface ConformanceResult {
  readonly id: number;
  readonly releaseId: number;
  readonly fileName: string;
  readonly uploadedAt: string;
  readonly uploadedBy: string;
  readonly verdict: 'bit-exact' | 'mismatch' | 'invalid';
  readonly samplesCompared: number;
  readonly mismatchCount: number;
  readonly mismatches: readonly ConformanceMismatch[];
  readonly message?: string;
}

export interface UserAccount {
  readonly id: number;
  readonly email: string;
  readonly displayName: string;
  readonly roles: readonly Role[];
  readonly disabled: boolean;
  readonly createdAt: string;
  readonly updatedAt: string;
}

export interface CreateUserRequest {
  readonly email: string;
  readonly displayName: string;
  readonly password: string;
  readonly roles: readonly Role[];
}

export interface UpdateUserRequest {
  readonly roles?: readonly Role[];
  readonly disabled?: boolean;
  readonly displayName?: string;
}

export interface AuditEntry {
  readonly id: number;
  readonly at: string;
  readonly actorId: number | null;
  readonly actorEmail: string | null;
  readonly action: string;
  readonly objectType: string;
  readonly objectId: string | null;
  readonly ip: string | null;
  readonly detail: unknown;
}

export interface AuditQuery {
  readonly objectType?: string;
  readonly objectId?: string;
  readonly actorId?: number;
  readonly beforeId?: number;
  readonly limit?: number;
}
