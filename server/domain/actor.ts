import type { Role } from '../../shared/schemas/common'

/** The signed-in caller as services see it: every query is scoped by orgId. */
export interface Actor {
  id: number
  orgId: number
  role: Role
  email: string
  name: string
}
