import type { RouteRecordRaw } from 'vue-router'
import { AREA_ROLES } from '../../../shared/ui/access'
import { ROLES } from '../../../shared/schemas/common'
import { ROUTE } from '../../router/route-names'

/** Name of the editor route (one floor); the list is ROUTE.floors. */
export const FLOOR_EDITOR_ROUTE = 'floor-editor'

export const routes: RouteRecordRaw[] = [
  { path: 'floors', name: ROUTE.floors, component: () => import('./FloorListPage.vue'), meta: { title: 'Floors', roles: AREA_ROLES.floors } },
  // Staff open the floors they are assigned to (the server decides which), e.g. from a drill or a plan.
  { path: 'floors/:floorId', name: FLOOR_EDITOR_ROUTE, component: () => import('./FloorEditorPage.vue'), props: true, meta: { title: 'Floor', roles: ROLES } },
]
