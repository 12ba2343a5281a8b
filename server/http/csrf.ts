import { randomBytes, timingSafeEqual } from 'node:crypto'
import type { Request, RequestHandler, Response } from 'express'
import { CSRF_COOKIE, CSRF_HEADER } from '../../shared/contract/csrf'
import { AppError } from './errors'

export function readCookie(req: Request, name: string): string | undefined {
  const header = req.headers.cookie
  if (!header) return undefined
  for (const part of header.split(';')) {
    const i = part.indexOf('=')
    if (i > 0 && part.slice(0, i).trim() === name) return decodeURIComponent(part.slice(i + 1).trim())
  }
  return undefined
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])

declare module 'express-session' {
  interface SessionData {
    /** The CSRF token of a signed-in session: set at sign-in, so a token planted before sign-in is worthless. */
    csrf?: string
  }
}

export const HTTPS_REQUIRED = 'This server signs in over HTTPS only (COOKIE_SECURE=1), but this request arrived over plain HTTP. Open the site with https://; if it already is, the proxy in front must send "X-Forwarded-Proto: https" (it is trusted from 127.0.0.1).'

const newToken = () => randomBytes(24).toString('base64url')
const setCookie = (res: Response, token: string, secure: boolean) =>
  res.cookie(CSRF_COOKIE, token, { httpOnly: false, sameSite: 'strict', secure, path: '/' })

/**
 * At sign-in (after the session id is regenerated): a fresh token, bound to the new session (issue 14: the token was
 * neither bound to the session nor rotated, so one planted or read before sign-in stayed good after it).
 */
export function rotateCsrf(req: Request, res: Response, secure: boolean): string {
  const token = newToken()
  req.session.csrf = token
  setCookie(res, token, secure)
  res.locals.csrfToken = token
  return token
}

/**
 * Double-submit CSRF defence: a random token in a readable SameSite=Strict cookie must come back in a header.
 * Another site can make the browser send our cookies, but cannot read them to fill the header. A signed-in session
 * holds its own token: the header must match that one, and the cookie is put back to it when it differs.
 */
export function csrfProtection(opts: { secureCookies: boolean }): RequestHandler {
  return (req, res, next) => {
    // With COOKIE_SECURE=1 a plain-HTTP request cannot carry our (Secure) cookies: say why, rather than a bare 403 or a
    // sign-in that answers 200 and sets nothing (issue 14).
    if (opts.secureCookies && !req.secure && !SAFE.has(req.method)) {
      return next(new AppError(400, 'https_required', HTTPS_REQUIRED))
    }
    const bound = req.session?.userId !== undefined ? req.session.csrf : undefined
    let token = readCookie(req, CSRF_COOKIE)
    if (bound) {
      if (token !== bound) { setCookie(res, bound, opts.secureCookies); if (!SAFE.has(req.method)) return next(new AppError(403, 'csrf_failed', 'Missing or wrong CSRF token; reload the page and try again')) }
      token = bound
    } else if (!token || !/^[A-Za-z0-9_-]{20,100}$/.test(token)) {
      token = newToken()
      setCookie(res, token, opts.secureCookies)
      if (!SAFE.has(req.method)) return next(new AppError(403, 'csrf_failed', 'Missing CSRF token; reload the page and try again'))
    }
    // Sessions signed in before tokens were bound take the one they use now.
    if (req.session?.userId !== undefined && !bound) req.session.csrf = token
    res.locals.csrfToken = token
    if (SAFE.has(req.method)) return next()
    const sent = req.get(CSRF_HEADER) ?? ''
    const a = Buffer.from(sent)
    const b = Buffer.from(token)
    if (a.length !== b.length || !timingSafeEqual(a, b)) {
      return next(new AppError(403, 'csrf_failed', 'Missing or wrong CSRF token; reload the page and try again'))
    }
    next()
  }
}
