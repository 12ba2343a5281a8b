import type { ErrorRequestHandler, RequestHandler } from 'express'
import multer from 'multer'
import { z } from 'zod'

/** An expected failure with an HTTP status; the error handler turns it into the one error shape. */
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

export const notFoundApi: RequestHandler = (req, _res, next) => next(new AppError(404, 'not_found', `No API route ${req.method} ${req.path}`))

// Must be registered after every route, or it never sees their errors.
export const errorHandler: ErrorRequestHandler = (err, _req, res, _next) => {
  if (res.headersSent) return
  const send = (status: number, code: string, message: string, fields?: Record<string, string>) =>
    res.status(status).json({ error: fields ? { code, message, fields } : { code, message } })

  if (err instanceof AppError) return send(err.status, err.code, err.message, err.fields)
  if (err instanceof z.ZodError) return send(400, 'validation_failed', 'Some fields are not valid', fieldsFromZod(err))
  if (err instanceof multer.MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE') return send(413, 'too_large', 'The file is larger than allowed', { [err.field ?? 'file']: 'Too large' })
    return send(400, 'bad_upload', err.message, { [err.field ?? 'file']: err.message })
  }
  // body-parser errors carry a status and a type
  if (err?.type === 'entity.too.large') return send(413, 'too_large', 'The request body is too large')
  if (err?.type === 'entity.parse.failed') return send(400, 'malformed_json', 'The request body is not valid JSON', { body: 'Not valid JSON' })
  if (typeof err?.status === 'number' && err.status >= 400 && err.status < 500) return send(err.status, 'bad_request', String(err.message ?? 'Bad request'))
  // Two writes racing for the same unique key (e.g. parallel draft saves right after a publish), or a serialization
  // failure: the loser is told to reload, not handed a 500 (issue 14).
  if (err?.code === '23505' || err?.code === '40001' || err?.code === '40P01') {
    return send(409, 'conflict', 'Someone saved this at the same moment: reload to see their change, then try again')
  }
  if (err?.code === 'ECONNREFUSED' || err?.code === '57P01' || /terminating connection|Connection terminated/i.test(String(err?.message))) {
    return send(503, 'database_unavailable', 'The database is briefly unavailable; try again in a moment')
  }
  console.error('[http] unexpected error:', err)
  return send(500, 'internal_error', 'Something went wrong on our side')
}
