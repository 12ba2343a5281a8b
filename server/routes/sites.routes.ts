import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as floors from '../services/floors.service'
import * as sites from '../services/sites.service'


export function sitesRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.sites.list,
    ({ actor }) => sites.listSites(ctx, actor))

  api.add(contract.sites.create,
    ({ actor, body }) => sites.createSite(ctx, actor, body))

  // Registered before /api/sites/:id so that "people" is not read as an id.
  api.add(contract.sites.people,
    ({ actor }) => sites.listPeople(ctx, actor))

  api.add(contract.sites.update,
    ({ actor, params, body }) => sites.changeSite(ctx, actor, params.id, body))

  api.add(contract.sites.remove,
    ({ actor, params }) => sites.removeSite(ctx, actor, params.id))

  api.add(contract.sites.floors,
    ({ actor, params }) => floors.listVisibleFloors(ctx, actor, params.id))

  api.add(contract.sites.createFloor,
    ({ actor, params, body }) => floors.createFloor(ctx, actor, params.id, body))
}

