import { z } from 'zod'
import {
  AckRecord, AuditList, PLAN_API, PlanContent, PlanDetail, PlanList, PlanStatus, RunChoiceList, type NewPlan,
} from '../../shared/schemas/plans'
import { http } from './http'

const VersionBody = z.object({ version: z.number().int(), status: PlanStatus, contentHash: z.string().nullable(), content: PlanContent })

export const plansApi = {
  list: async () => (await http.get(PLAN_API.plans, { schema: PlanList })).plans,
  runsOfFloor: async (floorId: number) => (await http.get(PLAN_API.floorRuns(floorId), { schema: RunChoiceList })).runs,
  create: (input: NewPlan) => http.post(PLAN_API.plans, input, { schema: PlanDetail }),
  get: (id: number) => http.get(PLAN_API.plan(id), { schema: PlanDetail }),
  version: (id: number, v: number) => http.get(PLAN_API.version(id, v), { schema: VersionBody }),
  /** With `updatedAt` (of the version the edit started from): 409 stale_version when saved, refreshed or published since. */
  saveDraft: (id: number, content: PlanContent, updatedAt?: string) => http.put(PLAN_API.draft(id), { content, updatedAt }, { schema: PlanDetail }),
  refresh: (id: number, runIds: number[]) => http.post(PLAN_API.refresh(id), { runIds }, { schema: PlanDetail }),
  publish: (id: number, ackDueDays: number) => http.post(PLAN_API.publish(id), { ackDueDays }, { schema: PlanDetail }),
  acknowledge: (id: number, v: number, comment: string) => http.post(PLAN_API.acknowledge(id, v), { comment }, { schema: AckRecord }),
  audit: async (id: number) => (await http.get(PLAN_API.audit(id), { schema: AuditList })).entries,
  pdfUrl: (id: number, v: number) => PLAN_API.pdf(id, v),
}
