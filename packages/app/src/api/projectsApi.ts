import { api } from './client.ts';
import type { DesignSummary, Project } from './types.ts';

export interface CreateProjectRequest {
  readonly name: string;
  readonly description: string;
}

export interface CreateDesignRequest {
  readonly name: string;
  readonly spec: unknown;
}

export const projectsApi = {
  list: () => api.request<{ projects: Project[] }>('/projects').then((b) => b.projects),
  get: (id: number) => api.request<{ project: Project }>(`/projects/${id}`).then((b) => b.project),
  create: (request: CreateProjectRequest) =>
    api.request<{ project: Project }>('/projects', { method: 'POST', body: request }).then((b) => b.project),
  designs: (id: number) =>
    api.request<{ designs: DesignSummary[] }>(`/projects/${id}/designs`).then((b) => b.designs),
  createDesign: (id: number, request: CreateDesignRequest) =>
    api
      .request<{ design: DesignSummary }>(`/projects/${id}/designs`, { method: 'POST', body: request })
      .then((b) => b.design),
};
