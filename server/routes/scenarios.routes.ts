import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as runs from '../services/runs.service'
import * as scenarios from '../services/scenarios.service'


export function scenariosRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.scenarios.listOfFloor,
    ({ actor, params }) => scenarios.listScenarios(ctx, actor, params.id))
  api.add(contract.scenarios.create,
    ({ actor, params, body }) => scenarios.createScenario(ctx, actor, params.id, body))
  api.add(contract.scenarios.get,
    ({ actor, params }) => scenarios.getScenario(ctx, actor, params.id))
  api.add(contract.scenarios.update,
    ({ actor, params, body }) => scenarios.changeScenario(ctx, actor, params.id, body))
  api.add(contract.scenarios.remove,
    ({ actor, params }) => scenarios.removeScenario(ctx, actor, params.id))
  api.add(contract.scenarios.run,
    ({ actor, params }) => runs.startScenarioRun(ctx, actor, params.id))
}
