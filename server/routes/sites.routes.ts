import { IdParam } from '../../shared/schemas/common'
import { FLOOR_API, FloorDetail, FloorInput, FloorList, PeopleList, Site, SiteInput, SiteList, SiteUpdate } from '../../shared/schemas/floors'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as floors from '../services/floors.service'
import * as sites from '../services/sites.service'

const OFFICERS = ['admin', 'ehs_officer'] as const

export function sitesRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: FLOOR_API.sites, summary: 'Sites (buildings) the caller can see', tag: 'floors', access: 'signed-in', response: SiteList },
    ({ actor }) => sites.listSites(ctx, actor))

  api.add({ method: 'post', path: FLOOR_API.sites, summary: 'Add a site', tag: 'floors', access: OFFICERS, body: SiteInput, response: Site, status: 201 },
    ({ actor, body }) => sites.createSite(ctx, actor, body))

  // Registered before /api/sites/:id so that "people" is not read as an id.
  api.add({ method: 'get', path: FLOOR_API.people, summary: 'People who can be made responsible for or assigned to floors', tag: 'floors', access: OFFICERS, response: PeopleList },
    ({ actor }) => sites.listPeople(ctx, actor))

  api.add({ method: 'patch', path: '/api/sites/:id', summary: 'Rename a site or change its address', tag: 'floors', access: OFFICERS, params: IdParam, body: SiteUpdate, response: Site },
    ({ actor, params, body }) => sites.changeSite(ctx, actor, params.id, body))

  api.add({ method: 'delete', path: '/api/sites/:id', summary: 'Delete a site with its floors', tag: 'floors', access: OFFICERS, params: IdParam },
    ({ actor, params }) => sites.removeSite(ctx, actor, params.id))

  api.add({ method: 'get', path: '/api/sites/:id/floors', summary: 'Floors of a site the caller can see', tag: 'floors', access: 'signed-in', params: IdParam, response: FloorList },
    ({ actor, params }) => floors.listVisibleFloors(ctx, actor, params.id))

  api.add({ method: 'post', path: '/api/sites/:id/floors', summary: 'Add a floor to a site', tag: 'floors', access: OFFICERS, params: IdParam, body: FloorInput, response: FloorDetail, status: 201 },
    ({ actor, params, body }) => floors.createFloor(ctx, actor, params.id, body))
}

