import { idParamsSchema, userCreateRequestSchema, userUpdateRequestSchema, type ReviewerListResponse, type UserListResponse, type UserRecord } from '@loopwright/contract';
import { route } from './table.ts';

const ADMIN = ['admin'] as const;

export const userRoutes = [
  route({
    method: 'get',
    path: '/users',
    access: ADMIN,
    summary: 'list the accounts of my organisation',
    handler: async ({ services, user }): Promise<UserListResponse> => ({ users: await services.users.list(user.organizationId) }),
  }),
  route({
    method: 'post',
    path: '/users',
    access: ADMIN,
    summary: 'create an account',
    status: 201,
    body: userCreateRequestSchema,
    handler: ({ services, user, body, actor }): Promise<UserRecord> => services.users.create(user.organizationId, body, actor),
  }),
  route({
    method: 'patch',
    path: '/users/:id',
    access: ADMIN,
    summary: 'rename, re-role, disable or enable an account (disable and re-role end its sessions)',
    params: idParamsSchema,
    body: userUpdateRequestSchema,
    handler: ({ services, user, params, body, actor }): Promise<UserRecord> => services.users.update(user.organizationId, params.id, body, actor),
  }),
  route({
    method: 'get',
    path: '/reviewers',
    access: ['designer'],
    summary: 'enabled accounts holding the reviewer role (id, name, e-mail), so a designer can name reviewers',
    handler: async ({ services, user }): Promise<ReviewerListResponse> => ({
      reviewers: (await services.users.list(user.organizationId))
        .filter((u) => u.roles.includes('reviewer') && !u.disabled)
        .map((u) => ({ id: u.id, displayName: u.displayName, email: u.email })),
    }),
  }),
];
