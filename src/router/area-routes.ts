import type { Area } from '../../shared/ui/access'
import { ROUTE, type RouteName } from './route-names'

/** The landing route of each area, for links that name an area rather than a page. */
export const AREA_ROUTE: Record<Area, RouteName> = {
  overview: ROUTE.overview,
  floors: ROUTE.floors,
  scenarios: ROUTE.scenarios,
  plans: ROUTE.plans,
  drills: ROUTE.drills,
  users: ROUTE.users,
  outbox: ROUTE.outbox,
}
