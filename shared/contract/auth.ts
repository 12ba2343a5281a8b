import {
  AcceptInvitation, Credentials, CsrfToken, ForgotPassword, Preferences, ResetPassword, SessionUser, TokenInfo, TokenQuery,
} from '../schemas/auth'
import { Ok } from '../schemas/common'
import { route } from './route'

export const auth = {
  csrf: route({ method: 'get', path: '/api/auth/csrf', summary: 'Get the CSRF token (also set as the dw_csrf cookie)', tag: 'auth', access: 'public', response: CsrfToken }),
  login: route({ method: 'post', path: '/api/auth/login', summary: 'Sign in', tag: 'auth', access: 'public', body: Credentials, response: SessionUser }),
  logout: route({ method: 'post', path: '/api/auth/logout', summary: 'Sign out', tag: 'auth', access: 'public', response: Ok }),
  me: route({ method: 'get', path: '/api/auth/me', summary: 'The signed-in user', tag: 'auth', access: 'signed-in', response: SessionUser }),
  preferences: route({ method: 'patch', path: '/api/auth/preferences', summary: 'Change display preferences', tag: 'auth', access: 'signed-in', body: Preferences, response: SessionUser }),
  forgot: route({ method: 'post', path: '/api/auth/forgot-password', summary: 'E-mail a password-reset link', tag: 'auth', access: 'public', body: ForgotPassword, response: Ok }),
  tokenInfo: route({ method: 'get', path: '/api/auth/token-info', summary: 'What an invitation or reset link is for', tag: 'auth', access: 'public', query: TokenQuery, response: TokenInfo }),
  reset: route({ method: 'post', path: '/api/auth/reset-password', summary: 'Set a new password from a reset link', tag: 'auth', access: 'public', body: ResetPassword, response: Ok }),
  acceptInvitation: route({ method: 'post', path: '/api/auth/accept-invitation', summary: 'Accept an invitation and sign in', tag: 'auth', access: 'public', body: AcceptInvitation, response: SessionUser }),
}
