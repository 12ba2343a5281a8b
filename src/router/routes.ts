import type { RouteRecordRaw } from 'vue-router'
import { AREA_ROLES } from '../../shared/ui/access'
import { ROUTE } from './route-names'

/**
 * Feature folders plug in their own pages: `src/pages/<feature>/routes.ts` exporting `routes` (children of the
 * signed-in layout, named from ROUTE, with `meta.roles` from AREA_ROLES). Collected at build time, so adding a
 * feature never edits this file.
 */
const featureModules = import.meta.glob<{ routes: RouteRecordRaw[] }>('../pages/*/routes.ts', { eager: true })
const featureRoutes = Object.values(featureModules).flatMap((module) => module.routes)

const tokenProp = (route: { query: Record<string, unknown> }) => ({
  token: typeof route.query.token === 'string' ? route.query.token : '',
})

export const routes: RouteRecordRaw[] = [
  {
    path: '/',
    component: () => import('../layouts/MainLayout.vue'),
    children: [
      { path: '', name: ROUTE.overview, component: () => import('../pages/OverviewPage.vue'), meta: { title: 'Overview', roles: AREA_ROLES.overview } },
      { path: 'admin/users', name: ROUTE.users, component: () => import('../pages/admin/UsersPage.vue'), meta: { title: 'Users', roles: AREA_ROLES.users } },
      { path: 'admin/outbox', name: ROUTE.outbox, component: () => import('../pages/admin/OutboxPage.vue'), meta: { title: 'Outbox', roles: AREA_ROLES.outbox } },
      { path: 'not-allowed', name: ROUTE.notAllowed, component: () => import('../pages/NotAllowedPage.vue'), meta: { title: 'Not allowed' } },
      ...featureRoutes,
    ],
  },
  {
    path: '/',
    component: () => import('../layouts/AuthLayout.vue'),
    meta: { public: true },
    children: [
      { path: 'sign-in', name: ROUTE.signIn, component: () => import('../pages/SignInPage.vue'), meta: { title: 'Sign in' } },
      { path: 'forgot-password', name: ROUTE.forgotPassword, component: () => import('../pages/ForgotPasswordPage.vue'), meta: { title: 'Forgot password' } },
      // These two paths are fixed: the server puts them in e-mailed links.
      { path: 'reset-password', name: ROUTE.resetPassword, component: () => import('../pages/ResetPasswordPage.vue'), props: tokenProp, meta: { title: 'Choose a new password' } },
      { path: 'invite', name: ROUTE.acceptInvitation, component: () => import('../pages/AcceptInvitationPage.vue'), props: tokenProp, meta: { title: 'Accept invitation' } },
      { path: 'drills/confirm', name: 'drill-confirm', component: () => import('../pages/drills/DrillConfirmPage.vue'), props: tokenProp, meta: { title: 'Drill notice' } },
      // Always last: anything unknown.
      { path: ':pathMatch(.*)*', name: ROUTE.notFound, component: () => import('../pages/NotFoundPage.vue'), meta: { title: 'Not found' } },
    ],
  },
]
