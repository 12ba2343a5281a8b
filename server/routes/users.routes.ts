import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as users from '../services/users.service'

export function usersRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.users.list,
    ({ actor }) => users.listUsers(ctx, actor))

  api.add(contract.users.invite,
    ({ actor, body }) => users.inviteUser(ctx, actor, body))

  api.add(contract.users.update,
    ({ actor, params, body }) => users.changeUser(ctx, actor, params.id, body))
}
