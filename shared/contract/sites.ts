import { IdParam } from '../schemas/common'
import { FloorDetail, FloorInput, FloorList, PeopleList, Site, SiteInput, SiteList, SiteUpdate } from '../schemas/floors'
import { OFFICERS, route } from './route'

/** Sites (buildings). `people` is registered before /api/sites/:id so that "people" is not read as an id. */
export const sites = {
  list: route({ method: 'get', path: '/api/sites', summary: 'Sites (buildings) the caller can see', tag: 'floors', access: 'signed-in', response: SiteList }),
  create: route({ method: 'post', path: '/api/sites', summary: 'Add a site', tag: 'floors', access: OFFICERS, body: SiteInput, response: Site, status: 201 }),
  people: route({ method: 'get', path: '/api/sites/people', summary: 'People who can be made responsible for or assigned to floors', tag: 'floors', access: OFFICERS, response: PeopleList }),
  update: route({ method: 'patch', path: '/api/sites/:id', summary: 'Rename a site or change its address', tag: 'floors', access: OFFICERS, params: IdParam, body: SiteUpdate, response: Site }),
  remove: route({ method: 'delete', path: '/api/sites/:id', summary: 'Delete a site with its floors', tag: 'floors', access: OFFICERS, params: IdParam }),
  floors: route({ method: 'get', path: '/api/sites/:id/floors', summary: 'Floors of a site the caller can see', tag: 'floors', access: 'signed-in', params: IdParam, response: FloorList }),
  createFloor: route({ method: 'post', path: '/api/sites/:id/floors', summary: 'Add a floor to a site', tag: 'floors', access: OFFICERS, params: IdParam, body: FloorInput, response: FloorDetail, status: 201 }),
}
