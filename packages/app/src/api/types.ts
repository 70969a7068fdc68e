/**
 * Request and response types of the API, taken from the API package's own contract modules (type
 * imports only: nothing of the server reaches the browser bundle), plus the few shapes the app adds.
 */
import type { LoopSpec, LoopSpecInput } from '@loopwright/dsp';
import type {
  AuditEntryRecord,
  AuditQuery as ContractAuditQuery,
  DesignRecord,
  DesignSummary as ContractDesignSummary,
  ProjectRecord,
  Role as ContractRole,
  SessionUser as ContractSessionUser,
  UserCreateRequest,
  UserRecord,
  UserUpdateRequest,
} from '../../../api/src/contract.ts';

export type {
  ConformanceRecord,
  DownloadRecord,
  ReleaseDiff,
  ReleaseFileRecord,
  ReleaseRecord,
  ReleaseSummary,
  ReviewDecisionRequest,
  ReviewDecisionResponse,
  ReviewLinkView,
  ReviewRecord,
  ReviewRequest,
} from '../../../api/src/releases/contract.ts';
export type { ReleaseState, ReleaseEvent } from '../../../api/src/releases/stateMachine.ts';

export const ROLES = ['designer', 'reviewer', 'firmware', 'admin'] as const satisfies readonly ContractRole[];
export type Role = ContractRole;

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export type SessionUser = ContractSessionUser;

export interface SignInRequest {
  readonly email: string;
  readonly password: string;
}

export type Project = ProjectRecord;
export type DesignSummary = ContractDesignSummary;
export type Design = DesignRecord & { readonly spec: LoopSpec };

export interface SaveDesignRequest {
  readonly spec?: LoopSpecInput;
  /** The revision the edit started from; the server answers 409 stale_revision when it moved on. */
  readonly baseRevision: number;
  readonly name?: string;
}

export type UserAccount = UserRecord;
export type CreateUserRequest = UserCreateRequest;
export type UpdateUserRequest = Partial<UserUpdateRequest>;
export type AuditEntry = AuditEntryRecord;
export type AuditQuery = Partial<ContractAuditQuery>;

/** A person who can be asked for review (GET /api/reviewers; admins may fall back to /api/users). */
export interface ReviewerChoice {
  readonly id: number;
  readonly displayName: string;
  readonly email: string;
}
