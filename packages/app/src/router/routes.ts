import type { RouteRecordRaw } from 'vue-router';
import SignInView from '../views/SignInView.vue';

// Only the sign-in route is loaded up front; every other screen is its own chunk so the first
// page does not pay for charts or the editor.
export const routes: RouteRecordRaw[] = [
  { path: '/', redirect: { name: 'projects' } },
  { path: '/sign-in', name: 'sign-in', component: SignInView, meta: { public: true, title: 'Sign in' } },
  {
    path: '/projects',
    name: 'projects',
    component: () => import('../views/ProjectsView.vue'),
    meta: { roles: ['designer', 'reviewer', 'admin'], title: 'Projects' },
  },
  {
    path: '/designs/:designId',
    name: 'design-editor',
    component: () => import('../views/DesignEditorView.vue'),
    meta: { roles: ['designer', 'reviewer'], title: 'Design editor' },
  },
  {
    path: '/designs/:designId/releases',
    name: 'releases',
    component: () => import('../views/ReleasesView.vue'),
    meta: { roles: ['designer', 'reviewer'], title: 'Releases' },
  },
  {
    path: '/reviews',
    name: 'reviews',
    component: () => import('../views/ReviewsView.vue'),
    meta: { roles: ['reviewer'], title: 'My reviews' },
  },
  {
    path: '/review/:token',
    name: 'review',
    component: () => import('../views/ReviewView.vue'),
    meta: { public: true, title: 'Review' },
  },
  {
    path: '/downloads',
    name: 'downloads',
    component: () => import('../views/DownloadsView.vue'),
    meta: { roles: ['firmware', 'designer', 'reviewer'], title: 'Downloads' },
  },
  {
    path: '/conformance/:releaseId?',
    name: 'conformance',
    component: () => import('../views/ConformanceView.vue'),
    meta: { roles: ['firmware', 'designer'], title: 'Conformance' },
  },
  {
    path: '/admin',
    name: 'admin',
    component: () => import('../views/AdminView.vue'),
    meta: { roles: ['admin'], title: 'Admin' },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('../views/NotFoundView.vue'),
    meta: { public: true, title: 'Not found' },
  },
];
