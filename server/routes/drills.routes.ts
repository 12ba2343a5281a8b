import { z } from 'zod'
import { IdParam, PathId } from '../../shared/schemas/common'
import {
  CancelDrill, ConfirmInfo, ConfirmToken, DRILL_API, DrillChange, DrillDetail, DrillList, DrillOverview, DrillRecordInput, FindingUpdate,
  NewDrill, NewFinding, SiteFrequency,
} from '../../shared/schemas/drills'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as drills from '../services/drills.service'

const OFFICERS = ['admin', 'ehs_officer'] as const
const SiteIdParam = z.object({ siteId: PathId })
const People = z.object({ people: z.array(z.object({ id: z.number(), name: z.string(), email: z.string(), role: z.string() })) })

/** Drills. Fixed paths come before /api/drills/:id so that "confirm" or "overview" is never read as an id. */
export function drillsRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: DRILL_API.confirm, summary: 'What a receipt link confirms (does not use it up)', tag: 'drills', access: 'public', query: ConfirmToken, response: ConfirmInfo },
    ({ query }) => drills.receiptInfo(ctx, query.token))
  api.add({ method: 'post', path: DRILL_API.confirm, summary: 'Confirm receipt of a drill notice with the signed, single-use link (410 when used, replaced, tampered with or expired)', tag: 'drills', access: 'public', body: ConfirmToken, response: ConfirmInfo },
    ({ body }) => drills.confirmReceipt(ctx, body.token))

  api.add({ method: 'get', path: DRILL_API.overview, summary: 'Drill history per site and floor, overdue sites, open corrective actions', tag: 'drills', access: 'signed-in', response: DrillOverview },
    ({ actor }) => drills.drillOverview(ctx, actor))
  api.add({ method: 'put', path: '/api/drills/site-frequency/:siteId', summary: "Set a site's drill frequency (days)", tag: 'drills', access: OFFICERS, params: SiteIdParam, body: SiteFrequency, response: DrillOverview },
    ({ actor, params, body }) => drills.setFrequency(ctx, actor, params.siteId, body.drillFrequencyDays))
  api.add({ method: 'get', path: DRILL_API.people, summary: 'People who can be invited or put in charge', tag: 'drills', access: OFFICERS, response: People },
    ({ actor }) => drills.invitable(ctx, actor))

  api.add({ method: 'get', path: DRILL_API.drills, summary: 'Drills the caller can see (staff: their own; lab managers: their floors)', tag: 'drills', access: 'signed-in', response: DrillList },
    ({ actor }) => drills.listDrills(ctx, actor))
  api.add({ method: 'post', path: DRILL_API.drills, summary: 'Schedule a drill for a published plan version and e-mail the invitations with a calendar file', tag: 'drills', access: OFFICERS, body: NewDrill, response: DrillDetail, status: 201 },
    ({ actor, body }) => drills.scheduleDrill(ctx, actor, body))
  api.add({ method: 'get', path: '/api/drills/:id', summary: 'A drill with its roster, record, comparison and findings', tag: 'drills', access: 'signed-in', params: IdParam, response: DrillDetail },
    ({ actor, params }) => drills.getDrill(ctx, actor, params.id))
  api.add({ method: 'patch', path: '/api/drills/:id', summary: 'Move or rename a scheduled drill (notice with the next SEQUENCE)', tag: 'drills', access: OFFICERS, params: IdParam, body: DrillChange, response: DrillDetail },
    ({ actor, params, body }) => drills.changeDrill(ctx, actor, params.id, body))
  api.add({ method: 'post', path: '/api/drills/:id/cancel', summary: 'Cancel a drill (METHOD:CANCEL notice)', tag: 'drills', access: OFFICERS, params: IdParam, body: CancelDrill, response: DrillDetail },
    ({ actor, params, body }) => drills.cancelDrill(ctx, actor, params.id, body.reason))
  api.add({ method: 'put', path: '/api/drills/:id/record', summary: 'Record the drill: steps, measured times, observations', tag: 'drills', access: OFFICERS, params: IdParam, body: DrillRecordInput, response: DrillDetail },
    ({ actor, params, body }) => drills.recordDrill(ctx, actor, params.id, body))
  api.add({ method: 'post', path: '/api/drills/:id/findings', summary: 'Add a finding with its corrective action, owner and due date', tag: 'drills', access: OFFICERS, params: IdParam, body: NewFinding, response: DrillDetail, status: 201 },
    ({ actor, params, body }) => drills.addFinding(ctx, actor, params.id, body))
  api.add({ method: 'patch', path: '/api/drill-findings/:id', summary: 'Close (or reopen) a corrective action', tag: 'drills', access: OFFICERS, params: IdParam, body: FindingUpdate, response: DrillDetail },
    ({ actor, params, body }) => drills.changeFinding(ctx, actor, params.id, body))
  api.add({ method: 'get', path: '/api/drills/:id/pdf', summary: 'The drill report as a PDF', tag: 'drills', access: 'signed-in', params: IdParam, responseContentType: 'application/pdf' },
    async ({ actor, params, res }) => {
      const pdf = await drills.drillPdf(ctx, actor, params.id)
      res.setHeader('Content-Type', 'application/pdf')
      res.setHeader('Content-Disposition', `attachment; filename="${pdf.fileName}"`)
      res.end(pdf.bytes)
    })
}
