import { API } from '../../shared/api-paths'
import { IdParam } from '../../shared/schemas/common'
import { Invitation, InvitationSent, UserList, UserSummary, UserUpdate } from '../../shared/schemas/users'
import type { ApiRoutes } from '../http/define-route'
import type { ServiceContext } from '../services/context'
import * as users from '../services/users.service'

export function usersRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: API.users, summary: 'People in the organization', tag: 'users', access: ['admin'], response: UserList },
    ({ actor }) => users.listUsers(ctx, actor))

  api.add({ method: 'post', path: API.invitations, summary: 'Invite someone by e-mail (the same answer whether or not the address has an account with another organization)', tag: 'users', access: ['admin'], body: Invitation, response: InvitationSent, status: 202 },
    ({ actor, body }) => users.inviteUser(ctx, actor, body))

  api.add({ method: 'patch', path: '/api/users/:id', summary: 'Change role, name or deactivate', tag: 'users', access: ['admin'], params: IdParam, body: UserUpdate, response: UserSummary },
    ({ actor, params, body }) => users.changeUser(ctx, actor, params.id, body))
}
