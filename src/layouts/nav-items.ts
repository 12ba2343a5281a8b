import { ROUTE, type RouteName } from '../router/route-names'

export interface NavItem {
  routeName: RouteName
  label: string
  /** Material icon name. */
  icon: string
  group: 'work' | 'admin'
}

/**
 * The drawer navigation, in display order. An item shows only when its route is registered and the user's
 * role is in that route's `meta.roles`, so a new page needs just its route (and, if new, one line here).
 */
export const NAV_ITEMS: readonly NavItem[] = [
  { routeName: ROUTE.overview, label: 'Overview', icon: 'space_dashboard', group: 'work' },
  { routeName: ROUTE.floors, label: 'Floors', icon: 'layers', group: 'work' },
  { routeName: ROUTE.scenarios, label: 'Scenarios & runs', icon: 'air', group: 'work' },
  { routeName: ROUTE.plans, label: 'Response plans', icon: 'assignment_turned_in', group: 'work' },
  { routeName: ROUTE.drills, label: 'Drills', icon: 'campaign', group: 'work' },
  { routeName: ROUTE.users, label: 'Users', icon: 'group', group: 'admin' },
  { routeName: ROUTE.outbox, label: 'Outbox', icon: 'outbox', group: 'admin' },
]
