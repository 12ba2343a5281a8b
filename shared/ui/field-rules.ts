import type { ZodType } from 'zod'

/** A form-field rule in the shape Quasar (and most form libraries) expect: true, or a message. */
export type FieldRule = (value: unknown) => true | string

/**
 * Turns a shared zod schema for one field into a field rule, so forms check exactly what the server checks.
 * @example `<q-input :rules="[ruleFrom(Email)]" />`
 */
export function ruleFrom(schema: ZodType): FieldRule {
  return (value) => {
    const result = schema.safeParse(value)
    return result.success ? true : (result.error.issues[0]?.message ?? 'Not valid')
  }
}

/** Rule for a "repeat password" field. */
export function sameAs(getOther: () => unknown, message = 'The two passwords differ'): FieldRule {
  return (value) => (value === getOther() ? true : message)
}
