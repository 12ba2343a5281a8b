/** Every API path in one place, so client and server never spell one twice. */
export const API = {
  health: '/api/health',
  openapi: '/api/openapi.json',
  csrf: '/api/auth/csrf',
  login: '/api/auth/login',
  logout: '/api/auth/logout',
  me: '/api/auth/me',
  preferences: '/api/auth/preferences',
  forgot: '/api/auth/forgot-password',
  reset: '/api/auth/reset-password',
  tokenInfo: '/api/auth/token-info',
  acceptInvitation: '/api/auth/accept-invitation',
  users: '/api/users',
  invitations: '/api/users/invitations',
  user: (id: number) => `/api/users/${id}`,
  capturedMail: '/api/admin/captured-mail',
  outgoingMail: '/api/admin/outgoing-mail',
} as const

/** Header carrying the CSRF token on every state-changing request (double-submit, matched to a cookie). */
export const CSRF_HEADER = 'x-csrf-token'
export const CSRF_COOKIE = 'dw_csrf'
