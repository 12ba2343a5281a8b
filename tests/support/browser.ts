import { mkdirSync } from 'node:fs'
import path from 'node:path'
import { chromium, type Browser, type Page } from 'playwright-core'

export const ARTIFACTS = path.resolve('tests/artifacts')

/** Debian's chromium, headless, with the flags this machine's closed network needs. */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'],
  })
}

/** A screenshot in tests/artifacts/, with transitions (dialogs, menus, drawer) finished, not caught half-way. */
export async function shot(page: Page, name: string, fullPage = false) {
  mkdirSync(ARTIFACTS, { recursive: true })
  await page.screenshot({ path: path.join(ARTIFACTS, `${name}.png`), animations: 'disabled', fullPage })
}

/** Fills and submits the sign-in form the page is showing. */
export async function signInThroughForm(page: Page, email: string, password: string) {
  await page.getByLabel('E-mail address').fill(email)
  await page.getByLabel('Password', { exact: true }).fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/**
 * Collects page errors and console errors, so a test can assert there were none. Expected refusals (401 while
 * signed out, 410 for a used link) are logged by the browser as failed resources and are let through.
 */
export function watchPageErrors(page: Page, expected = /401|410/): string[] {
  const problems: string[] = []
  page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`))
  page.on('console', (m) => { if (m.type() === 'error' && !expected.test(m.text())) problems.push(`console: ${m.text()}`) })
  return problems
}
