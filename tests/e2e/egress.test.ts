import { mkdirSync } from 'node:fs'
import path from 'node:path'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ARTIFACTS, launchBrowser } from '../support/browser'
import { signIn } from '../support/test-runtime'
import { startTestServer } from '../support/test-server'
import { shortcutFloorRun } from '../api/egress-fixtures'
import { demoFloorAndScenario } from '../api/runs-fixtures'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

/**
 * The ways out drawn on the results page and the plan page (issue 13, items 4–6), on a real run where the short way
 * out of office A crosses the gas room: A's route goes by the corridor, the gas room says "No safe route", the dose
 * along each way is in words, and the reduced-mobility speed and the discovery time change the answer.
 */
describe('ways out on the results and plan pages', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
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
  async function shot(page: Page, name: string) {
    mkdirSync(ARTIFACTS, { recursive: true })
    await page.getByTestId('egress-panel').screenshot({ path: path.join(ARTIFACTS, `${name}.png`), animations: 'disabled' })
  }
  const rowText = (page: Page, key: string) => page.getByTestId(`egress-row-${key}`).innerText()

  it('draws the routes with exits and the assembly point, says "No safe route" for the gas room, and follows the stated assumptions', async () => {
    const { orgId } = await demoFloorAndScenario(server.rt)
    const api = await signIn(server.rt, officer.email, officer.password)
    const { floorId, run } = await shortcutFloorRun(server.rt, api, orgId)

    const { page, errors } = await signedIn(1366, 900)
    await page.goto(`${server.url}/runs/${run.id}`)
    await page.getByTestId('egress-panel').waitFor({ timeout: 30_000 })
    await page.getByTestId('egress-table').waitFor({ timeout: 30_000 })
    const figure = page.getByTestId('egress-figure')
    // Safe routes drawn (a halo and a line each: Office A, Desk A, Corridor C), exits by kind, the assembly point.
    await expect.poll(() => figure.locator('path').count()).toBe(6)
    const svgText = await figure.innerText()
    expect(svgText).toContain('EXIT · stair')
    expect(svgText).toContain('EXIT · outdoors')
    expect(svgText).toContain('Car park')
    expect(svgText).toContain('No safe route')

    const a = await rowText(page, 'A|')
    expect(a).toMatch(/Safe way out: 25 s on foot from 2 min/)
    expect(a).toContain('A–C door, then Stair door (Exit to a stair) via Corridor C')
    expect(a).toMatch(/Peak met on the way: [\d.,]+ ppm/)
    expect(a).toMatch(/Dose along the walk: [\d.,]+ ppm·s/)
    expect(a).toMatch(/A shorter route via Gas room S crosses IDLH/)
    const s = await rowText(page, 'S|')
    expect(s).toContain('No safe route under these conditions')
    expect(await page.getByTestId('egress-no-safe').innerText()).toMatch(/No safe route under these conditions from Gas room S/)
    expect(await page.getByTestId('egress-basis').innerText()).toMatch(/assumed at 2 min \(Driftwarden default/)
    await shot(page, 'egress-results-1366')

    // Reduced mobility: 0.6 m/s instead of 1.2 m/s, the same way out takes twice as long (25 s → about 50 s).
    await page.getByTestId('egress-mobility').getByText('Reduced mobility 0.6 m/s').click()
    await expect.poll(() => page.getByTestId('egress-basis').innerText()).toMatch(/0\.6 m\/s, a reduced-mobility walking speed/)
    await expect.poll(() => rowText(page, 'A|')).toMatch(/Safe way out: 5\d s on foot from 2 min/)

    // The officer's discovery time for a floor without an alarm.
    await page.getByTestId('egress-discovery').fill('60')
    await expect.poll(() => page.getByTestId('egress-basis').innerText()).toMatch(/assumed at 1 min \(set by the officer\)/)
    await expect.poll(() => rowText(page, 'A|')).toMatch(/from 1 min/)

    // One route picked: only it is drawn.
    await page.getByTestId('egress-row-A|').getByRole('link').click()
    await expect.poll(() => figure.locator('path').count()).toBe(2)

    // The plan page draws the same routes under its Evacuation section.
    const plan = (await api.post('/api/plans').send({ floorId, runIds: [run.id] }).expect(201)).body
    await page.goto(`${server.url}/plans/${plan.id}`)
    await page.getByTestId('egress-panel').waitFor({ timeout: 30_000 })
    await expect.poll(() => page.getByTestId('egress-figure').locator('path').count()).toBe(6)
    expect(await rowText(page, 'S|')).toContain('No safe route under these conditions')
    expect(await page.getByTestId('egress-panel').innerText()).toContain('not live guidance during an incident')
    await shot(page, 'egress-plan-1366')
    expect(errors).toEqual([])
  }, 240_000)
})
