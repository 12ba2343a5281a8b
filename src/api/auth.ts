import { contract } from '../../shared/contract'
import type { AcceptInvitation, Credentials, Preferences } from '../../shared/schemas/auth'
import { call } from './http'

const c = contract.auth

export const authApi = {
  /** The signed-in user; throws ApiError 401 when signed out. */
  me: () => call(c.me, { expectUnauthorized: true }),
  login: (credentials: Credentials) => call(c.login, { body: credentials }),
  logout: () => call(c.logout),
  updatePreferences: (preferences: Preferences) => call(c.preferences, { body: preferences }),
  /** Always answers ok, whether or not the address has an account. */
  requestPasswordReset: (email: string) => call(c.forgot, { body: { email } }),
  /** What an invitation or reset link is for; 400/410 when it is malformed, used or expired. */
  tokenInfo: (token: string) => call(c.tokenInfo, { query: { token } }),
  resetPassword: (token: string, password: string) => call(c.reset, { body: { token, password } }),
  /** Creates the account and signs it in. */
  acceptInvitation: (input: AcceptInvitation) => call(c.acceptInvitation, { body: input }),
}
