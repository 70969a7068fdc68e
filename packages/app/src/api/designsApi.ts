import { designRecordSchema } from '@loopwright/contract';
import { api } from './client.ts';
import type { SaveDesignRequest } from './types.ts';

export const designsApi = {
  get: (id: number) => api.request(`/designs/${id}`, designRecordSchema),
  /** 409 stale_revision when the stored revision moved on; error.current carries the design as it is now. */
  save: (id: number, request: SaveDesignRequest) => api.request(`/designs/${id}`, designRecordSchema, { method: 'PUT', body: request }),
};
