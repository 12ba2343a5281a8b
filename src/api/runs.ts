import { contract } from '../../shared/contract'
import type { EgressQuery } from '../../shared/schemas/egress'
import type { AdvisorAccept, AdvisorRequest, ScenarioConfig, SweepInput } from '../../shared/schemas/runs'
import { call, callBytes } from './http'

const c = contract.runs
const s = contract.scenarios

export const runsApi = {
  listScenarios: async (floorId: number) => (await call(s.listOfFloor, { params: { id: floorId } })).scenarios,
  createScenario: (floorId: number, config: ScenarioConfig) => call(s.create, { params: { id: floorId }, body: config }),
  /** With `updatedAt` (as read): 409 stale_version when someone saved the scenario since. */
  updateScenario: (id: number, config: ScenarioConfig, updatedAt?: string) => call(s.update, { params: { id }, body: { ...config, updatedAt } }),
  deleteScenario: (id: number) => call(s.remove, { params: { id } }),
  startRun: (scenarioId: number) => call(s.run, { params: { id: scenarioId } }),
  listFloorRuns: async (floorId: number) => (await call(c.listOfFloor, { params: { id: floorId } })).runs,
  getRun: (id: number, signal?: AbortSignal) => call(c.get, { params: { id }, signal }),
  cancelRun: (id: number) => call(c.cancel, { params: { id } }),
  getSeries: (id: number) => call(c.series, { params: { id } }),
  /** The Float32 planes of a finished run (layout: RunFieldsMeta). */
  getFields: async (id: number) => new Float32Array(await callBytes(c.fields, { params: { id } })),
  getEgress: (id: number, query: Partial<EgressQuery>, signal?: AbortSignal) => call(c.egress, { params: { id }, query, signal }),
  getBundle: (id: number) => call(c.bundle, { params: { id } }),
  /** Nominal, earliest and latest first-crossing planes of one limit over a run's bundle. */
  getBundleFronts: async (id: number, limitKey: string) => new Float32Array(await callBytes(c.bundleFronts, { params: { id }, query: { limitKey } })),
  startSweep: (floorId: number, input: SweepInput) => call(c.startSweep, { params: { id: floorId }, body: input }),
  getSweep: (id: number) => call(c.sweep, { params: { id } }),
  propose: (floorId: number, req: AdvisorRequest) => call(c.propose, { params: { id: floorId }, body: req }),
  accept: (floorId: number, body: AdvisorAccept) => call(c.acceptProposal, { params: { id: floorId }, body }),
}
