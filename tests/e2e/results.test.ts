import { mkdirSync } from 'node:fs'
import path from 'node:path'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ARTIFACTS, launchBrowser } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { demoFloorAndScenario } from '../api/runs-fixtures'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

async function shot(page: Page, name: string) {
  mkdirSync(ARTIFACTS, { recursive: true })
  await page.evaluate(() => window.scrollTo(0, 0))
  await page.screenshot({ path: path.join(ARTIFACTS, `${name}.png`), fullPage: true, animations: 'disabled' })
}

describe('results page', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let floorId: number
  let scenarioId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    ;({ floorId, scenarioId } = await demoFloorAndScenario(server.rt))
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  async function signedIn(width: number, height: number) {
    const context = await browser.newContext({ viewport: { width, height } })
    const page = await context.newPage()
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`))
    page.on('console', (m) => { if (m.type() === 'error' && !/401/.test(m.text())) errors.push(`console: ${m.text()}`) })
    await page.goto(`${server.url}/sign-in`)
    await page.getByLabel('E-mail address').fill(officer.email)
    await page.getByLabel('Password', { exact: true }).fill(officer.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
    return { page, errors }
  }
  const mapPixels = (page: Page) => page.getByTestId('concentration-map').evaluate((c) => (c as HTMLCanvasElement).toDataURL())

  it('runs the demo scenario, shows live progress, an animated map with isolines and charts with limit lines', async () => {
    const { page, errors } = await signedIn(1366, 768)
    await page.goto(`${server.url}/scenarios?floor=${floorId}`)
    await page.getByTestId(`run-scenario-${scenarioId}`).click()
    await page.waitForURL(/\/runs\/\d+$/)
    // The progress bar is there while the job is queued or running; it updates by polling.
    await page.getByTestId('run-progress').waitFor({ timeout: 10_000 })
    await shot(page, 'results-1366-progress')
    await page.getByTestId('concentration-map').waitFor({ timeout: 60_000 })
    await expect.poll(() => page.getByTestId('run-status').textContent()).toContain('succeeded')
    await page.getByTestId('caution-banner').waitFor()
    await shot(page, 'results-1366-map')

    // The map changes over time: move the slider to the start, then play.
    const slider = page.getByTestId('time-slider')
    await slider.focus()
    await page.keyboard.press('Home')
    const atStart = await mapPixels(page)
    const labelStart = await page.getByTestId('time-label').textContent()
    await page.getByTestId('play').click()
    await page.waitForTimeout(1500)
    await page.getByTestId('play').click()
    expect(await page.getByTestId('time-label').textContent()).not.toBe(labelStart)
    expect(await mapPixels(page)).not.toBe(atStart)
    await slider.focus()
    await page.keyboard.press('End')
    await shot(page, 'results-1366-end')

    // Charts for every detector and workstation, each with the gas's limit lines.
    const charts = page.getByTestId('receptor-chart')
    expect(await charts.count()).toBeGreaterThanOrEqual(4)
    const gasRoomChart = charts.filter({ has: page.locator('canvas') }).first()
    await gasRoomChart.waitFor()
    const lines = await charts.evaluateAll((els) => els.map((e) => e.getAttribute('data-limit-lines') ?? ''))
    expect(lines.some((l) => /REL \(TWA\)/.test(l))).toBe(true)
    await page.getByTestId('limit-table').scrollIntoViewIfNeeded()
    expect(await page.getByTestId('limit-table').textContent()).toMatch(/NH3 detector G-204/)
    expect(await page.getByTestId('assumptions').textContent()).toMatch(/Normal ventilation[\s\S]*Diffusivity/)
    await page.getByTestId('mass-balance').scrollIntoViewIfNeeded()
    await shot(page, 'results-1366-charts')

    // Front view for a chosen limit.
    await page.getByRole('button', { name: 'Front: first time over a limit' }).click()
    await page.getByTestId('front-limit').waitFor()
    await page.getByTestId('concentration-map').scrollIntoViewIfNeeded()
    await shot(page, 'results-1366-front')
    expect(errors).toEqual([])

    // Tablet portrait.
    const tablet = await signedIn(820, 1180)
    await tablet.page.goto(page.url())
    await tablet.page.getByTestId('concentration-map').waitFor({ timeout: 30_000 })
    await shot(tablet.page, 'results-820-map')
    expect(tablet.errors).toEqual([])
  })
})
