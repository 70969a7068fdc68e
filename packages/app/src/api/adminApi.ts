import { api } from './client.ts';
import type { AuditEntry, AuditQuery, CreateUserRequest, UpdateUserRequest, UserAccount } from './types.ts';

export const usersApi = {
  list: () => api.request<{ users: UserAccount[] }>('/users').then((b) => b.users),
  create: (request: CreateUserRequest) => api.request<UserAccount>('/users', { method: 'POST', body: request }),
  update: (id: number, request: UpdateUserRequest) => api.request<UserAccount>(`/users/${id}`, { method: 'PATCH', body: request }),
};

export const auditApi = {
  list: (query: AuditQuery = {}) =>
    api.request<{ entries: AuditEntry[] }>('/audit', { query: { ...query } }).then((b) => b.entries),
};
