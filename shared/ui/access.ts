import { ROLES, type Role } from '../schemas/common'

/**
 * Which roles may open each area of the client. Route records take their `meta.roles` from here, and the
 * navigation shows an item only to roles its route allows. The server enforces its own checks; this only
 * decides what the client offers.
 */
export const AREA_ROLES = {
  overview: ROLES,
  /** Lab managers and staff see the floors they belong to (the server decides which). */
  floors: ROLES,
  scenarios: ['admin', 'ehs_officer'],
  /** Lab managers open plans to acknowledge them. */
  plans: ['admin', 'ehs_officer', 'lab_manager'],
  /** Staff see the drills they are invited to. */
  drills: ROLES,
  users: ['admin'],
  outbox: ['admin'],
} as const satisfies Record<string, readonly Role[]>

export type Area = keyof typeof AREA_ROLES

/** True when `role` may open something restricted to `allowed`; no restriction means everyone signed in. */
export function roleAllowed(allowed: readonly Role[] | undefined, role: Role): boolean {
  return allowed === undefined || allowed.includes(role)
}
