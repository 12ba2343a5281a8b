import type { ZodType } from 'zod'
import { API, CSRF_COOKIE, CSRF_HEADER } from '../../shared/api-paths'
import { CsrfToken } from '../../shared/schemas/auth'
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

export interface RequestOptions<T> {
  method?: Method
  body?: unknown
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
  const { csrfToken } = await request(API.csrf, { schema: CsrfToken })
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
  if (options.body !== undefined) headers['content-type'] = 'application/json'
  if (method !== 'GET') headers[CSRF_HEADER] = readCookie(CSRF_COOKIE) ?? csrfTokenFromBody ?? (await ensureCsrfCookie())
  try {
    return await fetch(withQuery(path, options.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    })
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error
    throw new ApiError(0, 'network', 'Cannot reach the Driftwarden server. Check your connection and try again.')
  }
}

/** One JSON request; throws ApiError on any failure. */
export async function request<T = unknown>(path: string, options: RequestOptions<T> = {}): Promise<T> {
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
  const body: unknown = response.status === 204 ? undefined : await response.json().catch(() => undefined)
  if (!options.schema) return body as T
  const parsed = options.schema.safeParse(body)
  if (!parsed.success) throw new ApiError(response.status, 'invalid-response', 'The server sent an answer this page does not understand. Reload and try again.')
  return parsed.data
}

type Options<T> = Omit<RequestOptions<T>, 'method' | 'body'>

export const http = {
  get: <T = unknown>(path: string, options?: Options<T>) => request<T>(path, { ...options, method: 'GET' }),
  post: <T = unknown>(path: string, body?: unknown, options?: Options<T>) => request<T>(path, { ...options, method: 'POST', body }),
  patch: <T = unknown>(path: string, body?: unknown, options?: Options<T>) => request<T>(path, { ...options, method: 'PATCH', body }),
  put: <T = unknown>(path: string, body?: unknown, options?: Options<T>) => request<T>(path, { ...options, method: 'PUT', body }),
  delete: <T = unknown>(path: string, options?: Options<T>) => request<T>(path, { ...options, method: 'DELETE' }),
}
