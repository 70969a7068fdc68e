import {
  conformanceListResponseSchema,
  conformanceRecordSchema,
  downloadListResponseSchema,
  releaseDiffSchema,
  releaseListResponseSchema,
  releaseRecordSchema,
  releaseVerificationSchema,
  reviewerListResponseSchema,
  waitingReviewListSchema,
} from '@loopwright/contract';
import { api } from './client.ts';
import type { ReviewRequest } from './types.ts';

export const releasesApi = {
  forDesign: (designId: number) => api.request(`/designs/${designId}/releases`, releaseListResponseSchema).then((b) => b.releases),
  /** The server recomputes everything from the stored spec; its numbers are the ones that count. */
  cut: (designId: number) => api.request(`/designs/${designId}/releases`, releaseRecordSchema, { method: 'POST', body: {} }),
  get: (id: number) => api.request(`/releases/${id}`, releaseRecordSchema),
  /** The server's verification of the reference RTL, polled while it runs. */
  verification: (id: number) => api.request(`/releases/${id}/verification`, releaseVerificationSchema),
  /** Approved releases across projects (what firmware sees by default). */
  approved: () => api.request('/releases', releaseListResponseSchema).then((b) => b.releases),
  /** The reviews that wait for the signed-in reviewer. */
  waitingReviews: () => api.request('/reviews/waiting', waitingReviewListSchema).then((b) => b.reviews),
  diff: (id: number, againstId: number) => api.request(`/releases/${id}/diff`, releaseDiffSchema, { query: { against: againstId } }),
  withdraw: (id: number, reason: string) => api.send(`/releases/${id}/withdraw`, { method: 'POST', body: reason ? { reason } : {} }),
  /** Who downloaded what, when (designers and admins). */
  downloads: (id: number) => api.request(`/releases/${id}/downloads`, downloadListResponseSchema).then((b) => b.downloads),
  requestReview: (id: number, request: ReviewRequest) => api.send(`/releases/${id}/reviews`, { method: 'POST', body: request }),
  /** Plain links: the browser downloads them itself (the server logs each download). */
  fileUrl: (id: number, name: string) => api.url(`/releases/${id}/files/${encodeURIComponent(name)}`),
  bundleUrl: (id: number) => api.url(`/releases/${id}/bundle`),
  conformance: (id: number) => api.request(`/releases/${id}/conformance`, conformanceListResponseSchema).then((b) => b.runs),
  uploadCapture: (id: number, file: File) => {
    const form = new FormData();
    form.append('file', file, file.name);
    return api.request(`/releases/${id}/conformance`, conformanceRecordSchema, { method: 'POST', body: form });
  },
  /** People holding the reviewer role (GET /api/reviewers, for designers). */
  reviewers: () => api.request('/reviewers', reviewerListResponseSchema).then((b) => b.reviewers),
};
