import { api } from './client.ts';
import type { ConformanceResult } from './types.ts';

export const conformanceApi = {
  list: (releaseId: number) =>
    api.request<{ results: ConformanceResult[] }>(`/releases/${releaseId}/conformance`).then((b) => b.results),
  upload: (releaseId: number, file: File) => {
    const form = new FormData();
    form.append('capture', file, file.name);
    return api
      .request<{ result: ConformanceResult }>(`/releases/${releaseId}/conformance`, { method: 'POST', body: form })
      .then((b) => b.result);
  },
};
