import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertFloor } from '../../server/repositories/floors.repo'
import { findUserByEmail } from '../../server/repositories/users.repo'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ensureDemoSite } from '../../server/seed/demo-floor'
import { emptyPlan } from '../../shared/floorplan/plan-schema'
import { launchBrowser, shot, signInThroughForm, watchPageErrors } from '../support/browser'
import { startTestServer } from '../support/test-server'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

// Issue 15.2: in the floor dialog the value in the box is what is saved, or Save is refused with the reason beside it.
describe('floor dialog numeric fields', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let siteId: number
  let floorId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const db = server.rt.ctx.db
    const user = (await findUserByEmail(db, officer.email))!
    siteId = await ensureDemoSite(db, user.org_id, 'Dialog test building')
    floorId = (await insertFloor(db, { orgId: user.org_id, siteId, name: 'Settings floor', ceilingHeightM: 3, plan: emptyPlan(), planValid: false, problems: [], userId: user.id })).id
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  async function signedIn(path: string): Promise<{ page: Page; problems: string[] }> {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    const problems = watchPageErrors(page)
    await page.goto(`${server.url}${path}`)
    await signInThroughForm(page, officer.email, officer.password)
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
    return { page, problems }
  }
  const floorsNamed = async (page: Page, name: string) =>
    page.evaluate(async (n) => ((await (await fetch('/api/floors')).json()).floors as { name: string; ceilingHeightM: number }[]).filter((f) => f.name === n), name)

  it('Add a floor: refuses -2, "abc" and "3,2" beside the field; saves 12 ft typed without Tab as 3.658 m', async () => {
    const { page, problems } = await signedIn('/floors')
    await page.getByTestId(`add-floor-${siteId}`).click()
    const dialog = page.getByTestId('floor-form')
    await page.getByTestId('floor-name').fill('Level minus')
    const ceiling = dialog.getByTestId('floor-ceiling')

    for (const [typed, reason] of [['-2', /At least 1\.8 m\. Not saved/], ['abc', /Cannot read “abc”.*Not saved/], ['3,2', /decimal point/]] as const) {
      await ceiling.fill(typed)
      await page.getByTestId('floor-form-submit').click()
      // Refused: the dialog stays open, the reason is beside the field, nothing was created.
      await expect.poll(() => dialog.textContent()).toMatch(reason)
      expect(await dialog.isVisible()).toBe(true)
      expect(await ceiling.inputValue()).toBe(typed)
    }
    await shot(page, 'ui-floor-dialog-refused')
    expect(await floorsNamed(page, 'Level minus')).toEqual([])

    // A value in another unit, Save pressed straight after typing: what is in the box is what is stored.
    await ceiling.fill('12 ft')
    await page.getByTestId('floor-form-submit').click()
    await page.waitForURL(/\/floors\/\d+$/)
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Floor “Level minus” added with a 3\.658 m ceiling/)
    const [created] = await floorsNamed(page, 'Level minus')
    expect(created!.ceilingHeightM).toBeCloseTo(3.6576, 4)
    expect(problems).toEqual([])
  })

  it('Floor settings: a typed ceiling saved with Save (no Tab) is stored and confirmed; an implausible one warns', async () => {
    const { page, problems } = await signedIn(`/floors/${floorId}`)
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toBe('Settings floor')
    await page.getByRole('button', { name: 'Floor settings' }).click()
    const ceiling = page.getByTestId('floor-ceiling')
    await ceiling.fill('12')
    // Outside the usual range: kept, with a warning saying what is usual.
    await ceiling.press('Enter')
    await expect.poll(() => page.getByTestId('floor-form').textContent()).toMatch(/Unusually high \(usually up to 8 m/)
    await shot(page, 'ui-floor-settings-warning')
    await ceiling.fill('4.5')
    await page.getByTestId('floor-form-submit').click()
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Floor settings saved: “Settings floor”, ceiling 4\.5 m/)
    const saved = await page.evaluate(async (id) => (await (await fetch(`/api/floors/${id}`)).json()).ceilingHeightM, floorId)
    expect(saved).toBe(4.5)
    await shot(page, 'ui-floor-settings-saved')
    expect(problems).toEqual([])
  })
})
