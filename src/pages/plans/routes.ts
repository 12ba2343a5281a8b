import type { RouteRecordRaw } from 'vue-router'
import { AREA_ROLES } from '../../../shared/ui/access'
import { ROUTE } from '../../router/route-names'

export const PLAN_NEW_ROUTE = 'plan-new'
export const PLAN_DETAIL_ROUTE = 'plan-detail'

export const routes: RouteRecordRaw[] = [
  { path: 'plans', name: ROUTE.plans, component: () => import('./PlanListPage.vue'), meta: { title: 'Response plans', roles: AREA_ROLES.plans } },
  { path: 'plans/new', name: PLAN_NEW_ROUTE, component: () => import('./PlanNewPage.vue'), meta: { title: 'New response plan', roles: ['admin', 'ehs_officer'] } },
  { path: 'plans/:planId(\\d+)', name: PLAN_DETAIL_ROUTE, component: () => import('./PlanDetailPage.vue'), props: (r) => ({ planId: Number(r.params.planId) }), meta: { title: 'Response plan', roles: AREA_ROLES.plans } },
]
