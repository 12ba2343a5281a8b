import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertFloor } from '../../server/repositories/floors.repo'
import { findUserByEmail } from '../../server/repositories/users.repo'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ensureDemoSite } from '../../server/seed/demo-floor'
import { emptyPlan } from '../../shared/floorplan/plan-schema'
import { launchBrowser, shot, signInThroughForm, watchPageErrors } from '../support/browser'
import { startTestServer } from '../support/test-server'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

// Issue 15.10: rooms and items can be added without a mouse, by typing a corner and a size or a position.
describe('drawing with the keyboard', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let floorId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const db = server.rt.ctx.db
    const user = (await findUserByEmail(db, officer.email))!
    const siteId = await ensureDemoSite(db, user.org_id, 'Keyboard building')
    floorId = (await insertFloor(db, { orgId: user.org_id, siteId, name: 'Keyboard floor', ceilingHeightM: 3, plan: emptyPlan(), planValid: false, problems: [], userId: user.id })).id
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('adds a 5 m × 4 m room and a detector inside it using only the keyboard; both are stored', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    const problems = watchPageErrors(page)
    await page.goto(`${server.url}/floors/${floorId}`)
    await signInThroughForm(page, officer.email, officer.password)
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toBe('Keyboard floor')
    // Reach the action with Tab and open it with Enter: no mouse.
    await page.getByTestId('add-by-keyboard-open').focus()
    await page.keyboard.press('Enter')
    await page.getByTestId('add-by-keyboard').waitFor()
    // Each box: select what is there, type, Tab on (Enter in a box reads it; the Add button takes Enter too).
    const typeIn = async (testid: string, text: string) => {
      await page.getByTestId(testid).focus()
      await page.keyboard.press('Control+A')
      await page.keyboard.type(text)
      await page.keyboard.press('Tab')
    }
    await typeIn('add-x', '1')
    await typeIn('add-y', '2')
    await typeIn('add-width', '5')
    await typeIn('add-depth', '13 ft 1.5 in')
    await page.getByTestId('add-submit').focus()
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Added: Room 1, 5 m × 4 m from \(1 m, 2 m\)/)
    await shot(page, 'ui-keyboard-room')

    await page.getByTestId('add-by-keyboard-open').focus()
    await page.keyboard.press('Enter')
    await page.getByTestId('add-kind').focus()
    await page.keyboard.press('Enter')
    await page.getByRole('option', { name: 'Detector' }).waitFor()
    for (let i = 0; i < 2; i++) await page.keyboard.press('ArrowDown')
    await page.keyboard.press('Enter')
    await expect.poll(() => page.getByTestId('add-by-keyboard').textContent()).toMatch(/Detector/)
    await typeIn('add-x', '3')
    await typeIn('add-y', '4')
    await page.getByTestId('add-submit').focus()
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Added: Detector at \(3 m, 4 m\)/)
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 15_000 }).toBe('saved')
    const plan = await page.evaluate(async (id) => (await (await fetch(`/api/floors/${id}`)).json()).plan, floorId)
    expect(plan.rooms).toHaveLength(1)
    // 13 ft 1.5 in = 157.5 in × 0.0254 m = 4.0005 m (exact inch definition).
    expect(plan.rooms[0].polygon).toEqual([[1, 2], [6, 2], [6, 6.0005], [1, 6.0005]])
    expect(plan.detectors[0].position).toEqual([3, 4])
    await shot(page, 'ui-keyboard-detector')
    expect(problems).toEqual([])
  })
})
