import { z } from 'zod'

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

/** Positive integer id in a path parameter, e.g. /api/users/12. */
export const IdParam = z.object({ id: z.coerce.number().int().positive() })

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
