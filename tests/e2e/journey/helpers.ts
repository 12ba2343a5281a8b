import { mkdirSync } from 'node:fs'
import path from 'node:path'
import { expect } from 'vitest'
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core'
import { ARTIFACTS } from '../../support/browser'

export const LAPTOP = { width: 1366, height: 768 }
export const TABLET = { width: 820, height: 1180 }

export interface Actor {
  context: BrowserContext
  page: Page
  /** Page errors and console errors seen so far (the expected 401 of "who am I" while signed out excluded). */
  problems: string[]
}

/** A fresh browser context (no cookies) at laptop width that records page errors and console errors. */
export async function openActor(browser: Browser): Promise<Actor> {
  const context = await browser.newContext({ viewport: LAPTOP })
  const page = await context.newPage()
  const problems: string[] = []
  page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`))
  page.on('console', (m) => {
    if (m.type() === 'error' && !/401/.test(m.text())) problems.push(`console: ${m.text()} @ ${page.url()}`)
  })
  return { context, page, problems }
}

/** Fills the sign-in form that is on screen (the sign-in page, or a deep link's redirect to it). */
export async function signIn(page: Page, email: string, password: string) {
  await page.getByRole('heading', { name: 'Sign in' }).waitFor()
  await page.getByLabel('E-mail address').fill(email)
  await page.getByLabel('Password', { exact: true }).fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
}

/** Quasar's transitions (dialogs, notifications, menus) finished before the picture is taken. */
async function settle(page: Page) {
  await page.evaluate(() => document.fonts.ready.then(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)))))
}

/**
 * journey-<nn>-<step>.png at laptop width; with `tablet`, also journey-<nn>-<step>-820.png at tablet portrait
 * (the viewport is resized in place, so the page keeps its state, then put back).
 */
export async function shot(page: Page, name: string, opts: { tablet?: boolean; fullPage?: boolean; before?: (page: Page) => Promise<void> } = {}) {
  mkdirSync(ARTIFACTS, { recursive: true })
  const fullPage = opts.fullPage ?? true
  // A full-page picture taken while scrolled paints the fixed header mid-page.
  if (fullPage) await page.evaluate(() => window.scrollTo(0, 0))
  await settle(page)
  await page.screenshot({ path: path.join(ARTIFACTS, `journey-${name}.png`), fullPage, animations: 'disabled' })
  if (opts.tablet) {
    await page.setViewportSize(TABLET)
    // Let resize-driven layout (drawer, canvases measured with ResizeObserver) catch up before the picture.
    await page.waitForFunction(() => window.innerWidth === 820)
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))))
    if (opts.before) await opts.before(page)
    if (fullPage) await page.evaluate(() => window.scrollTo(0, 0))
    await settle(page)
    await page.screenshot({ path: path.join(ARTIFACTS, `journey-${name}-820.png`), fullPage, animations: 'disabled' })
    await page.setViewportSize(LAPTOP)
    await page.waitForFunction(() => window.innerWidth === 1366)
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))))
  }
}

/** Opens a Quasar select by its label and picks the option whose text matches. */
export async function pick(page: Page, scope: Page | Locator, label: string | RegExp, option: string | RegExp) {
  await scope.getByLabel(label).click()
  await page.getByRole('option', { name: option }).first().click()
}

/** Closes the option menu of a multiple select (it stays open after a pick). */
export async function closeMenu(page: Page) {
  await page.keyboard.press('Escape')
  await expect.poll(() => page.locator('.q-menu').count()).toBe(0)
}

/** The current text of a locator, '' when missing. */
export const textOf = async (l: Locator) => ((await l.count()) ? ((await l.first().textContent()) ?? '') : '')

/** The shown text of a Quasar field whose data-testid sits on its inner input (q-select puts it there). */
export const fieldText = (page: Page, testid: string) => textOf(page.getByTestId(testid).locator('xpath=ancestor::*[contains(concat(" ", @class, " "), " q-field ")][1]'))
