import { IdParam } from '../../shared/schemas/common'
import { RunDetail, ScenarioChange, ScenarioConfig, ScenarioList, ScenarioRecord } from '../../shared/schemas/runs'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as runs from '../services/runs.service'
import * as scenarios from '../services/scenarios.service'

const OFFICERS = ['admin', 'ehs_officer'] as const

export function scenariosRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: '/api/floors/:id/scenarios', summary: 'Saved scenarios of a floor', tag: 'scenarios', access: 'signed-in', params: IdParam, response: ScenarioList },
    ({ actor, params }) => scenarios.listScenarios(ctx, actor, params.id))
  api.add({ method: 'post', path: '/api/floors/:id/scenarios', summary: 'Save a scenario on a floor (sources, release, duration, ventilation state)', tag: 'scenarios', access: OFFICERS, params: IdParam, body: ScenarioConfig, response: ScenarioRecord, status: 201 },
    ({ actor, params, body }) => scenarios.createScenario(ctx, actor, params.id, body))
  api.add({ method: 'get', path: '/api/scenarios/:id', summary: 'A scenario', tag: 'scenarios', access: 'signed-in', params: IdParam, response: ScenarioRecord },
    ({ actor, params }) => scenarios.getScenario(ctx, actor, params.id))
  api.add({ method: 'put', path: '/api/scenarios/:id', summary: 'Change a scenario (with the updatedAt it was read at: 409 stale_version when saved since)', tag: 'scenarios', access: OFFICERS, params: IdParam, body: ScenarioChange, response: ScenarioRecord },
    ({ actor, params, body }) => scenarios.changeScenario(ctx, actor, params.id, body))
  api.add({ method: 'delete', path: '/api/scenarios/:id', summary: 'Delete a scenario (its runs stay)', tag: 'scenarios', access: OFFICERS, params: IdParam },
    ({ actor, params }) => scenarios.removeScenario(ctx, actor, params.id))
  api.add({ method: 'post', path: '/api/scenarios/:id/runs', summary: 'Run a scenario: queues an engine job', tag: 'runs', access: OFFICERS, params: IdParam, response: RunDetail, status: 202 },
    ({ actor, params }) => runs.startScenarioRun(ctx, actor, params.id))
}
