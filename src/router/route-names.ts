/**
 * Every route name in one place, so links never spell one twice. Planned areas are listed too: their
 * navigation items appear as soon as a route with that name is registered (see src/pages/README.md).
 */
export const ROUTE = {
  signIn: 'sign-in',
  forgotPassword: 'forgot-password',
  resetPassword: 'reset-password',
  acceptInvitation: 'accept-invitation',
  overview: 'overview',
  users: 'user-list',
  outbox: 'outbox',
  notAllowed: 'not-allowed',
  notFound: 'not-found',
  floors: 'floor-list',
  scenarios: 'scenario-list',
  plans: 'plan-list',
  drills: 'drill-list',
} as const

export type RouteName = (typeof ROUTE)[keyof typeof ROUTE]
