import { z } from 'zod'
import { IdParam, PathId } from '../schemas/common'
import {
  AckInput, AckRecord, AuditList, NewPlan, PlanContent, PlanDetail, PlanList, PlanStatus, PlanVersionParams, PublishInput,
  RefreshPlan, RunChoiceList, SaveDraft,
} from '../schemas/plans'
import { BringUpToDate, PlanUpdateState, ReviewInterval, ReviewIntervalInput } from '../schemas/staleness'
import { OFFICERS, PLAN_READERS, route } from './route'

const FloorIdParam = z.object({ floorId: PathId })
export const PlanVersionBody = z.object({ version: z.number().int(), status: PlanStatus, contentHash: z.string().nullable(), content: PlanContent })

/** Response plans. Acknowledgments have no update or delete route: they are append-only (also in the database). */
export const plans = {
  list: route({ method: 'get', path: '/api/plans', summary: 'Plans the caller can see, with acknowledgment counts (pending, overdue, done)', tag: 'plans', access: PLAN_READERS, response: PlanList }),
  runsOfFloor: route({ method: 'get', path: '/api/plans/runs-of-floor/:floorId', summary: 'Finished results of a floor to generate a plan from', tag: 'plans', access: OFFICERS, params: FloorIdParam, response: RunChoiceList }),
  create: route({ method: 'post', path: '/api/plans', summary: 'Generate a plan draft from results of a floor by the documented rules', tag: 'plans', access: OFFICERS, body: NewPlan, response: PlanDetail, status: 201 }),
  get: route({ method: 'get', path: '/api/plans/:id', summary: 'A plan: current version, versions, lab managers and acknowledgments', tag: 'plans', access: PLAN_READERS, params: IdParam, response: PlanDetail }),
  saveDraft: route({ method: 'put', path: '/api/plans/:id/draft', summary: 'Save the draft (after a publish, this starts the draft of the next version; with updatedAt, 409 stale_version when changed since)', tag: 'plans', access: OFFICERS, params: IdParam, body: SaveDraft, response: PlanDetail }),
  refresh: route({ method: 'post', path: '/api/plans/:id/refresh', summary: "Rebuild the rule-derived content from newer results of the floor into the draft, keeping officers' own text", tag: 'plans', access: OFFICERS, params: IdParam, body: RefreshPlan, response: PlanDetail }),
  publish: route({ method: 'post', path: '/api/plans/:id/publish', summary: 'Freeze the draft as a version with its sha256 and ask the lab managers to acknowledge', tag: 'plans', access: OFFICERS, params: IdParam, body: PublishInput, response: PlanDetail }),
  version: route({ method: 'get', path: '/api/plans/:id/versions/:version', summary: 'One version of a plan', tag: 'plans', access: PLAN_READERS, params: PlanVersionParams, response: PlanVersionBody }),
  acknowledge: route({ method: 'post', path: '/api/plans/:id/versions/:version/acknowledgments', summary: 'A lab manager of the floor acknowledges the current published version (once; never changed)', tag: 'plans', access: ['lab_manager'], params: PlanVersionParams, body: AckInput, response: AckRecord, status: 201 }),
  pdf: route({ method: 'get', path: '/api/plans/:id/versions/:version/pdf', summary: 'The plan version as a PDF', tag: 'plans', access: PLAN_READERS, params: PlanVersionParams, responseContentType: 'application/pdf' }),
  audit: route({ method: 'get', path: '/api/plans/:id/audit', summary: 'Who did what to this plan', tag: 'plans', access: PLAN_READERS, params: IdParam, response: AuditList }),
}

/** Stale plans (issue 17): bring a plan up to date; a site's review interval for the weekly digest. */
export const staleness = {
  bringUpToDate: route({ method: 'post', path: '/api/plans/:id/bring-up-to-date', summary: 'Re-run the scenarios of a plan, then refresh its draft from the new results and (by default) publish it for acknowledgment again', tag: 'plans', access: OFFICERS, params: IdParam, body: BringUpToDate, response: PlanUpdateState, status: 202 }),
  update: route({ method: 'get', path: '/api/plans/:id/update', summary: 'The latest bring-up-to-date request of a plan and what changed in the numbers', tag: 'plans', access: OFFICERS, params: IdParam, response: PlanUpdateState }),
  reviewInterval: route({ method: 'put', path: '/api/sites/:id/review-interval', summary: "Days after which a site's plans must be acknowledged again even without a change", tag: 'sites', access: OFFICERS, params: IdParam, body: ReviewIntervalInput, response: ReviewInterval }),
}
