import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as plans from '../services/plans.service'


/** Response plans. Acknowledgments have no update or delete route: they are append-only (also in the database). */
export function plansRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.plans.list,
    ({ actor }) => plans.listPlans(ctx, actor))

  api.add(contract.plans.runsOfFloor,
    ({ actor, params }) => plans.runsOfFloor(ctx, actor, params.floorId))

  api.add(contract.plans.create,
    ({ actor, body }) => plans.createPlan(ctx, actor, body))

  api.add(contract.plans.get,
    ({ actor, params }) => plans.getPlan(ctx, actor, params.id))

  api.add(contract.plans.saveDraft,
    ({ actor, params, body }) => plans.saveDraft(ctx, actor, params.id, body.content, body.updatedAt))

  api.add(contract.plans.refresh,
    ({ actor, params, body }) => plans.refreshPlan(ctx, actor, params.id, body.runIds))

  api.add(contract.plans.publish,
    ({ actor, params, body }) => plans.publishPlan(ctx, actor, params.id, body.ackDueDays))

  api.add(contract.plans.version,
    ({ actor, params }) => plans.getVersion(ctx, actor, params.id, params.version))

  api.add(contract.plans.acknowledge,
    ({ actor, params, body }) => plans.acknowledgePlan(ctx, actor, params.id, params.version, body.comment))

  api.add(contract.plans.pdf,
    async ({ actor, params, res }) => {
      const pdf = await plans.planPdf(ctx, actor, params.id, params.version)
      res.setHeader('Content-Type', 'application/pdf')
      res.setHeader('Content-Disposition', `attachment; filename="${pdf.fileName}"`)
      res.end(pdf.bytes)
    })

  api.add(contract.plans.audit,
    ({ actor, params }) => plans.planAudit(ctx, actor, params.id))
}
