import { ensureCsrfCookie } from '../api/http'
import type { BootInstaller } from './types'

/** Fetches the CSRF cookie before the first form can be sent; a failure here surfaces later on that request. */
export const install: BootInstaller = async () => {
  await ensureCsrfCookie().catch(() => undefined)
}
