import { z } from 'zod'
import { Email, Name, NewPassword, Role } from './common'

export const UnitSystem = z.enum(['metric', 'imperial'])
export type UnitSystem = z.infer<typeof UnitSystem>

export const Credentials = z.object({ email: Email, password: z.string().min(1, 'Required').max(200) })
export type Credentials = z.infer<typeof Credentials>

/** The signed-in user as the client sees it. */
export const SessionUser = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: Role,
  orgId: z.number().int(),
  orgName: z.string(),
  unitSystem: UnitSystem,
})
export type SessionUser = z.infer<typeof SessionUser>

export const CsrfToken = z.object({ csrfToken: z.string() })

export const ForgotPassword = z.object({ email: Email })
export const ResetPassword = z.object({ token: z.string().min(10).max(1000), password: NewPassword })
export const AcceptInvitation = z.object({ token: z.string().min(10).max(1000), name: Name(), password: NewPassword })
export type AcceptInvitation = z.infer<typeof AcceptInvitation>

export const TokenQuery = z.object({ token: z.string().min(10).max(1000) })
/** What a still-valid invitation or reset link is for, shown before the user sets a password. */
export const TokenInfo = z.object({
  purpose: z.enum(['invite', 'reset']),
  email: z.string(),
  name: z.string(),
  orgName: z.string(),
})
export type TokenInfo = z.infer<typeof TokenInfo>

export const Preferences = z.object({ unitSystem: UnitSystem })
export type Preferences = z.infer<typeof Preferences>
