import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertFloor } from '../../server/repositories/floors.repo'
import { findUserByEmail } from '../../server/repositories/users.repo'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ensureDemoSite } from '../../server/seed/demo-floor'
import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { launchBrowser, shot, signInThroughForm, watchPageErrors } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { fixtureFloor } from '../unit/plans-fixtures'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

// Issue 15.3/15.4: impossible values are refused beside the field (never saved), implausible ones kept with a warning
// that says what is usual and why; switching to liquefied takes the gas's vapour pressure; a tiny room is pointed out.
describe('plausible ranges on the editor inputs', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let floorId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const db = server.rt.ctx.db
    const user = (await findUserByEmail(db, officer.email))!
    const siteId = await ensureDemoSite(db, user.org_id, 'Ranges building')
    const plan = fixtureFloor()
    // A compressed ammonia cylinder at 150 bar: switching it to liquefied must not keep 150 bar.
    Object.assign(plan.sources[0]!, { liquefied: false, pressurePa: 150e5 })
    // A 0.1 × 0.1 m room drawn by a slip of the mouse.
    plan.rooms.push({ id: 'speck', name: 'Speck', kind: 'lab', polygon: [[8, 8], [8.1, 8], [8.1, 8.1], [8, 8.1]], ventilation: { mode: 'ach', airChangesPerHour: 6 } })
    const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
    floorId = (await insertFloor(db, { orgId: user.org_id, siteId, name: 'Ranges floor', ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: user.id })).id
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  const stored = (page: Page) => page.evaluate(async (id) => (await (await fetch(`/api/floors/${id}`)).json()).plan, floorId)
  async function type(page: Page, testid: string, text: string) {
    await page.getByTestId(testid).fill(text)
    await page.getByTestId(testid).press('Enter')
  }
  const panelText = (page: Page) => page.getByTestId('property-panel').textContent()

  it('refuses 99 999 bar, 1e9 kg, 500 mm, 0 L and -3 m beside the field; warns at 400 bar; liquefied NH3 takes 7.6 bar', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    const problems = watchPageErrors(page)
    await page.goto(`${server.url}/floors/${floorId}`)
    await signInThroughForm(page, officer.email, officer.password)
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toBe('Ranges floor')
    await page.getByTestId('element-list').click()
    await page.getByTestId('element-cyl').click()
    await expect.poll(() => page.getByTestId('prop-pressure').inputValue()).toBe('150')

    for (const [testid, typed, reason] of [
      ['prop-pressure', '99999 bar', /At most 1000 bar\. Not saved/],
      ['prop-diameter', '500 mm', /At most 100 mm\. Not saved/],
      ['prop-water-volume', '0', /Must be more than zero\. Not saved/],
      ['prop-release-height', '-3', /Cannot be negative\. Not saved/],
    ] as const) {
      await type(page, testid, typed)
      await expect.poll(() => panelText(page)).toMatch(reason)
    }
    await page.getByLabel('Inventory').fill('1e9 kg')
    await page.getByLabel('Inventory').press('Enter')
    await expect.poll(() => panelText(page)).toMatch(/At most 100000 kg\. Not saved/)
    await shot(page, 'ui-ranges-refused')
    // Nothing refused reached the server: the stored cylinder keeps its values.
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state')).toBe('saved')
    const before = (await stored(page)).sources[0]
    expect(before).toMatchObject({ pressurePa: 150e5, releaseHeightM: 1, inventoryKg: 20 })
    expect(before.restriction.diameterM).toBeLessThanOrEqual(0.1)

    // 400 bar is possible but unusual: kept, with a warning saying what is usual and where that comes from.
    await type(page, 'prop-pressure', '400 bar')
    await expect.poll(() => panelText(page)).toMatch(/Unusually high \(usually up to 310 bar: compressed-gas cylinders are filled to 150–300 bar/)
    await expect.poll(async () => (await stored(page)).sources[0].pressurePa).toBe(400e5)
    await shot(page, 'ui-ranges-warning')

    // Liquefied ammonia cannot sit at 400 bar: switching takes its vapour pressure and says so.
    await page.getByTestId('property-panel').getByText('Liquefied gas').click()
    await expect.poll(() => page.getByTestId('prop-pressure').inputValue()).toBe('7.6')
    await expect.poll(() => page.getByTestId('pressure-note').textContent()).toMatch(/NH3's vapour pressure, 7\.6 bar gauge at 20 °C/)
    await expect.poll(async () => (await stored(page)).sources[0]).toMatchObject({ liquefied: true, pressurePa: 7.6e5 })
    await shot(page, 'ui-ranges-liquefied')

    // The 0.1 × 0.1 m room: its area reads 0.01 m² and the panel points out the slip.
    await page.getByTestId('element-speck').click()
    await expect.poll(() => page.getByTestId('room-too-small').textContent()).toMatch(/only 0\.01 m²/)
    await shot(page, 'ui-ranges-tiny-room')
    expect(problems).toEqual([])
  })
})
