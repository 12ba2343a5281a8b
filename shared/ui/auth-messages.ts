/** Sign-in failure text that says what to do next; undefined means "use the server's message". */
export function signInFailureMessage(status: number, retryAfterSeconds?: number): string | undefined {
  if (status === 401) return 'That e-mail address and password do not match an active account. Check both and try again.'
  if (status === 429) {
    const wait = retryAfterSeconds ? `about ${Math.max(1, Math.ceil(retryAfterSeconds / 60))} minute${retryAfterSeconds > 60 ? 's' : ''}` : 'a few minutes'
    return `Too many sign-in attempts. Please wait ${wait} before trying again.`
  }
  return undefined
}

/** Text for an invitation or reset link the server refused (400 malformed, 410 used or expired). */
export function accountLinkFailureMessage(status: number, purpose: 'invite' | 'reset'): string | undefined {
  const what = purpose === 'invite' ? 'invitation' : 'password-reset link'
  if (status === 410) return `This ${what} has expired or has already been used.`
  if (status === 400) return `This ${what} is not valid. Check that you opened the whole link from the e-mail.`
  return undefined
}
