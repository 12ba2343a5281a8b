import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { insertFloor, replaceFloorMembers } from '../../server/repositories/floors.repo'
import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { utcToLocal } from '../../shared/drills/time'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { signIn as apiSignIn } from '../support/test-runtime'
import { acct, planFixture } from '../api/plans-fixtures'
import { fixtureFloor } from '../unit/plans-fixtures'

const LAPTOP = { width: 1366, height: 768 }
const RAW_NAMES = /ownerId|dueDate|planVersion|releaseHeightM|mountingHeightM|constantRateM3S|plan\.|sources\.\d|Too big|expected number/

// Issue 15.3: every error names the field as the screen labels it, in the unit the form uses, and all of them at once.
describe('error messages in the words of the screen', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let drillId: number
  let badFloorId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const fx = await planFixture(server.rt)
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    const planId = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Messages plan' }).expect(201)).body.id
    await officer.post(`/api/plans/${planId}/publish`).send({}).expect(200)
    const local = utcToLocal(new Date(Date.now() + 3 * 86_400_000), 'UTC')
    drillId = (await officer.post('/api/drills').send({
      planId, planVersion: 1, title: 'Messages drill', date: local.date, time: local.time, timeZone: 'UTC', durationMinutes: 30,
      location: 'Gas room A', scenario: 'Detector A alarms.', officerId: fx.officerId, reminderMinutes: 60, participants: { groups: ['floor_staff'], userIds: [], guests: [] },
    }).expect(201)).body.id
    // A floor with two problems: the cylinder's release height and the detector's mounting height are above the 3 m ceiling.
    const plan = fixtureFloor()
    plan.sources[0]!.releaseHeightM = 3.4
    plan.detectors[0]!.mountingHeightM = 3.6
    const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
    const site = (await server.rt.ctx.db.selectFrom('floors').select('site_id').where('id', '=', fx.floorId).executeTakeFirstOrThrow()).site_id
    badFloorId = (await insertFloor(server.rt.ctx.db, { orgId: fx.orgId, siteId: site, name: 'Two problems floor', ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: null })).id
    await replaceFloorMembers(server.rt.ctx.db, badFloorId, 'manager', [fx.managerId])
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  async function officerPage(path: string): Promise<{ page: Page; problems: string[] }> {
    const page = await (await browser.newContext({ viewport: LAPTOP })).newPage()
    const problems = watch(page, /401|400/)
    await page.goto(`${server.url}${path}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    return { page, problems }
  }
  const lastNotice = (page: Page) => page.locator('.q-notification').last().textContent()

  it('a finding without owner and due date names "Owner" and "Due date"; moving into the past names "Date" beside it', async () => {
    const { page, problems } = await officerPage(`/drills/${drillId}`)
    await page.getByTestId('drill-findings').waitFor()
    await page.getByLabel('Finding', { exact: true }).fill('Alarm not heard in Lab B')
    await page.getByLabel('Corrective action').fill('Add a beacon')
    await page.getByRole('button', { name: 'Add the finding' }).click()
    await expect.poll(() => lastNotice(page)).toMatch(/Not saved\. Owner: Choose who owns the corrective action · Due date: Pick the date it is due/)
    expect(await lastNotice(page)).not.toMatch(RAW_NAMES)
    await page.getByTestId('drill-findings').scrollIntoViewIfNeeded()
    await shot(page, 'ui-messages-finding')

    await page.getByRole('button', { name: 'Move' }).click()
    await page.getByLabel('Date', { exact: true }).fill('2020-01-06')
    await page.getByRole('button', { name: 'Move and notify' }).click()
    await expect.poll(() => lastNotice(page)).toMatch(/Not saved\. Date: The drill must be in the future/)
    await expect.poll(() => page.getByRole('dialog').textContent()).toContain('The drill must be in the future')
    await shot(page, 'ui-messages-move')
    expect(problems).toEqual([])
  })

  it('a scenario on a floor with two problems names both, as the editor labels them; a flow limit is in L/min', async () => {
    const { page, problems } = await officerPage(`/scenarios?floor=${badFloorId}`)
    await page.getByRole('heading', { name: 'New scenario' }).waitFor()
    await page.getByLabel('Name', { exact: true }).fill('Valve leak')
    await page.getByLabel('Leaking source(s)').click()
    await page.getByRole('option', { name: /NH3 cylinder/ }).click()
    await page.keyboard.press('Escape')
    await page.getByText('Constant flow').click()
    await page.getByLabel('Flow, L/min (25 °C, 1 atm)').fill('700000')
    await page.getByRole('button', { name: 'Save scenario' }).click()
    await expect.poll(() => page.getByText('At most 600,000 L/min (10 m³/s)').count()).toBe(1)
    await page.getByLabel('Flow, L/min (25 °C, 1 atm)').fill('50')
    await page.getByRole('button', { name: 'Save scenario' }).click()
    const error = page.getByTestId('scenario-form-error')
    await expect.poll(() => error.textContent()).toMatch(/release height of source “NH3 cylinder” is above the ceiling \(3 m\)/)
    expect(await error.textContent()).toMatch(/mounting height of detector “Detector A” is above the ceiling \(3 m\)/)
    expect(await error.textContent()).not.toMatch(RAW_NAMES)
    await shot(page, 'ui-messages-scenario')
    expect(problems).toEqual([])
  })
})
