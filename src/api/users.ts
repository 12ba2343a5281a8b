import { API } from '../../shared/api-paths'
import { type Invitation, InvitationSent, type UserUpdate, UserList, UserSummary } from '../../shared/schemas/users'
import { http } from './http'

export const usersApi = {
  list: async () => (await http.get(API.users, { schema: UserList })).users,
  /** 202 with a neutral message (also for an address used elsewhere); 409 when it already belongs to this organization. */
  invite: (invitation: Invitation) => http.post(API.invitations, invitation, { schema: InvitationSent }),
  update: (id: number, update: UserUpdate) => http.patch(API.user(id), update, { schema: UserSummary }),
}
