import { API } from '../../shared/api-paths'
import {
  type AcceptInvitation,
  type Credentials,
  type Preferences,
  SessionUser,
  TokenInfo,
} from '../../shared/schemas/auth'
import { Ok } from '../../shared/schemas/common'
import { http } from './http'

export const authApi = {
  /** The signed-in user; throws ApiError 401 when signed out. */
  me: () => http.get(API.me, { schema: SessionUser, expectUnauthorized: true }),
  login: (credentials: Credentials) => http.post(API.login, credentials, { schema: SessionUser, expectUnauthorized: true }),
  logout: () => http.post(API.logout),
  updatePreferences: (preferences: Preferences) => http.patch(API.preferences, preferences),
  /** Always answers ok, whether or not the address has an account. */
  requestPasswordReset: (email: string) => http.post(API.forgot, { email }, { schema: Ok }),
  /** What an invitation or reset link is for; 400/410 when it is malformed, used or expired. */
  tokenInfo: (token: string) => http.get(API.tokenInfo, { query: { token }, schema: TokenInfo }),
  resetPassword: (token: string, password: string) => http.post(API.reset, { token, password }, { schema: Ok }),
  /** Creates the account and signs it in. */
  acceptInvitation: (input: AcceptInvitation) => http.post(API.acceptInvitation, input, { schema: SessionUser }),
}
