import { ipKeyGenerator, rateLimit } from 'express-rate-limit'
import type { Request, RequestHandler } from 'express'
import { API } from '../../shared/api-paths'
import {
  AcceptInvitation, Credentials, CsrfToken, ForgotPassword, Preferences, ResetPassword, SessionUser, TokenInfo, TokenQuery,
} from '../../shared/schemas/auth'
import { Ok } from '../../shared/schemas/common'
import type { ApiRoutes } from '../http/define-route'
import { AppError } from '../http/errors'
import * as auth from '../services/auth.service'
import type { ServiceContext } from '../services/context'

const regenerate = (req: Request) => new Promise<void>((ok, ko) => req.session.regenerate((e) => (e ? ko(e) : ok())))
const destroy = (req: Request) => new Promise<void>((ok, ko) => req.session.destroy((e) => (e ? ko(e) : ok())))

/** Per address and e-mail, counting only failures, so a typo does not lock anyone out for long. */
function limiter(limit: number, what: string): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').toLowerCase()}`,
    handler: (_req, _res, next) => next(new AppError(429, 'rate_limited', `Too many ${what} attempts. Wait 15 minutes and try again.`)),
  })
}

export function authRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.router.post(API.login, limiter(ctx.config.loginRateLimit, 'sign-in'))
  api.router.post(API.forgot, limiter(5, 'password-reset'))

  api.add({ method: 'get', path: API.csrf, summary: 'Get the CSRF token (also set as the dw_csrf cookie)', tag: 'auth', access: 'public', response: CsrfToken },
    ({ res }) => ({ csrfToken: res.locals.csrfToken as string }))

  api.add({ method: 'post', path: API.login, summary: 'Sign in', tag: 'auth', access: 'public', body: Credentials, response: SessionUser },
    async ({ req, body }) => {
      const userId = await auth.checkCredentials(ctx, body.email, body.password)
      await regenerate(req) // a fresh session id at sign-in defeats session fixation
      req.session.userId = userId
      return auth.sessionUser(ctx, userId)
    })

  api.add({ method: 'post', path: API.logout, summary: 'Sign out', tag: 'auth', access: 'public', response: Ok }, async ({ req, res }) => {
    if (req.session) await destroy(req)
    res.clearCookie('dw_sid', { path: '/' })
    return { ok: true as const }
  })

  api.add({ method: 'get', path: API.me, summary: 'The signed-in user', tag: 'auth', access: 'signed-in', response: SessionUser },
    ({ actor }) => auth.sessionUser(ctx, actor.id))

  api.add({ method: 'patch', path: API.preferences, summary: 'Change display preferences', tag: 'auth', access: 'signed-in', body: Preferences, response: SessionUser },
    ({ actor, body }) => auth.setUnitSystem(ctx, actor, body.unitSystem))

  api.add({ method: 'post', path: API.forgot, summary: 'E-mail a password-reset link', tag: 'auth', access: 'public', body: ForgotPassword, response: Ok },
    async ({ body }) => {
      await auth.requestPasswordReset(ctx, body.email)
      return { ok: true as const }
    })

  api.add({ method: 'get', path: API.tokenInfo, summary: 'What an invitation or reset link is for', tag: 'auth', access: 'public', query: TokenQuery, response: TokenInfo },
    ({ query }) => auth.describeLink(ctx, query.token))

  api.add({ method: 'post', path: API.reset, summary: 'Set a new password from a reset link', tag: 'auth', access: 'public', body: ResetPassword, response: Ok },
    async ({ body }) => {
      await auth.resetPassword(ctx, body.token, body.password)
      return { ok: true as const }
    })

  api.add({ method: 'post', path: API.acceptInvitation, summary: 'Accept an invitation and sign in', tag: 'auth', access: 'public', body: AcceptInvitation, response: SessionUser },
    async ({ req, body }) => {
      const userId = await auth.acceptInvitation(ctx, body)
      await regenerate(req)
      req.session.userId = userId
      return auth.sessionUser(ctx, userId)
    })
}
