import { z } from 'zod'
import { CapturedMailList, OutgoingMailList } from '../schemas/mail'
import { ADMINS, route } from './route'

export const Health = z.object({ status: z.enum(['ok', 'degraded']), database: z.enum(['up', 'down']) })

export const system = {
  health: route({ method: 'get', path: '/api/health', summary: 'Liveness and database state', tag: 'system', access: 'public', response: Health }),
  openapi: route({ method: 'get', path: '/api/openapi.json', summary: 'This API as an OpenAPI 3.1 document', tag: 'system', access: 'public' }),
  capturedMail: route({ method: 'get', path: '/api/admin/captured-mail', summary: 'Mail received by the local fake SMTP server (demo/dev only)', tag: 'admin', access: ADMINS, response: CapturedMailList }),
  outgoingMail: route({ method: 'get', path: '/api/admin/outgoing-mail', summary: 'Delivery state of outgoing mail', tag: 'admin', access: ADMINS, response: OutgoingMailList }),
}
