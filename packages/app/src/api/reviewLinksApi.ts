import { api } from './client.ts';
import type { ReviewDecisionRequest, ReviewLinkView } from './types.ts';

export const reviewLinksApi = {
  read: (token: string) => api.request<ReviewLinkView>(`/review-links/${encodeURIComponent(token)}`),
  /** A deliberate POST: the link's GET never decides anything (DESIGN.md flow, step 4). */
  decide: (token: string, request: ReviewDecisionRequest) =>
    api.request<ReviewLinkView>(`/review-links/${encodeURIComponent(token)}`, { method: 'POST', body: request }),
};
