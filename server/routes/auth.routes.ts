import { ipKeyGenerator, rateLimit } from 'express-rate-limit'
import type { Request, RequestHandler } from 'express'
import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import { HTTPS_REQUIRED, rotateCsrf } from '../http/csrf'
import { AppError } from '../http/errors'
import * as auth from '../services/auth.service'
import type { ServiceContext } from '../services/context'

const regenerate = (req: Request) => new Promise<void>((ok, ko) => req.session.regenerate((e) => (e ? ko(e) : ok())))
const destroy = (req: Request) => new Promise<void>((ok, ko) => req.session.destroy((e) => (e ? ko(e) : ok())))

/**
 * The e-mail as the account lookup sees it (the Email schema trims and lower-cases), so " Admin@X " and "admin@x"
 * share one counter (issue 14: leading spaces walked around the lock-out).
 */
export const limiterEmail = (v: unknown) => (typeof v === 'string' ? v.trim().toLowerCase() : JSON.stringify(v ?? null))

type LimitOpts = { limit: number; windowMs: number; what: string; key: (req: Request) => string; onlyFailures: boolean }
function limiter(o: LimitOpts): RequestHandler {
  return rateLimit({
    windowMs: o.windowMs,
    limit: o.limit,
    skipSuccessfulRequests: o.onlyFailures,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: o.key,
    handler: (_req, _res, next) => next(new AppError(429, 'rate_limited', `Too many ${o.what}. Wait ${Math.round(o.windowMs / 60_000)} minutes and try again.`)),
  })
}
// req.ip honours X-Forwarded-For only from the loopback proxy (app 'trust proxy'), so a client cannot pick its own.
const client = (req: Request) => ipKeyGenerator(req.ip ?? '')
const MIN15 = 15 * 60_000

export function authRoutes(api: ApiRoutes, ctx: ServiceContext) {
  /**
   * COOKIE_SECURE=1 makes the session cookie HTTPS-only; a request that reached us over plain HTTP (a proxy that does
   * not send X-Forwarded-Proto: https) would get 200 and no cookie, and the sign-in would silently not stick (issue 14).
   */
  const refuseInsecureCookie = (req: Request) => {
    if (ctx.config.secureCookies && !req.secure) {
      throw new AppError(400, 'https_required', HTTPS_REQUIRED)
    }
  }
  // Sign-in counts failures three ways: per account and client, per account from anywhere (a botnet spreading one
  // account's guesses), and per client over all accounts (one client trying many addresses).
  const n = ctx.config.loginRateLimit
  api.router.post(contract.auth.login.path,
    limiter({ limit: n, windowMs: MIN15, what: 'sign-in attempts', onlyFailures: true, key: (req) => `ac|${client(req)}|${limiterEmail(req.body?.email)}` }),
    limiter({ limit: 3 * n, windowMs: MIN15, what: 'sign-in attempts for this account', onlyFailures: true, key: (req) => `a|${limiterEmail(req.body?.email)}` }),
    limiter({ limit: 2 * n, windowMs: MIN15, what: 'failed sign-ins from this connection', onlyFailures: true, key: (req) => `c|${client(req)}` }))
  // Reset mail always answers 200, so every request counts: at most 3 mails an hour to one address, 10 requests per client.
  api.router.post(contract.auth.forgot.path,
    limiter({ limit: 3, windowMs: 60 * 60_000, what: 'password-reset requests for this address', onlyFailures: false, key: (req) => `fa|${limiterEmail(req.body?.email)}` }),
    limiter({ limit: 10, windowMs: MIN15, what: 'password-reset requests', onlyFailures: false, key: (req) => `fc|${client(req)}` }))

  api.add(contract.auth.csrf,
    ({ res }) => ({ csrfToken: res.locals.csrfToken as string }))

  api.add(contract.auth.login,
    async ({ req, res, body }) => {
      refuseInsecureCookie(req)
      const userId = await auth.checkCredentials(ctx, body.email, body.password)
      await regenerate(req) // a fresh session id at sign-in defeats session fixation
      req.session.userId = userId
      rotateCsrf(req, res, ctx.config.secureCookies) // and a fresh CSRF token, bound to that session
      return auth.sessionUser(ctx, userId)
    })

  api.add(contract.auth.logout, async ({ req, res }) => {
    if (req.session) await destroy(req)
    res.clearCookie('dw_sid', { path: '/' })
    return { ok: true as const }
  })

  api.add(contract.auth.me,
    ({ actor }) => auth.sessionUser(ctx, actor.id))

  api.add(contract.auth.preferences,
    ({ actor, body }) => auth.setUnitSystem(ctx, actor, body.unitSystem))

  api.add(contract.auth.forgot,
    async ({ body }) => {
      await auth.requestPasswordReset(ctx, body.email)
      return { ok: true as const }
    })

  api.add(contract.auth.tokenInfo,
    ({ query }) => auth.describeLink(ctx, query.token))

  api.add(contract.auth.reset,
    async ({ body }) => {
      await auth.resetPassword(ctx, body.token, body.password)
      return { ok: true as const }
    })

  api.add(contract.auth.acceptInvitation,
    async ({ req, res, body }) => {
      refuseInsecureCookie(req)
      const userId = await auth.acceptInvitation(ctx, body)
      await regenerate(req)
      req.session.userId = userId
      rotateCsrf(req, res, ctx.config.secureCookies)
      return auth.sessionUser(ctx, userId)
    })
}
