import { sql } from 'kysely'
import { z } from 'zod'
import { API } from '../../shared/api-paths'
import { CapturedMailList, OutgoingMailList } from '../../shared/schemas/mail'
import type { ApiRoutes } from '../http/define-route'
import { buildOpenApi } from '../http/openapi'
import type { ServiceContext } from '../services/context'

/**
 * Captured mail must not hand an admin a working password-reset link for someone else's account (issue 14: request
 * a reset for another user, read the link here, set the password). The viewer's own mail is shown whole.
 */
export function redactForViewer<M extends { to: string[]; text: string }>(m: M, viewerEmail: string): M {
  if (m.to.some((t) => t.toLowerCase() === viewerEmail.toLowerCase())) return m
  const text = m.text.replace(/(\/reset-password\?token=)[^\s)>\]"]+/g, '$1[hidden: only the recipient may use this link]')
  return text === m.text ? m : { ...m, text }
}

const Health = z.object({ status: z.enum(['ok', 'degraded']), database: z.enum(['up', 'down']) })

export function systemRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: API.health, summary: 'Liveness and database state', tag: 'system', access: 'public', response: Health },
    async ({ res }) => {
      const up = await Promise.race([
        sql`select 1`.execute(ctx.db).then(() => true, () => false),
        new Promise<boolean>((r) => setTimeout(() => r(false), 2000).unref()),
      ])
      if (!up) res.status(503)
      return { status: up ? 'ok' : 'degraded', database: up ? 'up' : 'down' }
    })

  api.add({ method: 'get', path: API.openapi, summary: 'This API as an OpenAPI 3.1 document', tag: 'system', access: 'public' },
    ({ res }) => { res.json(buildOpenApi(api.specs)) })

  api.add({ method: 'get', path: API.capturedMail, summary: 'Mail received by the local fake SMTP server (demo/dev only)', tag: 'admin', access: ['admin'], response: CapturedMailList },
    async ({ actor }) => ({
      enabled: ctx.mail.fakeSmtpEnabled,
      messages: ctx.mail.fakeSmtpEnabled ? (await ctx.mail.captured(actor.orgId)).map((m) => redactForViewer(m, actor.email)) : [],
    }))

  api.add({ method: 'get', path: API.outgoingMail, summary: 'Delivery state of outgoing mail', tag: 'admin', access: ['admin'], response: OutgoingMailList },
    async ({ actor }) => ({ messages: await ctx.mail.outgoing(actor.orgId) }))
}
