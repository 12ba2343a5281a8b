import { sql } from 'kysely'
import { z } from 'zod'
import { API } from '../../shared/api-paths'
import { CapturedMailList, OutgoingMailList } from '../../shared/schemas/mail'
import type { ApiRoutes } from '../http/define-route'
import { buildOpenApi } from '../http/openapi'
import type { ServiceContext } from '../services/context'

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
    async ({ actor }) => ({ enabled: ctx.mail.fakeSmtpEnabled, messages: ctx.mail.fakeSmtpEnabled ? await ctx.mail.captured(actor.orgId) : [] }))

  api.add({ method: 'get', path: API.outgoingMail, summary: 'Delivery state of outgoing mail', tag: 'admin', access: ['admin'], response: OutgoingMailList },
    async ({ actor }) => ({ messages: await ctx.mail.outgoing(actor.orgId) }))
}
