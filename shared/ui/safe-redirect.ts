/**
 * The in-app path to return to after signing in, or `fallback`. Only same-origin absolute paths pass,
 * so a crafted `?redirect=//evil.example` or `https://…` cannot send people off-site.
 */
export function safeRedirectPath(candidate: unknown, fallback = '/'): string {
  if (typeof candidate !== 'string') return fallback
  if (!candidate.startsWith('/') || candidate.startsWith('//') || candidate.startsWith('/\\')) return fallback
  return candidate
}
