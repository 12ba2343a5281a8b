import { ADMINS, OFFICERS } from '../../shared/contract/route'
import type { Role } from '../../shared/schemas/common'
import type { Actor } from './actor'

// The one place services ask "may this role…"; the role lists themselves are the route contract's, so what a route
// admits and what a service allows cannot drift apart.
type WithRole = Pick<Actor, 'role'>
const within = (roles: readonly Role[], role: Role) => roles.includes(role)

/** Admins and EHS officers: they create and edit sites, floors, scenarios and plans, and manage drills. */
export const isOfficerRole = (role: Role) => within(OFFICERS, role)
export const isOfficer = (actor: WithRole) => isOfficerRole(actor.role)
export const isAdmin = (actor: WithRole) => within(ADMINS, actor.role)
/** Lab managers see the floors they belong to and acknowledge plans for them. */
export const isLabManager = (actor: WithRole) => actor.role === 'lab_manager'

/** Lab managers and staff only view the floors they belong to. */
export const canManageFloors = isOfficer
export const canEditPlans = isOfficer
export const canManageDrills = isOfficer
