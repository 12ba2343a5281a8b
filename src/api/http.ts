import type { z, ZodType } from 'zod'
import { contract } from '../../shared/contract'
import { CSRF_COOKIE, CSRF_HEADER } from '../../shared/contract/csrf'
import { pathOf, type PathParams, type Route } from '../../shared/contract/route'
import { ErrorBody } from '../../shared/schemas/common'

/** Any failed API call: HTTP status (0 when the server could not be reached), error code, message, field messages. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    /** Dot-joined field path (e.g. "rooms.1.name") to a message for that field. */
    readonly fields: Record<string, string> = {},
    /** From a Retry-After header (429), when the server sent one. */
    readonly retryAfterSeconds?: number,
  ) {
    super(message)
    this.name = 'ApiError'
  }
}

/** Normalizes anything thrown into an ApiError, so stores keep one error type. */
export function toApiError(error: unknown): ApiError {
  if (error instanceof ApiError) return error
  return new ApiError(0, 'client-error', error instanceof Error ? error.message : 'Something went wrong.')
}

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE'

interface RequestOptions<T> {
  method?: Method
  body?: unknown
  /** A multipart body (file upload), sent as is. */
  form?: FormData
  query?: Record<string, string | number | boolean | undefined>
  /** When given, the response body is checked against it and the parsed value returned. */
  schema?: ZodType<T>
  /** A 401 is an expected answer here (me, login), so do not treat it as "session expired". */
  expectUnauthorized?: boolean
  signal?: AbortSignal
}

let unauthorizedHandler: (() => void) | undefined
/** Called when a request answers 401 unexpectedly, i.e. the session ended; the router boot sends people to sign in. */
export function onUnauthorized(handler: () => void): void {
  unauthorizedHandler = handler
}

let csrfTokenFromBody: string | undefined

function readCookie(name: string): string | undefined {
  const prefix = `${name}=`
  const entry = document.cookie.split('; ').find((part) => part.startsWith(prefix))
  return entry === undefined ? undefined : decodeURIComponent(entry.slice(prefix.length))
}

/** Makes sure the double-submit CSRF cookie exists; call once at start-up. */
export async function ensureCsrfCookie(force = false): Promise<string> {
  const existing = readCookie(CSRF_COOKIE)
  if (existing && !force) return existing
  const { csrfToken } = await call(contract.auth.csrf)
  csrfTokenFromBody = csrfToken
  return readCookie(CSRF_COOKIE) ?? csrfToken
}

function withQuery(path: string, query: RequestOptions<unknown>['query']): string {
  if (!query) return path
  const params = new URLSearchParams()
  for (const [key, value] of Object.entries(query)) if (value !== undefined) params.set(key, String(value))
  const text = params.toString()
  return text ? `${path}?${text}` : path
}

async function errorFrom(response: Response): Promise<ApiError> {
  const retryAfter = Number(response.headers.get('retry-after'))
  const retryAfterSeconds = Number.isFinite(retryAfter) && retryAfter > 0 ? retryAfter : undefined
  const parsed = ErrorBody.safeParse(await response.json().catch(() => null))
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error
    return new ApiError(response.status, code, message, fields ?? {}, retryAfterSeconds)
  }
  return new ApiError(response.status, `http-${response.status}`, `The server answered ${response.status} ${response.statusText}.`, {}, retryAfterSeconds)
}

async function send(path: string, options: RequestOptions<unknown>): Promise<Response> {
  const method = options.method ?? 'GET'
  const headers: Record<string, string> = { accept: 'application/json' }
  if (options.body !== undefined && !options.form) headers['content-type'] = 'application/json'
  if (method !== 'GET') headers[CSRF_HEADER] = readCookie(CSRF_COOKIE) ?? csrfTokenFromBody ?? (await ensureCsrfCookie())
  try {
    return await fetch(withQuery(path, options.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: options.form ?? (options.body === undefined ? undefined : JSON.stringify(options.body)),
      signal: options.signal,
    })
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error
    throw new ApiError(0, 'network', 'Cannot reach the Driftwarden server. Check your connection and try again.')
  }
}

