import type { PlanRole } from '../../../shared/schemas/plans'

// One "@" with something on both sides and a dot in the domain: what a mail server could deliver to (the server
// checks again); "not-an-email" is refused before it is printed in a plan.
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/

/** Why a duty's e-mail cannot be used, or null (empty is allowed: not everyone has one). */
export function emailProblem(email: string): string | null {
  const e = email.trim()
  return e === '' || EMAIL.test(e) ? null : `“${e}” is not an e-mail address (like name@example.org)`
}

/** Every bad e-mail of the plan's duties, named as the table labels them. */
export function roleEmailProblems(roles: readonly PlanRole[]): string[] {
  return roles.flatMap((r) => { const p = emailProblem(r.email); return p ? [`E-mail for ${r.duty}: ${p}`] : [] })
}
