import { SavePlanResult } from '../../shared/schemas/floors'
import { IdParam } from '../../shared/schemas/common'
import { BundleFrontsQuery, RunBundle } from '../../shared/schemas/bundles'
import { EgressQuery, EgressResult } from '../../shared/schemas/egress'
import { AdvisorAccept, AdvisorProposal, AdvisorRequest, RunDetail, RunList, RunSeries, SweepDetail, SweepInput } from '../../shared/schemas/runs'
import type { ApiRoutes } from '../http/define-route'
import * as advisor from '../services/advisor.service'
import * as bundles from '../services/bundles.service'
import * as egress from '../services/egress.service'
import type { ServiceContext } from '../services/context'
import * as runs from '../services/runs.service'
import * as sweeps from '../services/sweeps.service'

const OFFICERS = ['admin', 'ehs_officer'] as const

export function runsRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: '/api/runs', summary: 'Recent runs on the floors you can see', tag: 'runs', access: 'signed-in', response: RunList },
    ({ actor }) => runs.listVisibleRuns(ctx, actor))
  api.add({ method: 'get', path: '/api/floors/:id/runs', summary: 'Runs of a floor', tag: 'runs', access: 'signed-in', params: IdParam, response: RunList },
    ({ actor, params }) => runs.listFloorRuns(ctx, actor, params.id))
  api.add({ method: 'get', path: '/api/runs/:id', summary: 'A run: status, progress, and when finished its summary and field layout', tag: 'runs', access: 'signed-in', params: IdParam, response: RunDetail },
    ({ actor, params }) => runs.getRun(ctx, actor, params.id))
  api.add({ method: 'get', path: '/api/runs/:id/series', summary: 'Time series at each detector and workstation', tag: 'runs', access: 'signed-in', params: IdParam, response: RunSeries },
    ({ actor, params }) => runs.getRunSeries(ctx, actor, params.id))
  api.add({ method: 'get', path: '/api/runs/:id/fields', summary: 'Float32 planes: snapshots, fronts, peak (layout in RunFieldsMeta)', tag: 'runs', access: 'signed-in', params: IdParam, responseContentType: 'application/octet-stream' },
    ({ actor, params, res }) => runs.sendRunFields(ctx, actor, params.id, res))
  api.add({ method: 'get', path: '/api/runs/:id/egress', summary: 'Egress routes per room and workstation: lowest-dose route to a marked exit that never crosses the critical limit (safe: false when none exists), with the dose along it', tag: 'runs', access: 'signed-in', params: IdParam, query: EgressQuery, response: EgressResult },
    ({ actor, params, query }) => egress.getRunEgress(ctx, actor, params.id, query))
  api.add({ method: 'get', path: '/api/runs/:id/bundle', summary: "A run's sensitivity bundle (D ×0.3 and ×3, the named ventilation failure, nearby leak positions): each case's run, the earliest–latest band of every time to a limit with the case driving the earliest, and the cost against one run", tag: 'runs', access: 'signed-in', params: IdParam, response: RunBundle },
    ({ actor, params }) => bundles.getRunBundle(ctx, actor, params.id))
  api.add({ method: 'get', path: '/api/runs/:id/bundle/fronts', summary: "Fronts of one limit over a run's bundle: Float32 planes nominal, earliest and latest first-crossing time (nx·ny each)", tag: 'runs', access: 'signed-in', params: IdParam, query: BundleFrontsQuery, responseContentType: 'application/octet-stream' },
    ({ actor, params, query, res }) => bundles.sendBundleFronts(ctx, actor, params.id, query.limitKey, res))
  api.add({ method: 'post', path: '/api/runs/:id/cancel', summary: 'Cancel a queued or running run', tag: 'runs', access: OFFICERS, params: IdParam, response: RunDetail },
    ({ actor, params }) => runs.cancelRun(ctx, actor, params.id))

  api.add({ method: 'post', path: '/api/floors/:id/sweeps', summary: 'Sweep: the same leak at each of several sources, one run each', tag: 'sweeps', access: OFFICERS, params: IdParam, body: SweepInput, response: SweepDetail, status: 202 },
    ({ actor, params, body }) => sweeps.startSweep(ctx, actor, params.id, body))
  api.add({ method: 'get', path: '/api/floors/:id/sweeps', summary: 'Sweeps of a floor', tag: 'sweeps', access: 'signed-in', params: IdParam },
    ({ actor, params }) => sweeps.listSweeps(ctx, actor, params.id))
  api.add({ method: 'get', path: '/api/sweeps/:id', summary: 'A sweep with the worst case per workstation', tag: 'sweeps', access: 'signed-in', params: IdParam, response: SweepDetail },
    ({ actor, params }) => sweeps.getSweep(ctx, actor, params.id))

  api.add({ method: 'post', path: '/api/floors/:id/advisor', summary: 'Propose detector positions from finished runs', tag: 'advisor', access: OFFICERS, params: IdParam, body: AdvisorRequest, response: AdvisorProposal },
    ({ actor, params, body }) => advisor.propose(ctx, actor, params.id, body))
  api.add({ method: 'post', path: '/api/floors/:id/advisor/accept', summary: 'Add proposed detectors to the plan (409 stale_version)', tag: 'advisor', access: OFFICERS, params: IdParam, body: AdvisorAccept, response: SavePlanResult },
    ({ actor, params, body }) => advisor.acceptProposal(ctx, actor, params.id, body))
}
