import { IdParam } from '../../shared/schemas/common'
import { BringUpToDate, PlanUpdateState, ReviewInterval, ReviewIntervalInput } from '../../shared/schemas/staleness'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import { bringUpToDate, planUpdateState } from '../services/plan-updates.service'
import { setReviewInterval } from '../services/staleness.service'

const OFFICERS = ['admin', 'ehs_officer'] as const

/** Stale plans (issue 17): bring a plan up to date; a site's review interval for the weekly digest. */
export function stalenessRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'post', path: '/api/plans/:id/bring-up-to-date', summary: 'Re-run the scenarios of a plan, then refresh its draft from the new results and (by default) publish it for acknowledgment again', tag: 'plans', access: OFFICERS, params: IdParam, body: BringUpToDate, response: PlanUpdateState, status: 202 },
    ({ actor, params, body }) => bringUpToDate(ctx, actor, params.id, body))

  api.add({ method: 'get', path: '/api/plans/:id/update', summary: 'The latest bring-up-to-date request of a plan and what changed in the numbers', tag: 'plans', access: OFFICERS, params: IdParam, response: PlanUpdateState },
    ({ actor, params }) => planUpdateState(ctx, actor, params.id))

  api.add({ method: 'put', path: '/api/sites/:id/review-interval', summary: "Days after which a site's plans must be acknowledged again even without a change", tag: 'sites', access: OFFICERS, params: IdParam, body: ReviewIntervalInput, response: ReviewInterval },
    ({ actor, params, body }) => setReviewInterval(ctx, actor, params.id, body.days))
}
