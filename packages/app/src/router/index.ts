import { createRouter, createWebHistory, type Router } from 'vue-router';
import type { Pinia } from 'pinia';
import { useSessionStore } from '../stores/useSessionStore.ts';
import { api } from '../api/client.ts';
import { roleGuard, signInGuard } from './guard.ts';
import { routes } from './routes.ts';

export function createAppRouter(pinia: Pinia): Router {
  const router = createRouter({ history: createWebHistory(), routes });
  router.beforeEach(async (to) => {
    const session = useSessionStore(pinia);
    const signIn = await signInGuard(to, session);
    if (signIn !== true) return signIn;
    return roleGuard(to, session);
  });
  // A session that ends while someone works (expired, or disabled by an admin): back to sign-in,
  // then back to where they were. Calls made while signed out (sign-in itself) are left alone.
  api.onUnauthenticated(() => {
    const session = useSessionStore(pinia);
    if (!session.signedIn) return;
    session.forget();
    const current = router.currentRoute.value;
    if (current.meta.public) return;
    void router.push({ name: 'sign-in', query: { redirect: current.fullPath, expired: '1' } });
  });
  router.afterEach((to) => {
    document.title = to.meta.title ? `${to.meta.title} · Loopwright` : 'Loopwright';
  });
  return router;
}
