import { API } from '../../shared/api-paths'
import {
  AdvisorProposal, RunDetail, RunList, RunSeries, ScenarioList, ScenarioRecord, SweepDetail,
  type AdvisorAccept, type AdvisorRequest, type ScenarioConfig, type SweepInput,
} from '../../shared/schemas/runs'
import { SavePlanResult } from '../../shared/schemas/floors'
import { ApiError, http } from './http'

export const runsApi = {
  listScenarios: async (floorId: number) => (await http.get(API.floorScenarios(floorId), { schema: ScenarioList })).scenarios,
  createScenario: (floorId: number, config: ScenarioConfig) => http.post(API.floorScenarios(floorId), config, { schema: ScenarioRecord }),
  /** With `updatedAt` (as read): 409 stale_version when someone saved the scenario since. */
  updateScenario: (id: number, config: ScenarioConfig, updatedAt?: string) => http.put(API.scenario(id), { ...config, updatedAt }, { schema: ScenarioRecord }),
  deleteScenario: (id: number) => http.delete(API.scenario(id)),
  startRun: (scenarioId: number) => http.post(API.scenarioRuns(scenarioId), undefined, { schema: RunDetail }),
  listFloorRuns: async (floorId: number) => (await http.get(API.floorRuns(floorId), { schema: RunList })).runs,
  getRun: (id: number, signal?: AbortSignal) => http.get(API.run(id), { schema: RunDetail, signal }),
  cancelRun: (id: number) => http.post(API.runCancel(id), undefined, { schema: RunDetail }),
  getSeries: (id: number) => http.get(API.runSeries(id), { schema: RunSeries }),
  /** The Float32 planes of a finished run (layout: RunFieldsMeta). */
  async getFields(id: number): Promise<Float32Array> {
    const res = await fetch(API.runFields(id), { credentials: 'same-origin' })
    if (!res.ok) throw new ApiError(res.status, `http-${res.status}`, 'Could not load the result fields')
    return new Float32Array(await res.arrayBuffer())
  },
  startSweep: (floorId: number, input: SweepInput) => http.post(API.floorSweeps(floorId), input, { schema: SweepDetail }),
  getSweep: (id: number) => http.get(API.sweep(id), { schema: SweepDetail }),
  propose: (floorId: number, req: AdvisorRequest) => http.post(API.floorAdvisor(floorId), req, { schema: AdvisorProposal }),
  accept: (floorId: number, body: AdvisorAccept) => http.post(API.floorAdvisorAccept(floorId), body, { schema: SavePlanResult }),
}
