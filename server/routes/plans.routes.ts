import { z } from 'zod'
import { IdParam, PathId } from '../../shared/schemas/common'
import {
  AckInput, AckRecord, AuditList, NewPlan, PLAN_API, PlanContent, PlanDetail, PlanList, PlanStatus, PlanVersionParams, PublishInput,
  RefreshPlan, RunChoiceList, SaveDraft,
} from '../../shared/schemas/plans'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as plans from '../services/plans.service'

const OFFICERS = ['admin', 'ehs_officer'] as const
const READERS = ['admin', 'ehs_officer', 'lab_manager'] as const
const FloorIdParam = z.object({ floorId: PathId })
const VersionBody = z.object({ version: z.number().int(), status: PlanStatus, contentHash: z.string().nullable(), content: PlanContent })

/** Response plans. Acknowledgments have no update or delete route: they are append-only (also in the database). */
export function plansRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: PLAN_API.plans, summary: 'Plans the caller can see, with acknowledgment counts (pending, overdue, done)', tag: 'plans', access: READERS, response: PlanList },
    ({ actor }) => plans.listPlans(ctx, actor))

  api.add({ method: 'get', path: '/api/plans/runs-of-floor/:floorId', summary: 'Finished results of a floor to generate a plan from', tag: 'plans', access: OFFICERS, params: FloorIdParam, response: RunChoiceList },
    ({ actor, params }) => plans.runsOfFloor(ctx, actor, params.floorId))

  api.add({ method: 'post', path: PLAN_API.plans, summary: 'Generate a plan draft from results of a floor by the documented rules', tag: 'plans', access: OFFICERS, body: NewPlan, response: PlanDetail, status: 201 },
    ({ actor, body }) => plans.createPlan(ctx, actor, body))

  api.add({ method: 'get', path: '/api/plans/:id', summary: 'A plan: current version, versions, lab managers and acknowledgments', tag: 'plans', access: READERS, params: IdParam, response: PlanDetail },
    ({ actor, params }) => plans.getPlan(ctx, actor, params.id))

  api.add({ method: 'put', path: '/api/plans/:id/draft', summary: 'Save the draft (after a publish, this starts the draft of the next version; with updatedAt, 409 stale_version when changed since)', tag: 'plans', access: OFFICERS, params: IdParam, body: SaveDraft, response: PlanDetail },
    ({ actor, params, body }) => plans.saveDraft(ctx, actor, params.id, body.content, body.updatedAt))

  api.add({ method: 'post', path: '/api/plans/:id/refresh', summary: "Rebuild the rule-derived content from newer results of the floor into the draft, keeping officers' own text", tag: 'plans', access: OFFICERS, params: IdParam, body: RefreshPlan, response: PlanDetail },
    ({ actor, params, body }) => plans.refreshPlan(ctx, actor, params.id, body.runIds))

  api.add({ method: 'post', path: '/api/plans/:id/publish', summary: 'Freeze the draft as a version with its sha256 and ask the lab managers to acknowledge', tag: 'plans', access: OFFICERS, params: IdParam, body: PublishInput, response: PlanDetail },
    ({ actor, params, body }) => plans.publishPlan(ctx, actor, params.id, body.ackDueDays))

  api.add({ method: 'get', path: '/api/plans/:id/versions/:version', summary: 'One version of a plan', tag: 'plans', access: READERS, params: PlanVersionParams, response: VersionBody },
    ({ actor, params }) => plans.getVersion(ctx, actor, params.id, params.version))

  api.add({ method: 'post', path: '/api/plans/:id/versions/:version/acknowledgments', summary: 'A lab manager of the floor acknowledges the current published version (once; never changed)', tag: 'plans', access: ['lab_manager'], params: PlanVersionParams, body: AckInput, response: AckRecord, status: 201 },
    ({ actor, params, body }) => plans.acknowledgePlan(ctx, actor, params.id, params.version, body.comment))

  api.add({ method: 'get', path: '/api/plans/:id/versions/:version/pdf', summary: 'The plan version as a PDF', tag: 'plans', access: READERS, params: PlanVersionParams, responseContentType: 'application/pdf' },
    async ({ actor, params, res }) => {
      const pdf = await plans.planPdf(ctx, actor, params.id, params.version)
      res.setHeader('Content-Type', 'application/pdf')
      res.setHeader('Content-Disposition', `attachment; filename="${pdf.fileName}"`)
      res.end(pdf.bytes)
    })

  api.add({ method: 'get', path: '/api/plans/:id/audit', summary: 'Who did what to this plan', tag: 'plans', access: READERS, params: IdParam, response: AuditList },
    ({ actor, params }) => plans.planAudit(ctx, actor, params.id))
}
