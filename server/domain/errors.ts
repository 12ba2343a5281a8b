import type { z } from 'zod'

/**
 * An expected failure, thrown by services: a status (HTTP's numbers, the one vocabulary both sides share), a
 * machine code, words for the person, and per-field messages. `server/http/errors.ts` turns it into the response.
 */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message)
  }
}

export const badRequest = (message: string, fields?: Record<string, string>) => new AppError(400, 'bad_request', message, fields)
export const unauthorized = (message = 'Sign in first') => new AppError(401, 'unauthorized', message)
export const forbidden = (message = 'Your role does not allow this') => new AppError(403, 'forbidden', message)
export const notFound = (what = 'Resource') => new AppError(404, 'not_found', `${what} not found`)
export const conflict = (message: string, code = 'conflict') => new AppError(409, code, message)
export const gone = (message: string) => new AppError(410, 'gone', message)

/** zod issues → { "a.b.0": "message" }, first message per field. */
export function fieldsFromZod(err: z.ZodError, prefix?: string): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of err.issues) {
    const key = [prefix, ...issue.path.map(String)].filter(Boolean).join('.') || (prefix ?? 'body')
    fields[key] ??= issue.message
  }
  return fields
}
