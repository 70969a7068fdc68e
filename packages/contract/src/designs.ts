/** Loop designs and templates (/api/projects/:id/designs, /api/designs/:id, /api/templates). */
import { z } from 'zod';
import { loopSpecSchema } from '@loopwright/dsp';
import { idSchema, isoDateSchema, MAX_ID, titleSchema } from './common.ts';

export { loopSpecSchema };

export const designSummarySchema = z.object({
  id: z.number().int(),
  projectId: z.number().int(),
  name: z.string(),
  revision: z.number().int(),
  ownerId: z.number().int(),
  ownerName: z.string(),
  /** Archived: out of the default list, read-only, never released again; kept with its releases. */
  archived: z.boolean(),
  createdAt: isoDateSchema,
  updatedAt: isoDateSchema,
});
export type DesignSummary = z.infer<typeof designSummarySchema>;

export const designRecordSchema = designSummarySchema.extend({ spec: loopSpecSchema });
export type DesignRecord = z.infer<typeof designRecordSchema>;
/** A design in a project's list, with how many releases it has (the screen offers delete only without). */
export const designListItemSchema = designSummarySchema.extend({ releaseCount: z.number().int() });
export type DesignListItem = z.infer<typeof designListItemSchema>;
export const designListResponseSchema = z.object({ designs: z.array(designListItemSchema) });
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

export const designListQuerySchema = z.strictObject({
  archived: z.enum(['true', 'false', 'all']).default('false'),
});
export type DesignListQuery = z.infer<typeof designListQuerySchema>;

/** Archive (true) or restore (false) a design; the spec and its revision are untouched. */
export const designArchiveRequestSchema = z.strictObject({ archived: z.boolean() });
export type DesignArchiveRequest = z.infer<typeof designArchiveRequestSchema>;

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
