import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as drills from '../services/drills.service'


/** Drills. Fixed paths come before /api/drills/:id so that "confirm" or "overview" is never read as an id. */
export function drillsRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.drills.receiptInfo,
    ({ query }) => drills.receiptInfo(ctx, query.token))
  api.add(contract.drills.confirm,
    ({ body }) => drills.confirmReceipt(ctx, body.token))

  api.add(contract.drills.overview,
    ({ actor }) => drills.drillOverview(ctx, actor))
  api.add(contract.drills.setFrequency,
    ({ actor, params, body }) => drills.setFrequency(ctx, actor, params.siteId, body.drillFrequencyDays))
  api.add(contract.drills.people,
    ({ actor }) => drills.invitable(ctx, actor))

  api.add(contract.drills.list,
    ({ actor }) => drills.listDrills(ctx, actor))
  api.add(contract.drills.schedule,
    ({ actor, body }) => drills.scheduleDrill(ctx, actor, body))
  api.add(contract.drills.get,
    ({ actor, params }) => drills.getDrill(ctx, actor, params.id))
  api.add(contract.drills.change,
    ({ actor, params, body }) => drills.changeDrill(ctx, actor, params.id, body))
  api.add(contract.drills.cancel,
    ({ actor, params, body }) => drills.cancelDrill(ctx, actor, params.id, body.reason))
  api.add(contract.drills.record,
    ({ actor, params, body }) => drills.recordDrill(ctx, actor, params.id, body))
  api.add(contract.drills.addFinding,
    ({ actor, params, body }) => drills.addFinding(ctx, actor, params.id, body))
  api.add(contract.drills.setFinding,
    ({ actor, params, body }) => drills.changeFinding(ctx, actor, params.id, body))
  api.add(contract.drills.pdf,
    async ({ actor, params, res }) => {
      const pdf = await drills.drillPdf(ctx, actor, params.id)
      res.setHeader('Content-Type', 'application/pdf')
      res.setHeader('Content-Disposition', `attachment; filename="${pdf.fileName}"`)
      res.end(pdf.bytes)
    })
}
