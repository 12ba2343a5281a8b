import type { z } from 'zod'
import type { Role } from '../schemas/common'

/**
 * One API route as data: the server registers its handler from it, the OpenAPI document is generated from it and the
 * client builds its request from it, so a path, a schema or a role list is written once.
 */
export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete'

/** Who may call a route: 'public' (no sign-in), 'signed-in' (any role), or a list of roles. */
export type Access = 'public' | 'signed-in' | readonly Role[]

type Schema = z.ZodType | undefined

export interface Route<
  Path extends string = string,
  P extends Schema = Schema,
  Q extends Schema = Schema,
  B extends Schema = Schema,
  R extends Schema = Schema,
> {
  method: Method
  /** Express path, e.g. /api/users/:id */
  path: Path
  summary: string
  tag: string
  access: Access
  params?: P
  query?: Q
  body?: B
  /** Schema of a 2xx JSON response: documented, and checked by the client. */
  response?: R
  status?: number
  /** Non-JSON body (multipart upload, PDF or Float32 download), described for OpenAPI. */
  requestContentType?: string
  responseContentType?: string
}

/** Declares a route, keeping its literal path and schema types for the server handler and the client call. */
export function route<Path extends string, P extends Schema = undefined, Q extends Schema = undefined, B extends Schema = undefined, R extends Schema = undefined>(
  r: Route<Path, P, Q, B, R>,
): Route<Path, P, Q, B, R> {
  return r
}

/** `{ id: …, imageId: … }` for '/api/floors/:id/images/:imageId'. */
export type PathParams<Path extends string> = Path extends `${string}:${infer Name}/${infer Rest}`
  ? { [K in Name | keyof PathParams<`/${Rest}`>]: string | number }
  : Path extends `${string}:${infer Name}` ? { [K in Name]: string | number } : Record<never, never>

/** The concrete URL of a route: every `:name` filled (URL-encoded) from `params`. */
export function pathOf<Path extends string>(r: { path: Path }, params: PathParams<Path>): string {
  const values = params as Record<string, string | number>
  return r.path.replace(/:([A-Za-z_]+)/g, (_m, name: string) => {
    const v = values[name]
    if (v === undefined) throw new Error(`pathOf(${r.path}): missing ${name}`)
    return encodeURIComponent(String(v))
  })
}

/** Names of a path's parameters, in order. */
export const pathParamNames = (path: string): string[] => [...path.matchAll(/:([A-Za-z_]+)/g)].map((m) => m[1]!)

/** Role lists used by many routes (the six copies of `['admin', 'ehs_officer']` in the route files). */
export const OFFICERS = ['admin', 'ehs_officer'] as const
export const PLAN_READERS = ['admin', 'ehs_officer', 'lab_manager'] as const
export const ADMINS = ['admin'] as const
