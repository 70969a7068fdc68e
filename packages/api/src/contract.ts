/**
 * The HTTP contract of the API: every request and response schema, in one module that the app imports
 * types from (`@loopwright/api/contract`). Pure zod and the dsp spec schema — nothing node-only — so the
 * browser bundle can use it too. Request objects are strict: an unknown field is a 400 naming it.
 */
import { z } from 'zod';
import { loopSpecSchema, scenarioSchema, type AnalysisResult, type SimResult } from '@loopwright/dsp';

export const ROLES = ['designer', 'reviewer', 'firmware', 'admin'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Ids are MariaDB INT UNSIGNED AUTO_INCREMENT values; a path id past that range is a 400, not a 404. */
export const MAX_ID = 2_147_483_647;
export const idSchema = z.coerce.number().int().min(1).max(MAX_ID);
export const idParamsSchema = z.strictObject({ id: idSchema });

/**
 * Free text shown to people (project and design titles): stored verbatim, quotes and angle brackets
 * included (the API speaks JSON and the app escapes on display); control characters are refused
 * because they cannot be typed and only hide text.
 */
export const titleSchema = (maxLength: number) =>
  z
    .string()
    .trim()
    .min(1, 'must not be empty')
    .max(maxLength, `must be at most ${maxLength} characters`)
    // eslint-disable-next-line no-control-regex
    .regex(/^[^\u0000-\u001f\u007f]*$/, 'must not contain control characters');

export const emailSchema = z.email('must be an e-mail address').max(254).transform((value) => value.toLowerCase());
/** bcrypt reads at most 72 bytes of a password; longer ones would be silently cut, so refuse them. */
export const passwordSchema = z
  .string()
  .min(10, 'must be at least 10 characters')
  .refine((value) => new TextEncoder().encode(value).length <= 72, 'must be at most 72 bytes (bcrypt limit)');
const rolesSchema = z
  .array(roleSchema)
  .min(1, 'at least one role')
  .refine((roles) => new Set(roles).size === roles.length, 'each role once');

export const isoDateSchema = z.string();

// ---------------------------------------------------------------------------------------------- errors

export const ERROR_CODES = [
  'invalid_input',
  'malformed_json',
  'payload_too_large',
  'unsupported_media_type',
  'unauthenticated',
  'forbidden',
  'csrf_rejected',
  'not_found',
  'conflict',
  'stale_revision',
  'rate_limited',
  'server_busy',
  'timeout',
  'database_unavailable',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export const errorBodySchema = z.strictObject({
  error: z.strictObject({
    code: z.enum(ERROR_CODES),
    message: z.string(),
    field: z.string().optional(),
    /** Present on stale_revision: the design as it is now, so the client can merge or reload. */
    current: z.unknown().optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/** The header every state-changing browser request must carry (see README, "CSRF"). */
export const CSRF_HEADER = 'x-requested-with';
export const CSRF_HEADER_VALUE = 'loopwright';

// ---------------------------------------------------------------------------------------------- health

export const healthResponseSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  database: z.enum(['up', 'down']),
  databaseLatencyMs: z.number().nullable(),
  version: z.string(),
});
export type HealthResponse = z.infer<typeof healthResponseSchema>;

// ------------------------------------------------------------------------------------ session & users

/** Who an account is: the fields a session and the user list both show. */
const userIdentitySchema = z.object({
  id: z.number().int(),
  email: z.string(),
  displayName: z.string(),
  roles: z.array(roleSchema),
});

export const sessionUserSchema = userIdentitySchema.extend({
  organizationId: z.number().int(),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const sessionResponseSchema = z.object({ user: sessionUserSchema });
export type SessionResponse = z.infer<typeof sessionResponseSchema>;

export const signInRequestSchema = z.strictObject({
  email: emailSchema,
  // Not passwordSchema: sign-in must not reveal the password rules, only "wrong e-mail or password".
  password: z.string().min(1, 'must not be empty').max(200),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const passwordChangeRequestSchema = z.strictObject({
  currentPassword: z.string().min(1).max(200),
  newPassword: passwordSchema,
});
export type PasswordChangeRequest = z.infer<typeof passwordChangeRequestSchema>;

export const userRecordSchema = userIdentitySchema.extend({
  disabled: z.boolean(),
  createdAt: isoDateSchema,
  updatedAt: isoDateSchema,
});
export type UserRecord = z.infer<typeof userRecordSchema>;
export const userListResponseSchema = z.object({ users: z.array(userRecordSchema) });
export type UserListResponse = z.infer<typeof userListResponseSchema>;

export const userCreateRequestSchema = z.strictObject({
  email: emailSchema,
  displayName: titleSchema(120),
  password: passwordSchema,
  roles: rolesSchema,
});
export type UserCreateRequest = z.infer<typeof userCreateRequestSchema>;

export const userUpdateRequestSchema = z
  .strictObject({
    displayName: titleSchema(120).optional(),
    roles: rolesSchema.optional(),
    disabled: z.boolean().optional(),
  })
  .refine((body) => Object.keys(body).length > 0, 'give at least one of displayName, roles, disabled');
export type UserUpdateRequest = z.infer<typeof userUpdateRequestSchema>;

// ---------------------------------------------------------------------------------------------- projects

export const projectRecordSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  description: z.string(),
  archived: z.boolean(),
  designCount: z.number().int(),
  createdAt: isoDateSchema,
  updatedAt: isoDateSchema,
});
export type ProjectRecord = z.infer<typeof projectRecordSchema>;
export const projectListResponseSchema = z.object({ projects: z.array(projectRecordSchema) });
export type ProjectListResponse = z.infer<typeof projectListResponseSchema>;

export const projectListQuerySchema = z.strictObject({
  archived: z.enum(['true', 'false', 'all']).default('false'),
});
export type ProjectListQuery = z.infer<typeof projectListQuerySchema>;

export const projectCreateRequestSchema = z.strictObject({
  name: titleSchema(120),
  description: z.string().max(2000).default(''),
});
export type ProjectCreateRequest = z.input<typeof projectCreateRequestSchema>;

export const projectUpdateRequestSchema = z
  .strictObject({
    name: titleSchema(120).optional(),
    description: z.string().max(2000).optional(),
    archived: z.boolean().optional(),
  })
  .refine((body) => Object.keys(body).length > 0, 'give at least one of name, description, archived');
export type ProjectUpdateRequest = z.infer<typeof projectUpdateRequestSchema>;

// ---------------------------------------------------------------------------------------------- designs

export { loopSpecSchema };

export const designSummarySchema = z.object({
  id: z.number().int(),
  projectId: z.number().int(),
  name: z.string(),
  revision: z.number().int(),
  ownerId: z.number().int(),
  ownerName: z.string(),
  createdAt: isoDateSchema,
  updatedAt: isoDateSchema,
});
export type DesignSummary = z.infer<typeof designSummarySchema>;

export const designRecordSchema = designSummarySchema.extend({ spec: loopSpecSchema });
export type DesignRecord = z.infer<typeof designRecordSchema>;
export const designListResponseSchema = z.object({ designs: z.array(designSummarySchema) });
export type DesignListResponse = z.infer<typeof designListResponseSchema>;

export const templateRecordSchema = z.object({
  id: z.string(),
  title: z.string(),
  description: z.string(),
  spec: loopSpecSchema,
});
export type TemplateRecord = z.infer<typeof templateRecordSchema>;
export const templateListResponseSchema = z.object({ templates: z.array(templateRecordSchema) });
export type TemplateListResponse = z.infer<typeof templateListResponseSchema>;

/** Create a design blank, from a template (its id from GET /api/templates), or from a full spec. */
export const designCreateRequestSchema = z
  .strictObject({
    name: titleSchema(120),
    templateId: z.string().max(64).optional(),
    spec: loopSpecSchema.optional(),
  })
  .refine((body) => !(body.templateId !== undefined && body.spec !== undefined), {
    message: 'give templateId or spec, not both',
    path: ['templateId'],
  });
export type DesignCreateRequest = z.input<typeof designCreateRequestSchema>;

/** Every update says which revision it was based on; a stale one is answered 409 stale_revision. */
export const designUpdateRequestSchema = z.strictObject({
  baseRevision: z.number().int().min(1).max(MAX_ID),
  name: titleSchema(120).optional(),
  spec: loopSpecSchema.optional(),
});
export type DesignUpdateRequest = z.input<typeof designUpdateRequestSchema>;

export const designDuplicateRequestSchema = z.strictObject({
  name: titleSchema(120).optional(),
  projectId: idSchema.optional(),
});
export type DesignDuplicateRequest = z.infer<typeof designDuplicateRequestSchema>;

/** Multipart upload: the spec file goes in the field `file`, the title in `name` (default: spec.name). */
export const DESIGN_UPLOAD_FIELD = 'file';
export const designUploadFieldsSchema = z.strictObject({ name: titleSchema(120).optional() });

// ---------------------------------------------------------------------------------------------- analysis

export const analysisRequestSchema = z.strictObject({ spec: loopSpecSchema });
export type AnalysisRequest = z.input<typeof analysisRequestSchema>;

/** The server's analysis (packages/dsp analyzeDesign); for a stored design, which revision it is of. */
export interface AnalysisResponse {
  readonly analysis: AnalysisResult;
  readonly designId?: number;
  readonly revision?: number;
}

// ---------------------------------------------------------------------------------------------- simulations

export { scenarioSchema };

/** A simulation of a stored design (POST /api/designs/:id/simulations); scenario per DESIGN.md. */
export const simulationRequestSchema = z.strictObject({
  scenario: scenarioSchema,
  /** Which loops to run: float, bit-true or both side by side (default both). */
  mode: z.enum(['both', 'float', 'bit-true']).default('both'),
  /** Points of the decimated (min/max) traces. */
  buckets: z.number().int().min(10).max(10_000).default(1000),
});
export type SimulationRequest = z.output<typeof simulationRequestSchema>;
export type SimulationRequestInput = z.input<typeof simulationRequestSchema>;

/** An unsaved spec simulated as it is (POST /api/simulations). */
export const specSimulationRequestSchema = simulationRequestSchema.extend({ spec: loopSpecSchema });
export type SpecSimulationRequestInput = z.input<typeof specSimulationRequestSchema>;

export interface SimulationResponse {
  readonly scenario: SimulationRequest['scenario'];
  readonly simulation: SimResult;
  readonly designId?: number;
  readonly revision?: number;
}

// ---------------------------------------------------------------------------------------------- audit

export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: isoDateSchema,
  actorId: z.number().int().nullable(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  objectType: z.string(),
  objectId: z.string().nullable(),
  ip: z.string().nullable(),
  detail: z.unknown().nullable(),
});
export type AuditEntryRecord = z.infer<typeof auditEntrySchema>;
export const auditListResponseSchema = z.object({ entries: z.array(auditEntrySchema) });
export type AuditListResponse = z.infer<typeof auditListResponseSchema>;

export const auditQuerySchema = z.strictObject({
  objectType: z.string().max(32).optional(),
  objectId: z.string().max(64).optional(),
  actorId: idSchema.optional(),
  beforeId: idSchema.optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

// ---------------------------------------------------------------------------------------------- releases

export * from './releases/contract.ts';

// ---------------------------------------------------------------------------------------------- releases

/** Releases, reviews, review links, downloads and conformance (owned by src/releases). */
export * from './releases/contract.ts';
