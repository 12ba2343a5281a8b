import { BundleFrontsQuery, RunBundle } from '../schemas/bundles'
import { IdParam } from '../schemas/common'
import { EgressQuery, EgressResult } from '../schemas/egress'
import { SavePlanResult } from '../schemas/floors'
import { AdvisorAccept, AdvisorProposal, AdvisorRequest, RunDetail, RunList, RunSeries, SweepDetail, SweepInput } from '../schemas/runs'
import { OFFICERS, route } from './route'

export const runs = {
  list: route({ method: 'get', path: '/api/runs', summary: 'Recent runs on the floors you can see', tag: 'runs', access: 'signed-in', response: RunList }),
  listOfFloor: route({ method: 'get', path: '/api/floors/:id/runs', summary: 'Runs of a floor', tag: 'runs', access: 'signed-in', params: IdParam, response: RunList }),
  get: route({ method: 'get', path: '/api/runs/:id', summary: 'A run: status, progress, and when finished its summary and field layout', tag: 'runs', access: 'signed-in', params: IdParam, response: RunDetail }),
  series: route({ method: 'get', path: '/api/runs/:id/series', summary: 'Time series at each detector and workstation', tag: 'runs', access: 'signed-in', params: IdParam, response: RunSeries }),
  fields: route({ method: 'get', path: '/api/runs/:id/fields', summary: 'Float32 planes: snapshots, fronts, peak (layout in RunFieldsMeta)', tag: 'runs', access: 'signed-in', params: IdParam, responseContentType: 'application/octet-stream' }),
  egress: route({ method: 'get', path: '/api/runs/:id/egress', summary: 'Egress routes per room and workstation: lowest-dose route to a marked exit that never crosses the critical limit (safe: false when none exists), with the dose along it', tag: 'runs', access: 'signed-in', params: IdParam, query: EgressQuery, response: EgressResult }),
  bundle: route({ method: 'get', path: '/api/runs/:id/bundle', summary: "A run's sensitivity bundle (D ×0.3 and ×3, the named ventilation failure, nearby leak positions): each case's run, the earliest–latest band of every time to a limit with the case driving the earliest, and the cost against one run", tag: 'runs', access: 'signed-in', params: IdParam, response: RunBundle }),
  bundleFronts: route({ method: 'get', path: '/api/runs/:id/bundle/fronts', summary: "Fronts of one limit over a run's bundle: Float32 planes nominal, earliest and latest first-crossing time (nx·ny each)", tag: 'runs', access: 'signed-in', params: IdParam, query: BundleFrontsQuery, responseContentType: 'application/octet-stream' }),
  cancel: route({ method: 'post', path: '/api/runs/:id/cancel', summary: 'Cancel a queued or running run', tag: 'runs', access: OFFICERS, params: IdParam, response: RunDetail }),

  startSweep: route({ method: 'post', path: '/api/floors/:id/sweeps', summary: 'Sweep: the same leak at each of several sources, one run each', tag: 'sweeps', access: OFFICERS, params: IdParam, body: SweepInput, response: SweepDetail, status: 202 }),
  sweepsOfFloor: route({ method: 'get', path: '/api/floors/:id/sweeps', summary: 'Sweeps of a floor', tag: 'sweeps', access: 'signed-in', params: IdParam }),
  sweep: route({ method: 'get', path: '/api/sweeps/:id', summary: 'A sweep with the worst case per workstation', tag: 'sweeps', access: 'signed-in', params: IdParam, response: SweepDetail }),

  propose: route({ method: 'post', path: '/api/floors/:id/advisor', summary: 'Propose detector positions from finished runs', tag: 'advisor', access: OFFICERS, params: IdParam, body: AdvisorRequest, response: AdvisorProposal }),
  acceptProposal: route({ method: 'post', path: '/api/floors/:id/advisor/accept', summary: 'Add proposed detectors to the plan (409 stale_version)', tag: 'advisor', access: OFFICERS, params: IdParam, body: AdvisorAccept, response: SavePlanResult }),
}
