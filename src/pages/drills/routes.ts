import type { RouteRecordRaw } from 'vue-router'
import { AREA_ROLES } from '../../../shared/ui/access'
import { ROUTE } from '../../router/route-names'

export const DRILL_NEW_ROUTE = 'drill-new'
export const DRILL_DETAIL_ROUTE = 'drill-detail'
/** The public receipt page; registered in the auth layout (src/router/routes.ts) because it needs no sign-in. */
export const DRILL_CONFIRM_ROUTE = 'drill-confirm'

export const routes: RouteRecordRaw[] = [
  { path: 'drills', name: ROUTE.drills, component: () => import('./DrillListPage.vue'), meta: { title: 'Drills', roles: AREA_ROLES.drills } },
  { path: 'drills/new', name: DRILL_NEW_ROUTE, component: () => import('./DrillNewPage.vue'), props: (r) => ({ planId: Number(r.query.planId) || null }), meta: { title: 'Schedule a drill', roles: ['admin', 'ehs_officer'] } },
  { path: 'drills/:drillId(\\d+)', name: DRILL_DETAIL_ROUTE, component: () => import('./DrillDetailPage.vue'), props: (r) => ({ drillId: Number(r.params.drillId) }), meta: { title: 'Drill', roles: AREA_ROLES.drills } },
]
