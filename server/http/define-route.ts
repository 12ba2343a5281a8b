import type { Request, Response, Router } from 'express'
import type { z } from 'zod'
import { AppError, fieldsFromZod, forbidden, unauthorized } from './errors'
import type { Actor } from './session-user'
import type { Access, Route } from '../../shared/contract/route'

export type { Access }
/** A route of the contract (shared/contract), as registered and documented. */
export type RouteSpec = Route<string, any, any, any, any>

type Parsed<T> = T extends z.ZodType ? z.infer<T> : undefined

export interface RouteContext<B, Q, P> {
  req: Request
  res: Response
  body: B
  query: Q
  params: P
  /** The signed-in caller; present whenever access is not 'public'. */
  actor: Actor
}

type ContextOf<T> = T extends Route<string, infer P, infer Q, infer B, any> ? RouteContext<Parsed<B>, Parsed<Q>, Parsed<P>> : never

/** Registers handlers for contract routes on an Express router, and keeps the routes for the OpenAPI document. */
export class ApiRoutes {
  readonly specs: RouteSpec[] = []
  constructor(readonly router: Router) {}

  add<T extends RouteSpec>(spec: T, handler: (ctx: ContextOf<T>) => Promise<unknown> | unknown): void {
    this.specs.push(spec)
    this.router[spec.method](spec.path, async (req, res) => {
      const actor = req.actor
      if (spec.access !== 'public') {
        if (!actor) throw unauthorized()
        if (spec.access !== 'signed-in' && !spec.access.includes(actor.role)) throw forbidden()
      }
      // Parse params before the body so that a bad id answers 400 for the id, not for the body.
      const params = spec.params ? prefixed(spec.params, req.params, 'params') : undefined
      const query = spec.query ? prefixed(spec.query, req.query, 'query') : undefined
      const body = spec.body ? prefixed(spec.body, req.body ?? {}, 'body') : undefined
      const out = await handler({ req, res, body, query, params, actor: actor! } as ContextOf<T>)
      if (res.headersSent) return
      if (out === undefined) res.status(spec.status ?? 204).end()
      else res.status(spec.status ?? 200).json(out)
    })
  }
}

// A NUL (PostgreSQL text and jsonb refuse it) or half of a UTF-16 surrogate pair (not valid UTF-8): issue 14 found
// both reaching the database as a 500 from 26 text fields.
const UNSTORABLE = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/

/** The path of the first string (value or key) that cannot be stored, or null. Bounded walk: bodies are capped at 2 MB. */
export function unstorableText(value: unknown, path: (string | number)[] = [], depth = 0): (string | number)[] | null {
  if (typeof value === 'string') return UNSTORABLE.test(value) ? path : null
  if (depth > 64 || value === null || typeof value !== 'object') return null
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) { const hit = unstorableText(value[i], [...path, i], depth + 1); if (hit) return hit }
    return null
  }
  for (const [k, v] of Object.entries(value)) {
    if (UNSTORABLE.test(k)) return [...path, k]
    const hit = unstorableText(v, [...path, k], depth + 1)
    if (hit) return hit
  }
  return null
}

function prefixed<T extends z.ZodType>(schema: T, value: unknown, where: 'params' | 'query' | 'body'): z.infer<T> {
  const bad = unstorableText(value)
  if (bad) {
    const key = [where === 'body' ? undefined : where, ...bad.map(String)].filter(Boolean).join('.') || where
    throw new AppError(400, 'validation_failed', `Some ${where === 'body' ? 'fields' : where} are not valid: ${key}`,
      { [key]: 'Contains a character that cannot be stored (a NUL byte or a broken character); remove it' })
  }
  const r = schema.safeParse(value)
  if (r.success) return r.data
  const fields = fieldsFromZod(r.error, where === 'body' ? undefined : where)
  throw new AppError(400, 'validation_failed', `Some ${where === 'body' ? 'fields' : where} are not valid: ${Object.keys(fields).join(', ')}`, fields)
}
