import { api } from './client.ts';
import type { Release, Review, ReviewRequest } from './types.ts';

export const releasesApi = {
  forDesign: (designId: number) =>
    api.request<{ releases: Release[] }>(`/designs/${designId}/releases`).then((b) => b.releases),
  cut: (designId: number, notes: string) =>
    api
      .request<{ release: Release }>(`/designs/${designId}/releases`, { method: 'POST', body: { notes } })
      .then((b) => b.release),
  get: (id: number) => api.request<{ release: Release }>(`/releases/${id}`).then((b) => b.release),
  /** Approved releases across projects (what firmware sees by default). */
  approved: () =>
    api.request<{ releases: Release[] }>('/releases', { query: { state: 'approved' } }).then((b) => b.releases),
  reviews: (id: number) => api.request<{ reviews: Review[] }>(`/releases/${id}/reviews`).then((b) => b.reviews),
  requestReview: (id: number, request: ReviewRequest) =>
    api.request<{ reviews: Review[] }>(`/releases/${id}/reviews`, { method: 'POST', body: request }).then((b) => b.reviews),
  fileUrl: (id: number, name: string) => api.url(`/releases/${id}/files/${encodeURIComponent(name)}`),
  bundleUrl: (id: number) => api.url(`/releases/${id}/bundle`),
  fileText: (id: number, name: string) => api.request<unknown>(`/releases/${id}/files/${encodeURIComponent(name)}`),
};
