import { designRecordSchema, DESIGN_UPLOAD_FIELD, type DesignDuplicateRequest } from '@loopwright/contract';
import { api } from './client.ts';
import type { SaveDesignRequest } from './types.ts';

export const designsApi = {
  get: (id: number) => api.request(`/designs/${id}`, designRecordSchema),
  /** 409 stale_revision when the stored revision moved on; error.current carries the design as it is now. */
  save: (id: number, request: SaveDesignRequest) => api.request(`/designs/${id}`, designRecordSchema, { method: 'PUT', body: request }),
  /** A new design at revision 1 with the same spec, in this or another project. */
  duplicate: (id: number, request: DesignDuplicateRequest) => api.request(`/designs/${id}/duplicate`, designRecordSchema, { method: 'POST', body: request }),
  /** Archive (true) or restore (false); an archived design is read-only and keeps its releases. */
  setArchived: (id: number, archived: boolean) => api.request(`/designs/${id}`, designRecordSchema, { method: 'PATCH', body: { archived } }),
  /** Only a design without releases can be deleted (409 otherwise). */
  remove: (id: number) => api.send(`/designs/${id}`, { method: 'DELETE' }),
  /** A plain link: the browser saves `<spec.name>.spec.json` itself. */
  specUrl: (id: number) => api.url(`/designs/${id}/spec.json`),
  /** A new design in the project from a spec JSON file; the title defaults to the spec's name. */
  importSpec: (projectId: number, file: File, name?: string) => {
    const form = new FormData();
    if (name) form.append('name', name);
    form.append(DESIGN_UPLOAD_FIELD, file, file.name);
    return api.request(`/projects/${projectId}/designs/upload`, designRecordSchema, { method: 'POST', body: form });
  },
};
