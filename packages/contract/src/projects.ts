/** Projects (/api/projects). */
import { z } from 'zod';
import { isoDateSchema, titleSchema } from './common.ts';

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
