import { ROLE_LABELS, ROLES, type Role } from '../schemas/common'
import type { UserSummary } from '../schemas/users'

export const USER_STATUS_LABELS: Record<UserSummary['status'], string> = {
  invited: 'Invited',
  active: 'Active',
  deactivated: 'Deactivated',
}

/** What each role does, shown where an administrator picks one. */
export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  admin: 'Manages users and settings, and can do everything an EHS officer can.',
  ehs_officer: 'Draws floors, runs screening simulations, writes response plans and schedules drills.',
  lab_manager: 'Reviews floors, acknowledges response plans for their labs, sees drills.',
  staff: 'Sees the drills they are asked to take part in.',
}

export const ROLE_OPTIONS = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role], description: ROLE_DESCRIPTIONS[role] }))

export interface UserActions {
  changeRole: boolean
  deactivate: boolean
  reactivate: boolean
}

/**
 * Which account changes the users page offers. Administrators cannot change or deactivate their own account
 * here, so nobody locks themselves out by accident; the server has the final say.
 */
export function userActionsFor(target: UserSummary, currentUserId: number | undefined): UserActions {
  const self = target.id === currentUserId
  return {
    changeRole: !self && target.status !== 'deactivated',
    deactivate: !self && target.status !== 'deactivated',
    reactivate: !self && target.status === 'deactivated',
  }
}
