import { defineStore } from 'pinia';
import { ref } from 'vue';
import { auditApi, usersApi } from '../api/adminApi.ts';
import type { AuditEntry, AuditQuery, CreateUserRequest, UpdateUserRequest, UserAccount } from '../api/types.ts';

/** Entries per page of the audit view (the API allows up to 500). */
export const AUDIT_PAGE = 200;

export const useAdminStore = defineStore('admin', () => {
  const users = ref<UserAccount[]>([]);
  const audit = ref<AuditEntry[]>([]);
  const loadingUsers = ref(false);
  const loadingAudit = ref(false);
  const error = ref<unknown>(null);

  async function loadUsers(): Promise<void> {
    loadingUsers.value = true;
    error.value = null;
    try {
      users.value = await usersApi.list();
    } catch (cause) {
      error.value = cause;
    } finally {
      loadingUsers.value = false;
    }
  }

  /** True while the last page came back full: older entries may follow. */
  const auditHasMore = ref(false);

  async function fetchAudit(query: AuditQuery, append: boolean): Promise<void> {
    loadingAudit.value = true;
    error.value = null;
    try {
      const page = await auditApi.list({ limit: AUDIT_PAGE, ...query });
      audit.value = append ? [...audit.value, ...page] : page;
      auditHasMore.value = page.length === (query.limit ?? AUDIT_PAGE);
    } catch (cause) {
      error.value = cause;
    } finally {
      loadingAudit.value = false;
    }
  }

  /** The newest page of the audit trail. */
  async function loadAudit(query: AuditQuery = {}): Promise<void> {
    await fetchAudit(query, false);
  }

  /** The next older page, after the oldest entry shown (the API pages by beforeId). */
  async function loadOlderAudit(): Promise<void> {
    const oldest = audit.value.at(-1);
    if (!oldest) return loadAudit();
    await fetchAudit({ beforeId: oldest.id }, true);
  }

  async function createUser(request: CreateUserRequest): Promise<UserAccount> {
    const user = await usersApi.create(request);
    users.value = [...users.value, user];
    return user;
  }

  /** Update one account; the list shows the server's answer, not the request. */
  async function updateUser(id: number, request: UpdateUserRequest): Promise<UserAccount> {
    const user = await usersApi.update(id, request);
    users.value = users.value.map((u) => (u.id === id ? user : u));
    return user;
  }

  return { users, audit, auditHasMore, loadingUsers, loadingAudit, error, loadUsers, loadAudit, loadOlderAudit, createUser, updateUser };
});
