/**
 * Request and response types of the API, from the contract package (@loopwright/contract) that the
 * API validates with, plus the few shapes the app adds. The app never imports the API package.
 */
import type { LoopSpecInput } from '@loopwright/dsp';
import type {
  AuditEntryRecord,
  AuditQuery as ContractAuditQuery,
  DesignRecord,
  DesignListItem as ContractDesignListItem,
  DesignSummary as ContractDesignSummary,
  ProjectRecord,
  Role as ContractRole,
  SessionUser as ContractSessionUser,
  UserCreateRequest,
  UserRecord,
  UserUpdateRequest,
} from '@loopwright/contract';

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
  ReviewerChoice,
  WaitingReview,
  SignInRequest,
  ReleaseState,
  ReleaseEvent,
  ReleaseVerificationRecord,
  ResourceEstimate,
  SimulatorRun,
  CandidateEstimate,
} from '@loopwright/contract';
export { ROLES, isRole } from '@loopwright/contract';

export type Role = ContractRole;

export type SessionUser = ContractSessionUser;

export type Project = ProjectRecord;
export type DesignSummary = ContractDesignSummary;
/** A design as a project's list shows it: with its release count. */
export type DesignListItem = ContractDesignListItem;
export type Design = DesignRecord;

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

