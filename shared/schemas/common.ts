import { z } from 'zod'
import { passwordWeakness } from './password-strength'

/** Roles within one organization, from most to least privileged. */
export const ROLES = ['admin', 'ehs_officer', 'lab_manager', 'staff'] as const
export const Role = z.enum(ROLES)
export type Role = z.infer<typeof Role>

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  ehs_officer: 'EHS officer',
  lab_manager: 'Lab manager',
  staff: 'Staff',
}

/** Largest id (and version) PostgreSQL's integer columns hold: 2³¹ − 1. Larger ones answered 500 (issue 14). */
export const MAX_DB_ID = 2_147_483_647

/** A positive integer id in a JSON body. */
export const DbId = z.number().int('A whole number').positive('Must be 1 or more').max(MAX_DB_ID, `At most ${MAX_DB_ID}`)

/**
 * A positive integer id in a path: digits only, so "%201", "0x10" or "1e3" are refused rather than read as 1, 16
 * or 1000 (issue 14), and within PostgreSQL's integer range.
 */
export const PathId = z.string().regex(/^[1-9][0-9]{0,9}$/, 'A whole number id (digits only)').transform(Number)
  .pipe(z.number().max(MAX_DB_ID, `At most ${MAX_DB_ID}`))

/** Positive integer id in a path parameter, e.g. /api/users/12. */
export const IdParam = z.object({ id: PathId })

/** The one error shape every API failure answers with. */
export const ErrorBody = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    /** Field path (dot-joined, e.g. "rooms.1.name") to a human message. */
    fields: z.record(z.string(), z.string()).optional(),
  }),
})
export type ErrorBody = z.infer<typeof ErrorBody>

export const Ok = z.object({ ok: z.literal(true) })

/** Trimmed, non-empty display text with a length cap; markup is kept as text and escaped where shown. */
export const Name = (max = 120) => z.string().trim().min(1, 'Required').max(max, `At most ${max} characters`)

export const Email = z.string().trim().toLowerCase().pipe(z.email('Not a valid e-mail address').max(254))

/** Passwords: long enough to resist guessing; argon2id takes care of storage. */
export const NewPassword = z.string().min(10, 'At least 10 characters').max(200, 'At most 200 characters')
  .superRefine((pw, ctx) => { const why = passwordWeakness(pw); if (why) ctx.addIssue({ code: 'custom', message: why }) })
