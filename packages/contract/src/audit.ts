/** The audit trail (/api/audit, admin). */
import { z } from 'zod';
import { decimalIntSchema, idSchema, isoDateSchema } from './common.ts';

export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: isoDateSchema,
  actorId: z.number().int().nullable(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  objectType: z.string(),
  objectId: z.string().nullable(),
  /** The object as a reader names it ("Mains sync PI loop v3", a project's name, an account's e-mail); null when it is gone. */
  objectLabel: z.string().nullable(),
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
  limit: decimalIntSchema(1, 500).default(100),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;
