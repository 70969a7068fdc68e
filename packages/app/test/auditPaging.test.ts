import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { auditApi } from '../src/api/adminApi.ts';
import { AUDIT_PAGE, useAdminStore } from '../src/stores/useAdminStore.ts';
import type { AuditEntry } from '../src/api/types.ts';

/** A trail of n entries, newest (highest id) first, as the API answers (services/audit.ts orders by id DESC). */
function trail(n: number): AuditEntry[] {
  return Array.from({ length: n }, (_, i) => ({ id: n - i, at: '2026-01-01T10:00:00Z', actorId: 1, actorEmail: 'admin@example.test', action: 'user.update', objectType: 'user', objectId: '1', objectLabel: 'a@example.test', ip: null, detail: null }));
}

describe('audit view paging', () => {
  beforeEach(() => setActivePinia(createPinia()));

  it('loads the trail a page at a time, older pages after the oldest shown, until none is left', async () => {
    const all = trail(AUDIT_PAGE * 2 + 17);
    const list = vi.spyOn(auditApi, 'list').mockImplementation(async (q = {}) => all.filter((e) => q.beforeId === undefined || e.id < q.beforeId).slice(0, q.limit ?? 100));
    const store = useAdminStore();
    await store.loadAudit();
    expect(store.audit).toHaveLength(AUDIT_PAGE);
    expect(store.auditHasMore).toBe(true);
    await store.loadOlderAudit();
    await store.loadOlderAudit();
    expect(store.audit.map((e) => e.id)).toEqual(all.map((e) => e.id));
    expect(store.auditHasMore).toBe(false);
    expect(list.mock.calls.map((c) => c[0]?.beforeId)).toEqual([undefined, all[AUDIT_PAGE - 1]!.id, all[2 * AUDIT_PAGE - 1]!.id]);
  });
});
