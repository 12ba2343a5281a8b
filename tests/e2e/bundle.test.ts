import { mkdirSync } from 'node:fs'
import path from 'node:path'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertFloor } from '../../server/repositories/floors.repo'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { ARTIFACTS, launchBrowser } from '../support/browser'
import { signIn } from '../support/test-runtime'
import { startTestServer } from '../support/test-server'
import { shortcutPlan } from '../api/egress-fixtures'
import { demoFloorAndScenario } from '../api/runs-fixtures'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

/** Issue 17, items 2 and 4: the per-scenario switch with its cost, and a result's times as nominal with the band and its driving case. */
describe('sensitivity bundles in the browser', () => {
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

  it('saves a scenario with the cases on by default, states their cost, and shows the band on the result', async () => {
    const { orgId } = await demoFloorAndScenario(server.rt)
    const db = server.rt.ctx.db
    const site = await db.selectFrom('sites').select('id').where('org_id', '=', orgId).orderBy('id').executeTakeFirstOrThrow()
    const plan = shortcutPlan()
    const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
    const floor = await insertFloor(db, { orgId, siteId: site.id, name: `Band floor ${Date.now()}`, ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: null })

    const context = await browser.newContext({ viewport: { width: 1366, height: 900 } })
    const page = await context.newPage()
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`))
    await page.goto(`${server.url}/sign-in`)
    await page.getByLabel('E-mail address').fill(officer.email)
    await page.getByLabel('Password', { exact: true }).fill(officer.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))

    await page.goto(`${server.url}/scenarios?floor=${floor.id}`)
    const sens = page.getByTestId('scenario-sensitivity')
    await sens.waitFor()
    expect(await page.getByTestId('sensitivity-cost').innerText()).toMatch(/up to 6 extra runs, about 7× the worker time of one run, run in parallel/)
    await page.getByTestId('sensitivity-enabled').click()
    expect(await page.getByTestId('sensitivity-cost').innerText()).toContain('One run only: results get no band')
    await page.getByTestId('sensitivity-enabled').click()

    await page.getByLabel('Name').fill('Band in the browser')
    await page.getByLabel('Leaking source(s)').click()
    await page.getByRole('option', { name: /NH3 cylinder/ }).click()
    await page.keyboard.press('Escape')
    const saved = page.waitForRequest((r) => r.method() === 'POST' && r.url().endsWith(`/api/floors/${floor.id}/scenarios`))
    await page.getByRole('button', { name: 'Save scenario' }).click()
    const body = (await saved).postDataJSON()
    expect(body.sensitivity).toEqual({ enabled: true, ventilationFailure: null, positions: true })

    const api = await signIn(server.rt, officer.email, officer.password)
    const sc = (await api.get(`/api/floors/${floor.id}/scenarios`).expect(200)).body.scenarios.find((s: { name: string }) => s.name === 'Band in the browser')
    await page.getByTestId(`run-scenario-${sc.id}`).click()
    await page.waitForURL(/\/runs\/\d+$/)
    const band = page.getByTestId('bundle-band')
    await band.waitFor({ timeout: 60_000 })
    // The cylinder is 1 m from the south wall: D ×0.3, ×3 and three positions.
    await expect.poll(() => page.getByTestId('bundle-cases').locator('.q-chip').count(), { timeout: 60_000 }).toBe(6)
    await expect.poll(() => page.getByTestId('bundle-cost').innerText(), { timeout: 90_000 }).toMatch(/^6 runs \(the nominal and 5 sensitivity cases\): [\d.]+ s of worker time against/)
    expect(await band.innerText()).toContain('Plans made from this result, and their drill targets, use its conservative end')
    const idlh = await page.getByTestId('band-room:S:idlh').innerText()
    expect(idlh).toMatch(/Gas room S\s+IDLH/)
    expect(idlh).toMatch(/(Nominal|Diffusivity|Leak 1 m)/)
    // The fronts over the cases: nominal, earliest and the band's width draw different maps.
    await page.getByTestId('bundle-show-fronts').click()
    const frontsMap = page.getByTestId('bundle-fronts').getByTestId('concentration-map')
    await frontsMap.waitFor()
    const pixels = () => frontsMap.evaluate((c) => (c as HTMLCanvasElement).toDataURL())
    await expect.poll(() => page.getByTestId('bundle-fronts').getByTestId('colour-legend').innerText()).toContain('Earliest over the cases')
    const earliest = await pixels()
    await page.getByTestId('bundle-front-view').getByText('Band width').click()
    await expect.poll(() => page.getByTestId('bundle-fronts').getByTestId('colour-legend').innerText()).toContain('Width of the band')
    await expect.poll(pixels).not.toBe(earliest)
    mkdirSync(ARTIFACTS, { recursive: true })
    await band.screenshot({ path: path.join(ARTIFACTS, 'bundle-band-1366.png') })
    expect(errors).toEqual([])
  }, 180_000)
})
