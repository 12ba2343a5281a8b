/** Header carrying the CSRF token on every state-changing request (double-submit, matched to a cookie). */
export const CSRF_HEADER = 'x-csrf-token'
export const CSRF_COOKIE = 'dw_csrf'
