/** Sessions and user accounts (GET/POST/DELETE /api/session, /api/users). */
import { z } from 'zod';
import { emailSchema, isoDateSchema, passwordSchema, titleSchema } from './common.ts';
import { roleSchema } from './vocabulary.ts';

const rolesSchema = z
  .array(roleSchema)
  .min(1, 'at least one role')
  .refine((roles) => new Set(roles).size === roles.length, 'each role once');

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
/** GET /session: who is signed in; user null when nobody is (an ordinary answer, not an error status). */
export const currentSessionResponseSchema = z.object({ user: sessionUserSchema.nullable() });
export type CurrentSessionResponse = z.infer<typeof currentSessionResponseSchema>;

export const signInRequestSchema = z.strictObject({
  email: emailSchema,
  // Not passwordSchema: sign-in must not reveal the password rules, only "wrong e-mail or password".
  password: z.string().min(1, 'must not be empty').max(200),
});
export type SignInRequest = z.input<typeof signInRequestSchema>;

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

/** GET /api/reviewers: the enabled accounts holding the reviewer role, for a designer to name. */
export const reviewerChoiceSchema = userIdentitySchema.pick({ id: true, displayName: true, email: true });
export type ReviewerChoice = z.infer<typeof reviewerChoiceSchema>;
export const reviewerListResponseSchema = z.object({ reviewers: z.array(reviewerChoiceSchema) });
export type ReviewerListResponse = z.infer<typeof reviewerListResponseSchema>;