/** Sends a request; answers the response when 2xx, throws ApiError otherwise (401 reported unless expected). */
async function respond(path: string, options: RequestOptions<unknown>): Promise<Response> {
  let response = await send(path, options)
  // A stale or missing CSRF cookie (e.g. after the server restarted) is fixed by fetching a new one, once.
  if (response.status === 403 && options.method && options.method !== 'GET') {
    const error = await errorFrom(response.clone())
    if (/csrf/i.test(error.code)) {
      await ensureCsrfCookie(true)
      response = await send(path, options)
    }
  }
  if (!response.ok) {
    const error = await errorFrom(response)
    if (error.status === 401 && !options.expectUnauthorized) unauthorizedHandler?.()
    throw error
  }
  return response
}

async function request<T = unknown>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  const response = await respond(path, options)
  const body: unknown = response.status === 204 ? undefined : await response.json().catch(() => undefined)
  if (!options.schema) return body as T
  const parsed = options.schema.safeParse(body)
  if (!parsed.success) throw new ApiError(response.status, 'invalid-response', 'The server sent an answer this page does not understand. Reload and try again.')
  return parsed.data
}

type AnyRoute = Route<string, any, any, any, any>
type HasKeys<T> = keyof T extends never ? false : true

/** What a call of route T needs: path parameters, query and body typed from the contract. */
export type CallInput<T> = T extends Route<infer Path, any, infer Q, infer B, any>
  ? (HasKeys<PathParams<Path>> extends true ? { params: PathParams<Path> } : { params?: undefined })
    & (Q extends ZodType ? { query?: Partial<z.input<Q>> } : { query?: undefined })
    & (B extends ZodType ? { body: z.input<B> } : { body?: undefined })
    & {
      /** A multipart body (uploads), instead of JSON. */
      form?: FormData
      signal?: AbortSignal
      /** A 401 is an expected answer here (me, login, public links), so do not treat it as "session expired". */
      expectUnauthorized?: boolean
    }
  : never
/** The parsed answer of route T: its response schema's output, or nothing. */
export type CallOutput<T> = T extends Route<string, any, any, any, infer R> ? (R extends ZodType ? z.output<R> : unknown) : never

type Args<T> = object extends CallInput<T> ? [input?: CallInput<T>] : [input: CallInput<T>]

function optionsOf(r: AnyRoute, input: CallInput<AnyRoute> | undefined): { url: string; options: RequestOptions<unknown> } {
  const url = pathOf(r, (input?.params ?? {}) as PathParams<string>)
  const options: RequestOptions<unknown> = {
    method: r.method.toUpperCase() as Method,
    body: input?.body,
    form: input?.form,
    query: input?.query as RequestOptions<unknown>['query'],
    // Public routes answer 401 only for what they were sent (a wrong password), never for an ended session.
    expectUnauthorized: input?.expectUnauthorized ?? r.access === 'public',
    signal: input?.signal,
  }
  return { url, options }
}

/**
 * The one way to call the API: `call(contract.floors.update, { params: { id }, body })`. Builds the URL from the
 * route's path, sends the CSRF header, parses errors into ApiError, reports an unexpected 401, and checks the answer
 * against the route's response schema.
 */
export async function call<T extends AnyRoute>(r: T, ...[input]: Args<T>): Promise<CallOutput<T>> {
  const { url, options } = optionsOf(r, input as CallInput<AnyRoute> | undefined)
  return request(url, { ...options, schema: r.response as ZodType | undefined }) as Promise<CallOutput<T>>
}

/** A binary answer (Float32 planes), with the same error handling as `call`. */
export async function callBytes<T extends AnyRoute>(r: T, ...[input]: Args<T>): Promise<ArrayBuffer> {
  const { url, options } = optionsOf(r, input as CallInput<AnyRoute> | undefined)
  return (await respond(url, { ...options, expectUnauthorized: input?.expectUnauthorized ?? false })).arrayBuffer()
}

/** The URL of a route for a link or an <img> (PDF downloads, floor images). */
export const urlOf = <T extends AnyRoute>(r: T, params: PathParams<T['path']>) => pathOf(r, params)
