import type { RouteRecordRaw } from 'vue-router'
import { ROLES } from '../../../shared/schemas/common'
import { AREA_ROLES } from '../../../shared/ui/access'
import { ROUTE } from '../../router/route-names'

export const RUN_ROUTE = 'run-detail'
export const SWEEP_ROUTE = 'sweep-detail'
export const ADVISOR_ROUTE = 'detector-advisor'
export const RUN_COMPARE_ROUTE = 'run-compare'

export const routes: RouteRecordRaw[] = [
  { path: 'scenarios', name: ROUTE.scenarios, component: () => import('./ScenariosPage.vue'), meta: { title: 'Scenarios & runs', roles: AREA_ROLES.scenarios } },
  // Lab managers and staff open results of floors they belong to (the server decides which).
  { path: 'runs/compare', name: RUN_COMPARE_ROUTE, component: () => import('./RunComparePage.vue'), props: (route) => ({ ids: String(route.query.ids ?? '') }), meta: { title: 'Compare results', roles: AREA_ROLES.scenarios } },
  { path: 'runs/:runId', name: RUN_ROUTE, component: () => import('./RunPage.vue'), props: true, meta: { title: 'Run result', roles: ROLES } },
  { path: 'sweeps/:sweepId', name: SWEEP_ROUTE, component: () => import('./SweepPage.vue'), props: true, meta: { title: 'Sweep', roles: ROLES } },
  { path: 'floors/:floorId/advisor', name: ADVISOR_ROUTE, component: () => import('./AdvisorPage.vue'), props: true, meta: { title: 'Detector advisor', roles: AREA_ROLES.scenarios } },
]
