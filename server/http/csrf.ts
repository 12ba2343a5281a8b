import { randomBytes, timingSafeEqual } from 'node:crypto'
import type { Request, RequestHandler } from 'express'
import { CSRF_COOKIE, CSRF_HEADER } from '../../shared/api-paths'
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

/**
 * Double-submit CSRF defence: a random token in a readable SameSite=Strict cookie must come back in a header.
 * Another site can make the browser send our cookies, but cannot read them to fill the header.
 */
export function csrfProtection(opts: { secureCookies: boolean }): RequestHandler {
  return (req, res, next) => {
    let token = readCookie(req, CSRF_COOKIE)
    if (!token || !/^[A-Za-z0-9_-]{20,100}$/.test(token)) {
      token = randomBytes(24).toString('base64url')
      res.cookie(CSRF_COOKIE, token, { httpOnly: false, sameSite: 'strict', secure: opts.secureCookies, path: '/' })
      if (!SAFE.has(req.method)) return next(new AppError(403, 'csrf_failed', 'Missing CSRF token; reload the page and try again'))
    }
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
