import { estimateResponseSchema } from '@loopwright/contract';
import { api } from './client.ts';

export const estimatesApi = {
  /** yosys estimates of candidate specs: answered from the server's cache, or "pending" while a worker synthesises them. */
  candidates: (specs: readonly unknown[]) => api.request('/estimates', estimateResponseSchema, { method: 'POST', body: { specs } }).then((b) => b.estimates),
};
