import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import { sessionApi } from '../api/sessionApi.ts';
import type { Role, SessionUser, SignInRequest } from '../api/types.ts';

export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null);
  /** True once the server has been asked who is signed in (the guard waits for it). */
  const loaded = ref(false);
  const signingIn = ref(false);

  const signedIn = computed(() => user.value !== null);
  const roles = computed<readonly Role[]>(() => user.value?.roles ?? []);

  function hasRole(role: Role): boolean {
    return roles.value.includes(role);
  }

  function hasAnyRole(wanted: readonly Role[]): boolean {
    return wanted.some(hasRole);
  }

  async function load(): Promise<void> {
    try {
      user.value = await sessionApi.current();
    } finally {
      loaded.value = true;
    }
  }

  async function ensureLoaded(): Promise<void> {
    if (!loaded.value) await load();
  }

  async function signIn(request: SignInRequest): Promise<SessionUser> {
    signingIn.value = true;
    try {
      const signed = await sessionApi.signIn(request);
      user.value = signed;
      loaded.value = true;
      return signed;
    } finally {
      signingIn.value = false;
    }
  }

  /** Drop the local copy of a session the server no longer knows. */
  function forget(): void {
    user.value = null;
  }

  async function signOut(): Promise<void> {
    try {
      await sessionApi.signOut();
    } finally {
      user.value = null;
    }
  }

  return { user, loaded, signingIn, signedIn, roles, hasRole, hasAnyRole, load, ensureLoaded, signIn, signOut, forget };
});
