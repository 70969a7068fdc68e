import {
  DESIGN_UPLOAD_FIELD,
  designArchiveRequestSchema,
  designCreateRequestSchema,
  designDuplicateRequestSchema,
  designListQuerySchema,
  designUpdateRequestSchema,
  designUploadFieldsSchema,
  idParamsSchema,
  type DesignListResponse,
  type DesignRecord,
  type TemplateListResponse,
} from '@loopwright/contract';
import { invalidInput } from '../errors.ts';
import { listTemplates } from '../services/templates.ts';
import { route } from './table.ts';

const DESIGNER = ['designer'] as const;

export const designRoutes = [
  route({
    method: 'get',
    path: '/templates',
    access: 'signed-in',
    summary: 'design templates (the example specs of the demo scenario)',
    handler: (): TemplateListResponse => ({ templates: listTemplates() }),
  }),
  route({
    method: 'get',
    path: '/projects/:id/designs',
    access: 'signed-in',
    summary: "list a project's designs with their release counts (?archived=false|true|all, default false; firmware: those with an approved release)",
    params: idParamsSchema,
    query: designListQuerySchema,
    handler: async ({ services, user, params, query }): Promise<DesignListResponse> => ({ designs: await services.handoff.releases.designsForUser(user.organizationId, params.id, user, query.archived) }),
  }),
  route({
    method: 'post',
    path: '/projects/:id/designs',
    access: DESIGNER,
    summary: 'create a design: blank, from a template (templateId) or from a spec',
    status: 201,
    params: idParamsSchema,
    body: designCreateRequestSchema,
    handler: ({ services, user, params, body, actor }): Promise<DesignRecord> => services.designs.create(user.organizationId, params.id, body, { ...actor, id: user.id }),
  }),
  route({
    method: 'post',
    path: '/projects/:id/designs/upload',
    access: DESIGNER,
    summary: `create a design from a spec JSON file (multipart, field "${DESIGN_UPLOAD_FIELD}"; optional field "name")`,
    status: 201,
    params: idParamsSchema,
    upload: { field: DESIGN_UPLOAD_FIELD },
    body: designUploadFieldsSchema,
    handler: ({ services, user, params, body, actor, file }): Promise<DesignRecord> => {
      if (!file) throw invalidInput(DESIGN_UPLOAD_FIELD, `attach the spec JSON file in the multipart field "${DESIGN_UPLOAD_FIELD}"`);
      return services.designs.createFromFile(user.organizationId, params.id, file.buffer.toString('utf8'), body.name, { ...actor, id: user.id }, file.originalname);
    },
  }),
  route({
    method: 'get',
    path: '/designs/:id',
    access: 'signed-in',
    summary: 'read a design with its spec (firmware: as its latest approved release holds it)',
    params: idParamsSchema,
    handler: ({ services, user, params }): Promise<DesignRecord> => services.handoff.releases.designForUser(user.organizationId, params.id, user),
  }),
  route({
    method: 'get',
    path: '/designs/:id/spec.json',
    access: 'signed-in',
    summary: "download a design's spec as a JSON file",
    params: idParamsSchema,
    handler: async ({ services, user, params, res }) => {
      const design = await services.handoff.releases.designForUser(user.organizationId, params.id, user);
      res
        .status(200)
        .attachment(`${design.spec.name}.spec.json`)
        .type('application/json')
        .send(`${JSON.stringify(design.spec, null, 2)}\n`);
    },
  }),
  route({
    method: 'put',
    path: '/designs/:id',
    access: DESIGNER,
    summary: 'update name and/or spec; baseRevision must be the current revision or 409 stale_revision',
    params: idParamsSchema,
    body: designUpdateRequestSchema,
    handler: ({ services, user, params, body, actor }): Promise<DesignRecord> => services.designs.update(user.organizationId, params.id, body, { ...actor, id: user.id }),
  }),
  route({
    method: 'post',
    path: '/designs/:id/duplicate',
    access: DESIGNER,
    summary: 'copy a design (optionally into another project, under another name)',
    status: 201,
    params: idParamsSchema,
    body: designDuplicateRequestSchema,
    handler: ({ services, user, params, body, actor }): Promise<DesignRecord> => services.designs.duplicate(user.organizationId, params.id, body, { ...actor, id: user.id }),
  }),
  route({
    method: 'patch',
    path: '/designs/:id',
    access: DESIGNER,
    summary: 'archive (archived: true) or restore (false) a design; its spec, revision and releases stay',
    params: idParamsSchema,
    body: designArchiveRequestSchema,
    handler: ({ services, user, params, body, actor }): Promise<DesignRecord> => services.designs.setArchived(user.organizationId, params.id, body.archived, { ...actor, id: user.id }),
  }),
  route({
    method: 'delete',
    path: '/designs/:id',
    access: DESIGNER,
    summary: 'delete a design that has no release (409 otherwise)',
    params: idParamsSchema,
    handler: async ({ services, user, params, actor }) => {
      await services.designs.remove(user.organizationId, params.id, { ...actor, id: user.id });
    },
  }),
];
