import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter } from 'vue-router';
import ElementPlus from 'element-plus';
import App from '../src/App.vue';
import { routes } from '../src/router/routes.ts';
import { roleGuard } from '../src/router/guard.ts';
import { sessionApi } from '../src/api/sessionApi.ts';
import { useSessionStore } from '../src/stores/useSessionStore.ts';

async function mountAt(path: string) {
  const pinia = createPinia();
  setActivePinia(pinia);
  const router = createRouter({ history: createMemoryHistory(), routes });
  const session = useSessionStore();
  router.beforeEach((to) => roleGuard(to, session));
  await router.push(path);
  const wrapper = mount(App, { global: { plugins: [pinia, router, ElementPlus] } });
  await router.isReady();
  await flushPromises();
  await new Promise((r) => setTimeout(r, 50));
  await flushPromises();
  return wrapper;
}

describe('the not-found page', () => {
  it('keeps the navigation rail for a signed-in person', async () => {
    vi.spyOn(sessionApi, 'current').mockResolvedValue({ id: 1, email: 'designer@example.test', displayName: 'Dana Designer', roles: ['designer'], organizationId: 1 } as never);
    const wrapper = await mountAt('/no-such-screen');
    expect(wrapper.text()).toContain('Nothing here');
    const nav = wrapper.find('nav[aria-label="Main"]');
    expect(nav.exists()).toBe(true);
    expect(nav.findAll('li a').map((a) => a.text())).toEqual(['Projects', 'Downloads', 'Conformance']);
  });

  it('draws no rail for a visitor who is not signed in', async () => {
    vi.spyOn(sessionApi, 'current').mockResolvedValue(null);
    const wrapper = await mountAt('/no-such-screen');
    expect(wrapper.text()).toContain('Nothing here');
    expect(wrapper.find('nav[aria-label="Main"]').exists()).toBe(false);
  });
});
