import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import { bringUpToDate, planUpdateState } from '../services/plan-updates.service'
import { setReviewInterval } from '../services/staleness.service'


/** Stale plans (issue 17): bring a plan up to date; a site's review interval for the weekly digest. */
export function stalenessRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.staleness.bringUpToDate,
    ({ actor, params, body }) => bringUpToDate(ctx, actor, params.id, body))

  api.add(contract.staleness.update,
    ({ actor, params }) => planUpdateState(ctx, actor, params.id))

  api.add(contract.staleness.reviewInterval,
    ({ actor, params, body }) => setReviewInterval(ctx, actor, params.id, body.days))
}
