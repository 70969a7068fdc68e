import { reviewDecisionResponseSchema, reviewLinkViewSchema } from '@loopwright/contract';
import { api } from './client.ts';
import type { ReviewDecisionRequest } from './types.ts';

export const reviewLinksApi = {
  /** Reads only: the link stays unused until a decision is posted. */
  read: (token: string) => api.request(`/review-links/${encodeURIComponent(token)}`, reviewLinkViewSchema),
  /** One file of the release, read with the link (logged as the reviewer's download; the link stays unused). */
  fileText: async (token: string, name: string): Promise<string> => {
    const response = await fetch(api.url(`/review-links/${encodeURIComponent(token)}/files/${encodeURIComponent(name)}`), { credentials: 'same-origin' });
    if (!response.ok) throw new Error(`reading ${name} answered ${response.status}`);
    return response.text();
  },
  /** A deliberate POST bound to the manifest hash the reviewer read (DESIGN.md "The flow", step 4). */
  decide: (token: string, request: ReviewDecisionRequest) =>
    api.request(`/review-links/${encodeURIComponent(token)}`, reviewDecisionResponseSchema, { method: 'POST', body: request }),
};
