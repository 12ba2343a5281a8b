import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import * as advisor from '../services/advisor.service'
import * as bundles from '../services/bundles.service'
import * as egress from '../services/egress.service'
import type { ServiceContext } from '../services/context'
import * as runs from '../services/runs.service'
import * as sweeps from '../services/sweeps.service'


export function runsRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.runs.list,
    ({ actor }) => runs.listVisibleRuns(ctx, actor))
  api.add(contract.runs.listOfFloor,
    ({ actor, params }) => runs.listFloorRuns(ctx, actor, params.id))
  api.add(contract.runs.get,
    ({ actor, params }) => runs.getRun(ctx, actor, params.id))
  api.add(contract.runs.series,
    ({ actor, params }) => runs.getRunSeries(ctx, actor, params.id))
  api.add(contract.runs.fields,
    async ({ actor, params, res }) => {
      const { bytes, frames } = await runs.getRunFields(ctx, actor, params.id)
      res.setHeader('content-type', 'application/octet-stream')
      res.setHeader('cache-control', 'private, max-age=3600')
      res.setHeader('x-frames', String(frames))
      res.status(200).end(bytes)
    })
  api.add(contract.runs.egress,
    ({ actor, params, query }) => egress.getRunEgress(ctx, actor, params.id, query))
  api.add(contract.runs.bundle,
    ({ actor, params }) => bundles.getRunBundle(ctx, actor, params.id))
  api.add(contract.runs.bundleFronts,
    async ({ actor, params, query, res }) => {
      const { bytes, cases } = await bundles.getBundleFronts(ctx, actor, params.id, query.limitKey)
      res.setHeader('content-type', 'application/octet-stream')
      res.setHeader('x-cases', String(cases))
      res.status(200).end(bytes)
    })
  api.add(contract.runs.cancel,
    ({ actor, params }) => runs.cancelRun(ctx, actor, params.id))

  api.add(contract.runs.startSweep,
    ({ actor, params, body }) => sweeps.startSweep(ctx, actor, params.id, body))
  api.add(contract.runs.sweepsOfFloor,
    ({ actor, params }) => sweeps.listSweeps(ctx, actor, params.id))
  api.add(contract.runs.sweep,
    ({ actor, params }) => sweeps.getSweep(ctx, actor, params.id))

  api.add(contract.runs.propose,
    ({ actor, params, body }) => advisor.propose(ctx, actor, params.id, body))
  api.add(contract.runs.acceptProposal,
    ({ actor, params, body }) => advisor.acceptProposal(ctx, actor, params.id, body))
}
