import { contract } from '../../shared/contract'
import type { Invitation, UserUpdate } from '../../shared/schemas/users'
import { call } from './http'

const c = contract.users

export const usersApi = {
  list: async () => (await call(c.list)).users,
  /** 202 with a neutral message (also for an address used elsewhere); 409 when it already belongs to this organization. */
  invite: (invitation: Invitation) => call(c.invite, { body: invitation }),
  update: (id: number, update: UserUpdate) => call(c.update, { params: { id }, body: update }),
}
