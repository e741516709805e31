import { createRouter, createWebHistory, type RouteRecordRaw } from 'vue-router';
import type { Role } from '@shared/types';
import { useAuthStore } from '@/stores/auth';

declare module 'vue-router' {
  interface RouteMeta {
    /** Signed-in users only. */
    auth?: boolean;
    /** Lowest role allowed (implies auth). */
    role?: Role;
    /** Only for visitors who are not signed in (sign in, register). */
    guest?: boolean;
    title?: string;
  }
}

export type RouteName =
  | 'home'
  | 'sign-in'
  | 'register'
  | 'account'
  | 'admin-users'
  | 'part-new'
  | 'part-edit'
  | 'part'
  | 'my-parts'
  | 'not-found';

const routes: RouteRecordRaw[] = [
  {
    path: '/',
    component: () => import('@/layout/AppLayout.vue'),
    children: [
      { path: '', name: 'home', component: () => import('@/views/HomeView.vue'), meta: { title: 'The crew shelf' } },
      { path: 'sign-in', name: 'sign-in', component: () => import('@/views/SignInView.vue'), meta: { guest: true, title: 'Sign in' } },
      { path: 'register', name: 'register', component: () => import('@/views/RegisterView.vue'), meta: { guest: true, title: 'Join' } },
      { path: 'account', name: 'account', component: () => import('@/views/AccountView.vue'), meta: { auth: true, title: 'Your account' } },
      {
        path: 'parts/new',
        name: 'part-new',
        component: () => import('@/views/PartSubmitView.vue'),
        meta: { auth: true, title: 'Submit a part' },
      },
      {
        path: 'parts/:id/edit',
        name: 'part-edit',
        component: () => import('@/views/PartSubmitView.vue'),
        meta: { auth: true, title: 'Change a part' },
      },
      { path: 'parts/:id', name: 'part', component: () => import('@/views/PartPageView.vue'), meta: { title: 'Part' } },
      { path: 'my/parts', name: 'my-parts', component: () => import('@/views/MyPartsView.vue'), meta: { auth: true, title: 'My submissions' } },
      {
        path: 'admin/users',
        name: 'admin-users',
        component: () => import('@/views/AdminUsersView.vue'),
        meta: { role: 'admin', title: 'Accounts' },
      },
      { path: ':rest(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { title: 'Not found' } },
    ],
  },
];

export const router = createRouter({
  history: createWebHistory(),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
});

router.beforeEach(async (to) => {
  const auth = useAuthStore();
  await auth.ensureLoaded();
  const needsAuth = to.meta.auth || to.meta.role;
  if (needsAuth && !auth.signedIn) return { name: 'sign-in', query: { next: to.fullPath } };
  if (to.meta.role && !auth.hasRole(to.meta.role)) return { name: 'home' };
  if (to.meta.guest && auth.signedIn) return { name: 'home' };
  return true;
});

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Rigshelf` : 'Rigshelf';
});
