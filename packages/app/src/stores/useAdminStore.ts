import { defineStore } from 'pinia';
import { ref } from 'vue';
import { auditApi, usersApi } from '../api/adminApi.ts';
import type { AuditEntry, AuditQuery, CreateUserRequest, UpdateUserRequest, UserAccount } from '../api/types.ts';

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

  async function loadAudit(query: AuditQuery = {}): Promise<void> {
    loadingAudit.value = true;
    error.value = null;
    try {
      audit.value = await auditApi.list({ limit: 500, ...query });
    } catch (cause) {
      error.value = cause;
    } finally {
      loadingAudit.value = false;
    }
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

  return { users, audit, loadingUsers, loadingAudit, error, loadUsers, loadAudit, createUser, updateUser };
});
