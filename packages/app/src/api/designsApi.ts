import { api } from './client.ts';
import type { Design, SaveDesignRequest } from './types.ts';

export const designsApi = {
  get: (id: number) => api.request<Design>(`/designs/${id}`),
  /** 409 stale_revision when the stored revision moved on; error.current carries the design as it is now. */
  save: (id: number, request: SaveDesignRequest) => api.request<Design>(`/designs/${id}`, { method: 'PUT', body: request }),
};
