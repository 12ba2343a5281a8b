import { sql } from 'kysely'
import { contract } from '../../shared/contract'
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

export function systemRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.system.health,
    async ({ res }) => {
      const up = await Promise.race([
        sql`select 1`.execute(ctx.db).then(() => true, () => false),
        new Promise<boolean>((r) => setTimeout(() => r(false), 2000).unref()),
      ])
      if (!up) res.status(503)
      return { status: up ? 'ok' : 'degraded', database: up ? 'up' : 'down' }
    })

  api.add(contract.system.openapi,
    ({ res }) => { res.json(buildOpenApi(api.specs)) })

  api.add(contract.system.capturedMail,
    async ({ actor }) => ({
      enabled: ctx.mail.fakeSmtpEnabled,
      messages: ctx.mail.fakeSmtpEnabled ? (await ctx.mail.captured(actor.orgId)).map((m) => redactForViewer(m, actor.email)) : [],
    }))

  api.add(contract.system.outgoingMail,
    async ({ actor }) => ({ messages: await ctx.mail.outgoing(actor.orgId) }))
}
