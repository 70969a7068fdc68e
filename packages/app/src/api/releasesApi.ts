import { api, ApiError } from './client.ts';
import { usersApi } from './adminApi.ts';
import type {
  ConformanceRecord,
  DownloadRecord,
  ReleaseDiff,
  ReleaseRecord,
  ReleaseSummary,
  ReviewerChoice,
  ReviewRequest,
} from './types.ts';

export const releasesApi = {
  forDesign: (designId: number) =>
    api.request<{ releases: ReleaseSummary[] }>(`/designs/${designId}/releases`).then((b) => b.releases),
  /** The server recomputes everything from the stored spec; its numbers are the ones that count. */
  cut: (designId: number) => api.request<ReleaseRecord>(`/designs/${designId}/releases`, { method: 'POST', body: {} }),
  get: (id: number) => api.request<ReleaseRecord>(`/releases/${id}`),
  /** Approved releases across projects (what firmware sees by default). */
  approved: () => api.request<{ releases: ReleaseSummary[] }>('/releases').then((b) => b.releases),
  diff: (id: number, againstId: number) => api.request<ReleaseDiff>(`/releases/${id}/diff`, { query: { against: againstId } }),
  withdraw: (id: number, reason: string) =>
    api.request<unknown>(`/releases/${id}/withdraw`, { method: 'POST', body: reason ? { reason } : {} }),
  /** Who downloaded what, when (designers and admins). */
  downloads: (id: number) => api.request<{ downloads: DownloadRecord[] }>(`/releases/${id}/downloads`).then((b) => b.downloads),
  requestReview: (id: number, request: ReviewRequest) =>
    api.request<unknown>(`/releases/${id}/reviews`, { method: 'POST', body: request }),
  /** Plain links: the browser downloads them itself (the server logs each download). */
  fileUrl: (id: number, name: string) => api.url(`/releases/${id}/files/${encodeURIComponent(name)}`),
  bundleUrl: (id: number) => api.url(`/releases/${id}/bundle`),
  conformance: (id: number) =>
    api.request<{ runs: ConformanceRecord[] }>(`/releases/${id}/conformance`).then((b) => b.runs),
  uploadCapture: (id: number, file: File) => {
    const form = new FormData();
    form.append('file', file, file.name);
    return api.request<ConformanceRecord>(`/releases/${id}/conformance`, { method: 'POST', body: form });
  },
  /**
   * People holding the reviewer role. GET /api/reviewers when the server offers it; otherwise the
   * admin-only account list (a designer without it gets the server's error).
   */
  async reviewers(): Promise<ReviewerChoice[]> {
    try {
      return (await api.request<{ reviewers: ReviewerChoice[] }>('/reviewers')).reviewers;
    } catch (cause) {
      if (!(cause instanceof ApiError) || cause.status !== 404) throw cause;
    }
    const users = await usersApi.list();
    return users.filter((u) => u.roles.includes('reviewer') && !u.disabled).map((u) => ({ id: u.id, displayName: u.displayName, email: u.email }));
  },
};
