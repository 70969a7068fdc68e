import { createRouter, createWebHistory, type Router } from 'vue-router';
import type { Pinia } from 'pinia';
import { useSessionStore } from '../stores/useSessionStore.ts';
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
  router.afterEach((to) => {
    document.title = to.meta.title ? `${to.meta.title} · Loopwright` : 'Loopwright';
  });
  return router;
}
