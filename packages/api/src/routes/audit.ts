import { auditQuerySchema, type AuditListResponse } from '@loopwright/contract';
import { route } from './table.ts';

export const auditRoutes = [
  route({
    method: 'get',
    path: '/audit',
    access: ['admin'],
    summary: 'the audit trail of my organisation, newest first (?objectType, objectId, actorId, beforeId, limit ≤ 500)',
    query: auditQuerySchema,
    handler: async ({ services, user, query }): Promise<AuditListResponse> => ({ entries: await services.audit.list(user.organizationId, query) }),
  }),
];
