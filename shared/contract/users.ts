import { IdParam } from '../schemas/common'
import { Invitation, InvitationSent, UserList, UserSummary, UserUpdate } from '../schemas/users'
import { ADMINS, route } from './route'

export const users = {
  list: route({ method: 'get', path: '/api/users', summary: 'People in the organization', tag: 'users', access: ADMINS, response: UserList }),
  invite: route({ method: 'post', path: '/api/users/invitations', summary: 'Invite someone by e-mail (the same answer whether or not the address has an account with another organization)', tag: 'users', access: ADMINS, body: Invitation, response: InvitationSent, status: 202 }),
  update: route({ method: 'patch', path: '/api/users/:id', summary: 'Change role, name or deactivate', tag: 'users', access: ADMINS, params: IdParam, body: UserUpdate, response: UserSummary }),
}
