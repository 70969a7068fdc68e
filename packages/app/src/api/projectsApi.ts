import {
  designListResponseSchema,
  designSummarySchema,
  projectListResponseSchema,
  projectRecordSchema,
  templateListResponseSchema,
  type DesignCreateRequest,
  type ProjectCreateRequest,
} from '@loopwright/contract';
import { api } from './client.ts';

export type CreateProjectRequest = ProjectCreateRequest;
/** A design starts from a template (GET /api/templates), a full spec, or blank. */
export type CreateDesignRequest = DesignCreateRequest;

export interface DesignTemplate {
  readonly id: string;
  readonly title: string;
  readonly description: string;
}

export const projectsApi = {
  list: () => api.request('/projects', projectListResponseSchema).then((b) => b.projects),
  create: (request: CreateProjectRequest) => api.request('/projects', projectRecordSchema, { method: 'POST', body: request }),
  templates: (): Promise<DesignTemplate[]> => api.request('/templates', templateListResponseSchema).then((b) => b.templates),
  /** With `archived: 'all'` the archived designs come too (each says which it is). */
  designs: (id: number, archived: 'false' | 'all' = 'false') =>
    api.request(`/projects/${id}/designs`, designListResponseSchema, { query: { archived } }).then((b) => b.designs),
  createDesign: (id: number, request: CreateDesignRequest) =>
    api.request(`/projects/${id}/designs`, designSummarySchema, { method: 'POST', body: request }),
};
