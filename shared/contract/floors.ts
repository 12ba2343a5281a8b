import { IdParam } from '../schemas/common'
import { FloorDetail, FloorImage, FloorImageParams, FloorList, FloorUpdate, SavePlanInput, SavePlanResult, ScenarioExportQuery } from '../schemas/floors'
import { OFFICERS, route } from './route'

export const floors = {
  list: route({ method: 'get', path: '/api/floors', summary: 'Every floor the caller can see', tag: 'floors', access: 'signed-in', response: FloorList }),
  get: route({ method: 'get', path: '/api/floors/:id', summary: 'A floor with its plan and the plan checks', tag: 'floors', access: 'signed-in', params: IdParam, response: FloorDetail }),
  update: route({ method: 'patch', path: '/api/floors/:id', summary: 'Rename a floor, change its ceiling or its people', tag: 'floors', access: OFFICERS, params: IdParam, body: FloorUpdate, response: FloorDetail }),
  remove: route({ method: 'delete', path: '/api/floors/:id', summary: 'Delete a floor', tag: 'floors', access: OFFICERS, params: IdParam }),
  savePlan: route({ method: 'put', path: '/api/floors/:id/plan', summary: 'Save the plan (409 stale_version when someone saved since `version`)', tag: 'floors', access: OFFICERS, params: IdParam, body: SavePlanInput, response: SavePlanResult }),
  exportScenario: route({ method: 'get', path: '/api/floors/:id/scenario', summary: 'The floor as an engine scenario file (400 plan_invalid with the reasons)', tag: 'floors', access: 'signed-in', params: IdParam, query: ScenarioExportQuery }),
  uploadImage: route({ method: 'post', path: '/api/floors/:id/images', summary: 'Upload a PNG or JPEG floor plan to trace (at most 10 MB)', tag: 'floors', access: OFFICERS, params: IdParam, response: FloorImage, status: 201, requestContentType: 'multipart/form-data' }),
  image: route({ method: 'get', path: '/api/floors/:id/images/:imageId', summary: 'A traced floor-plan image', tag: 'floors', access: 'signed-in', params: FloorImageParams, responseContentType: 'image/png' }),
}
