import { contract } from '../../shared/contract'
import type { NewPlan, PlanContent } from '../../shared/schemas/plans'
import { call, urlOf } from './http'

const c = contract.plans

export const plansApi = {
  list: async () => (await call(c.list)).plans,
  runsOfFloor: async (floorId: number) => (await call(c.runsOfFloor, { params: { floorId } })).runs,
  create: (input: NewPlan) => call(c.create, { body: input }),
  get: (id: number) => call(c.get, { params: { id } }),
  version: (id: number, v: number) => call(c.version, { params: { id, version: v } }),
  /** With `updatedAt` (of the version the edit started from): 409 stale_version when saved, refreshed or published since. */
  saveDraft: (id: number, content: PlanContent, updatedAt?: string) => call(c.saveDraft, { params: { id }, body: { content, updatedAt } }),
  refresh: (id: number, runIds: number[]) => call(c.refresh, { params: { id }, body: { runIds } }),
  publish: (id: number, ackDueDays: number) => call(c.publish, { params: { id }, body: { ackDueDays } }),
  acknowledge: (id: number, v: number, comment: string) => call(c.acknowledge, { params: { id, version: v }, body: { comment } }),
  audit: async (id: number) => (await call(c.audit, { params: { id } })).entries,
  pdfUrl: (id: number, v: number) => urlOf(c.pdf, { id, version: v }),
  /** The latest bring-up-to-date request of a plan (null when none). */
  updateState: (id: number) => call(contract.staleness.update, { params: { id } }),
  bringUpToDate: (id: number, input: { publish?: boolean; ackDueDays?: number }) => call(contract.staleness.bringUpToDate, { params: { id }, body: input }),
}
