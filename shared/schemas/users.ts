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

export const UserUpdate = z
  .object({ role: Role.optional(), active: z.boolean().optional(), name: Name().optional() })
  .refine((u) => u.role !== undefined || u.active !== undefined || u.name !== undefined, {
    message: 'Give at least one of role, active, name',
  })
export type UserUpdate = z.infer<typeof UserUpdate>
