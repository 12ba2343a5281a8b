import { API } from '../../shared/api-paths'
import { type Invitation, type UserUpdate, UserList, UserSummary } from '../../shared/schemas/users'
import { http } from './http'

export const usersApi = {
  list: async () => (await http.get(API.users, { schema: UserList })).users,
  /** 409 when the e-mail address already has an account. */
  invite: (invitation: Invitation) => http.post(API.invitations, invitation, { schema: UserSummary }),
  update: (id: number, update: UserUpdate) => http.patch(API.user(id), update, { schema: UserSummary }),
}
