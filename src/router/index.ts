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
    /** A change of the query alone (a search filter, the sort) keeps the scroll position. */
    keepScroll?: boolean;
  }
}

export type RouteName =
  | 'home'
  | 'search'
  | 'sign-in'
  | 'register'
  | 'account'
  | 'admin-users'
  | 'part-new'
  | 'part-edit'
  | 'part'
  | 'my-parts'
  | 'part-report'
  | 'profile'
  | 'flags'
  | 'kits'
  | 'kit'
  | 'kit-labels'
  | 'part-on-set'
  | 'printers'
  | 'review-queue'
  | 'review-desk'
  | 'verify-email'
  | 'forgot-password'
  | 'reset-password'
  | 'admin-mail'
  | 'admin-bodies'
  | 'builds'
  | 'wanted'
  | 'wanted-new'
  | 'wanted-request'
  | 'make'
  | 'make-part'
  | 'print-requests'
  | 'print-request'
  | 'crews'
  | 'crew'
  | 'invitation'
  | 'not-found';

const routes: RouteRecordRaw[] = [
  {
    path: '/',
    component: () => import('@/layout/AppLayout.vue'),
    children: [
      { path: '', name: 'home', component: () => import('@/views/HomeView.vue'), meta: { title: 'The crew shelf' } },
      { path: 'search', name: 'search', component: () => import('@/views/SearchView.vue'), meta: { title: 'Search the shelf', keepScroll: true } },
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
      {
        path: 'parts/:id/report',
        name: 'part-report',
        component: () => import('@/views/PartReportView.vue'),
        meta: { auth: true, title: 'Rate and report' },
      },
      { path: 'crew/:id(\\d+)', name: 'profile', component: () => import('@/views/ProfileView.vue'), meta: { title: 'Crew member' } },
      { path: 'review/flags', name: 'flags', component: () => import('@/views/FlagsView.vue'), meta: { role: 'moderator', title: 'Flagged entries' } },
      {
        path: 'print-requests',
        name: 'print-requests',
        component: () => import('@/views/PrintRequestsView.vue'),
        meta: { auth: true, title: 'Print requests' },
      },
      {
        path: 'print-requests/:id(\\d+)',
        name: 'print-request',
        component: () => import('@/views/PrintRequestView.vue'),
        meta: { auth: true, title: 'Print request' },
      },
      { path: 'kits', name: 'kits', component: () => import('@/views/KitsView.vue'), meta: { auth: true, title: 'Shoot kits' } },
      { path: 'kits/:id', name: 'kit', component: () => import('@/views/KitView.vue'), meta: { auth: true, title: 'Shoot kit' } },
      { path: 'kits/:id/labels', name: 'kit-labels', component: () => import('@/views/KitLabelsView.vue'), meta: { auth: true, title: 'Labels' } },
      { path: 'parts/:id/on-set', name: 'part-on-set', component: () => import('@/views/PartOnSetView.vue'), meta: { title: 'On set' } },
      { path: 'printers', name: 'printers', component: () => import('@/views/PrintersView.vue'), meta: { auth: true, title: 'Printers & prices' } },
      { path: 'builds', name: 'builds', component: () => import('@/views/BuildsView.vue'), meta: { auth: true, title: 'My camera builds' } },
      { path: 'wanted', name: 'wanted', component: () => import('@/views/WantedBoardView.vue'), meta: { auth: true, title: 'Wanted parts' } },
      { path: 'wanted/new', name: 'wanted-new', component: () => import('@/views/WantedNewView.vue'), meta: { auth: true, title: 'Ask the crew for a part' } },
      {
        path: 'wanted/:id(\\d+)',
        name: 'wanted-request',
        component: () => import('@/views/WantedRequestView.vue'),
        meta: { auth: true, title: 'Wanted part' },
      },
      { path: 'crews', name: 'crews', component: () => import('@/views/CrewsView.vue'), meta: { auth: true, title: 'Crews' } },
      { path: 'crews/:id(\\d+)', name: 'crew', component: () => import('@/views/CrewView.vue'), meta: { auth: true, title: 'Crew' } },
      { path: 'invitations/:token', name: 'invitation', component: () => import('@/views/InvitationView.vue'), meta: { title: 'Crew invitation' } },
      { path: 'my/parts', name: 'my-parts', component: () => import('@/views/MyPartsView.vue'), meta: { auth: true, title: 'My submissions' } },
      {
        path: 'admin/users',
        name: 'admin-users',
        component: () => import('@/views/AdminUsersView.vue'),
        meta: { role: 'admin', title: 'Accounts' },
      },
      { path: 'review', name: 'review-queue', component: () => import('@/views/ReviewQueueView.vue'), meta: { role: 'moderator', title: 'Review desk' } },
      {
        path: 'review/:partId(\\d+)',
        name: 'review-desk',
        component: () => import('@/views/ReviewDeskView.vue'),
        meta: { role: 'moderator', title: 'Review' },
      },
      { path: 'verify-email', name: 'verify-email', component: () => import('@/views/VerifyEmailView.vue'), meta: { title: 'Confirm your e-mail' } },
      { path: 'forgot-password', name: 'forgot-password', component: () => import('@/views/ForgotPasswordView.vue'), meta: { title: 'Forgot your password' } },
      { path: 'reset-password', name: 'reset-password', component: () => import('@/views/ResetPasswordView.vue'), meta: { title: 'New password' } },
      { path: 'admin/bodies', name: 'admin-bodies', component: () => import('@/views/AdminBodiesView.vue'), meta: { role: 'admin', title: 'Camera bodies' } },
      { path: 'admin/mail', name: 'admin-mail', component: () => import('@/views/AdminMailView.vue'), meta: { role: 'admin', title: 'Outgoing mail' } },
      { path: 'make', name: 'make', component: () => import('@/views/MakeListView.vue'), meta: { title: 'Make to size' } },
      { path: 'make/:kind', name: 'make-part', component: () => import('@/views/MakePartView.vue'), meta: { title: 'Make to size' } },
      { path: ':rest(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { title: 'Not found' } },
    ],
  },
];

export const router = createRouter({
  history: createWebHistory(),
  routes,
  // a #hash goes to that element when it is already on the page (views that load first scroll themselves)
  scrollBehavior(to, _from, saved) {
    if (saved) return saved;
    if (to.meta.keepScroll && to.path === _from.path) return false;
    const target = to.hash ? document.getElementById(decodeURIComponent(to.hash.slice(1))) : null;
    return target ? { el: target, top: 12 } : { top: 0 };
  },
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
