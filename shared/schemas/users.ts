import { z } from 'zod'
import { Email, Name, Role } from './common'

export const UserSummary = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: Role,
  status: z.enum(['invited', 'active', 'deactivated']),
  createdAt: z.string(),
})
export type UserSummary = z.infer<typeof UserSummary>
export const UserList = z.object({ users: z.array(UserSummary) })

export const Invitation = z.object({ email: Email, name: Name(), role: Role })
export type Invitation = z.infer<typeof Invitation>

/**
 * The answer to an invitation (202). The same for a new address and for one that already has an account with
 * another organization (whose owner is told instead), so inviting does not reveal who has an account elsewhere (issue 14).
 */
export const InvitationSent = z.object({ email: z.string(), message: z.string() })
export type InvitationSent = z.infer<typeof InvitationSent>

export const UserUpdate = z
  .object({ role: Role.optional(), active: z.boolean().optional(), name: Name().optional() })
  .refine((u) => u.role !== undefined || u.active !== undefined || u.name !== undefined, {
    message: 'Give at least one of role, active, name',
  })
export type UserUpdate = z.infer<typeof UserUpdate>
