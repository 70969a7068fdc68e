import { api } from './client.ts';
import type { DesignSummary, Project } from './types.ts';

export interface CreateProjectRequest {
  readonly name: string;
  readonly description: string;
}

/** A design starts from a template (GET /api/templates), a full spec, or blank. */
export interface CreateDesignRequest {
  readonly name: string;
  readonly templateId?: string;
  readonly spec?: unknown;
}

export interface DesignTemplate {
  readonly id: string;
  readonly title: string;
  readonly description: string;
}

export const projectsApi = {
  list: () => api.request<{ projects: Project[] }>('/projects').then((b) => b.projects),
  create: (request: CreateProjectRequest) => api.request<Project>('/projects', { method: 'POST', body: request }),
  templates: () => api.request<{ templates: DesignTemplate[] }>('/templates').then((b) => b.templates),
  designs: (id: number) =>
    api.request<{ designs: DesignSummary[] }>(`/projects/${id}/designs`).then((b) => b.designs),
  createDesign: (id: number, request: CreateDesignRequest) =>
    api.request<DesignSummary>(`/projects/${id}/designs`, { method: 'POST', body: request }),
};
