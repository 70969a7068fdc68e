import { auditListResponseSchema, userListResponseSchema, userRecordSchema } from '@loopwright/contract';
import { api } from './client.ts';
import type { AuditQuery, CreateUserRequest, UpdateUserRequest } from './types.ts';

export const usersApi = {
  list: () => api.request('/users', userListResponseSchema).then((b) => b.users),
  create: (request: CreateUserRequest) => api.request('/users', userRecordSchema, { method: 'POST', body: request }),
  update: (id: number, request: UpdateUserRequest) => api.request(`/users/${id}`, userRecordSchema, { method: 'PATCH', body: request }),
};

export const auditApi = {
  list: (query: AuditQuery = {}) => api.request('/audit', auditListResponseSchema, { query: { ...query } }).then((b) => b.entries),
};
