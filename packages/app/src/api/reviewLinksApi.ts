import { api } from './client.ts';
import type { ReviewDecisionRequest, ReviewDecisionResponse, ReviewLinkView } from './types.ts';

export const reviewLinksApi = {
  /** Reads only: the link stays unused until a decision is posted. */
  read: (token: string) => api.request<ReviewLinkView>(`/review-links/${encodeURIComponent(token)}`),
  /** A deliberate POST bound to the manifest hash the reviewer read (DESIGN.md flow, step 4). */
  decide: (token: string, request: ReviewDecisionRequest) =>
    api.request<ReviewDecisionResponse>(`/review-links/${encodeURIComponent(token)}`, { method: 'POST', body: request }),
};
