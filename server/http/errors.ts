import type { ErrorRequestHandler, RequestHandler } from 'express'
import multer from 'multer'
import { z } from 'zod'
import { AppError, fieldsFromZod } from '../domain/errors'

// The errors themselves live in the domain (services throw them without knowing HTTP); this module maps them,
// and every other failure, to the one response shape.
export { AppError, badRequest, conflict, fieldsFromZod, forbidden, gone, notFound, unauthorized } from '../domain/errors'

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
