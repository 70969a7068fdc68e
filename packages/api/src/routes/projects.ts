import {
  idParamsSchema,
  projectCreateRequestSchema,
  projectListQuerySchema,
  projectUpdateRequestSchema,
  type ProjectListResponse,
  type ProjectRecord,
} from '@loopwright/contract';
import { route } from './table.ts';

const DESIGNER = ['designer'] as const;

export const projectRoutes = [
  route({
    method: 'get',
    path: '/projects',
    access: 'signed-in',
    summary: 'list projects (?archived=false|true|all, default false; firmware: designCount counts designs with an approved release)',
    query: projectListQuerySchema,
    handler: async ({ services, user, query }): Promise<ProjectListResponse> => ({
      projects: await services.handoff.releases.projectsForUser(user.organizationId, await services.projects.list(user.organizationId, query), user),
    }),
  }),
  route({
    method: 'post',
    path: '/projects',
    access: DESIGNER,
    summary: 'create a project',
    status: 201,
    body: projectCreateRequestSchema,
    handler: ({ services, user, body, actor }): Promise<ProjectRecord> => services.projects.create(user.organizationId, body, { ...actor, id: user.id }),
  }),
  route({
    method: 'get',
    path: '/projects/:id',
    access: 'signed-in',
    summary: 'read a project',
    params: idParamsSchema,
    handler: async ({ services, user, params }): Promise<ProjectRecord> => {
      const [project] = await services.handoff.releases.projectsForUser(user.organizationId, [await services.projects.get(user.organizationId, params.id)], user);
      return project!;
    },
  }),
  route({
    method: 'patch',
    path: '/projects/:id',
    access: DESIGNER,
    summary: 'rename, describe, archive or restore a project',
    params: idParamsSchema,
    body: projectUpdateRequestSchema,
    handler: ({ services, user, params, body, actor }): Promise<ProjectRecord> => services.projects.update(user.organizationId, params.id, body, actor),
  }),
];
