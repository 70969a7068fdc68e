import { api } from './client.ts';
import type { Design, SaveDesignRequest } from './types.ts';

export const designsApi = {
  get: (id: number) => api.request<{ design: Design }>(`/designs/${id}`).then((b) => b.design),
  /** 409 (ApiError.status) when the stored revision moved on; the body carries the current design. */
  save: (id: number, request: SaveDesignRequest) =>
    api.request<{ design: Design }>(`/designs/${id}`, { method: 'PUT', body: request }).then((b) => b.design),
  /** The server's analysis of the stored spec (the numbers that count at release time). */
  analysis: (id: number) => api.request<{ analysis: unknown }>(`/designs/${id}/analysis`).then((b) => b.analysis),
};
