import { IdParam } from '../schemas/common'
import { RunDetail, ScenarioChange, ScenarioConfig, ScenarioList, ScenarioRecord } from '../schemas/runs'
import { OFFICERS, route } from './route'

export const scenarios = {
  listOfFloor: route({ method: 'get', path: '/api/floors/:id/scenarios', summary: 'Saved scenarios of a floor', tag: 'scenarios', access: 'signed-in', params: IdParam, response: ScenarioList }),
  create: route({ method: 'post', path: '/api/floors/:id/scenarios', summary: 'Save a scenario on a floor (sources, release, duration, ventilation state)', tag: 'scenarios', access: OFFICERS, params: IdParam, body: ScenarioConfig, response: ScenarioRecord, status: 201 }),
  get: route({ method: 'get', path: '/api/scenarios/:id', summary: 'A scenario', tag: 'scenarios', access: 'signed-in', params: IdParam, response: ScenarioRecord }),
  update: route({ method: 'put', path: '/api/scenarios/:id', summary: 'Change a scenario (with the updatedAt it was read at: 409 stale_version when saved since)', tag: 'scenarios', access: OFFICERS, params: IdParam, body: ScenarioChange, response: ScenarioRecord }),
  remove: route({ method: 'delete', path: '/api/scenarios/:id', summary: 'Delete a scenario (its runs stay)', tag: 'scenarios', access: OFFICERS, params: IdParam }),
  run: route({ method: 'post', path: '/api/scenarios/:id/runs', summary: 'Run a scenario: queues an engine job', tag: 'runs', access: OFFICERS, params: IdParam, response: RunDetail, status: 202 }),
}
