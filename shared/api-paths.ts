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
  floorScenarios: (floorId: number) => `/api/floors/${floorId}/scenarios`,
  scenario: (id: number) => `/api/scenarios/${id}`,
  scenarioRuns: (id: number) => `/api/scenarios/${id}/runs`,
  runs: '/api/runs',
  floorRuns: (floorId: number) => `/api/floors/${floorId}/runs`,
  run: (id: number) => `/api/runs/${id}`,
  runFields: (id: number) => `/api/runs/${id}/fields`,
  runSeries: (id: number) => `/api/runs/${id}/series`,
  runCancel: (id: number) => `/api/runs/${id}/cancel`,
  runEgress: (id: number) => `/api/runs/${id}/egress`,
  floorSweeps: (floorId: number) => `/api/floors/${floorId}/sweeps`,
  sweep: (id: number) => `/api/sweeps/${id}`,
  floorAdvisor: (floorId: number) => `/api/floors/${floorId}/advisor`,
  floorAdvisorAccept: (floorId: number) => `/api/floors/${floorId}/advisor/accept`,
} as const

/** Header carrying the CSRF token on every state-changing request (double-submit, matched to a cookie). */
export const CSRF_HEADER = 'x-csrf-token'
export const CSRF_COOKIE = 'dw_csrf'
