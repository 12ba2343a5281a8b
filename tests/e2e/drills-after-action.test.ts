import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { utcToLocal } from '../../shared/drills/time'
import { drillClock } from '../../server/services/drill-notices.service'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { signIn as apiSignIn } from '../support/test-runtime'
import { acct, planFixture } from '../api/plans-fixtures'

const LAPTOP = { width: 1366, height: 768 }

// Issue 15.1: adding a finding, reloading or leaving never discards what was typed in the after-action record.
describe('after-action record keeps what was typed', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let drillId: number
  let siteName: string
  let officer: Awaited<ReturnType<typeof apiSignIn>>
  const realNow = drillClock.now

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const fx = await planFixture(server.rt)
    siteName = (await server.rt.ctx.db.selectFrom('sites').select('name').where('org_id', '=', fx.orgId).orderBy('id', 'desc').executeTakeFirstOrThrow()).name
    officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    const planId = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'After-action plan' }).expect(201)).body.id
    await officer.post(`/api/plans/${planId}/publish`).send({}).expect(200)
    const startsAt = new Date(Math.ceil((Date.now() + 2 * 86_400_000) / 60_000) * 60_000)
    const local = utcToLocal(startsAt, 'UTC')
    drillId = (await officer.post('/api/drills').send({
      planId, planVersion: 1, title: 'After-action drill', date: local.date, time: local.time, timeZone: 'UTC', durationMinutes: 30,
      location: 'Gas room A', scenario: 'Detector A alarms at a simulated leak.', officerId: fx.officerId, reminderMinutes: 60,
      participants: { groups: ['floor_staff'], userIds: [], guests: [] },
    }).expect(201)).body.id
    // The drill has been held: the server's clock is an hour past the start.
    drillClock.now = () => new Date(startsAt.getTime() + 3600_000)
  })
  afterAll(async () => {
    drillClock.now = realNow
    await browser?.close()
    await server?.close()
  })

  it('adding a finding keeps unsaved steps, times and observations; a reload restores them; leaving asks; the save stores them', async () => {
    const ctx = await browser.newContext({ viewport: LAPTOP })
    const page = await ctx.newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/drills/${drillId}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await page.getByTestId('drill-record').waitFor()

    await page.getByRole('checkbox', { name: 'Step 1 done' }).click()
    await page.getByLabel('Step 1 time in seconds').fill('12')
    await page.getByRole('checkbox', { name: 'Step 2 done' }).click()
    await page.getByLabel('Step 2 time in seconds').fill('48')
    await page.getByLabel('Alarm to evacuation complete').fill('70')
    await page.getByLabel('Observations (hot wash)').fill('Warden radio was flat; trolley at door A.')
    await expect.poll(() => page.getByTestId('drill-record-unsaved').textContent()).toMatch(/Not saved yet/)

    // Add a finding while the record is unsaved.
    await page.getByLabel('Finding', { exact: true }).fill('Radio batteries not checked')
    await page.getByLabel('Corrective action').fill('Weekly radio battery check')
    await page.getByLabel('Owner').click()
    await page.getByRole('option', { name: acct('lab_manager').name }).click()
    await page.getByLabel('Due date').fill('2027-02-01')
    await page.getByRole('button', { name: 'Add the finding' }).click()
    await expect.poll(() => page.getByTestId('drill-findings').textContent()).toContain('Weekly radio battery check')
    // The notice says the finding is stored and the checklist is not.
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Finding added\. Your checklist entries are kept but not saved yet/)
    // Nothing typed reverted.
    expect(await page.getByRole('checkbox', { name: 'Step 1 done' }).getAttribute('aria-checked')).toBe('true')
    expect(await page.getByLabel('Step 1 time in seconds').inputValue()).toBe('12')
    expect(await page.getByLabel('Step 2 time in seconds').inputValue()).toBe('48')
    expect(await page.getByLabel('Alarm to evacuation complete').inputValue()).toBe('70')
    expect(await page.getByLabel('Observations (hot wash)').inputValue()).toBe('Warden radio was flat; trolley at door A.')
    await page.getByTestId('drill-record').scrollIntoViewIfNeeded()
    await shot(page, 'drills-after-finding-unsaved-1366')

    // A reload brings the unsaved entries back, and says so; a half-typed finding survives too.
    await page.getByLabel('Finding', { exact: true }).fill('Half-typed second finding')
    await page.reload()
    await page.getByTestId('drill-record-restored').waitFor()
    expect(await page.getByLabel('Step 2 time in seconds').inputValue()).toBe('48')
    expect(await page.getByLabel('Observations (hot wash)').inputValue()).toBe('Warden radio was flat; trolley at door A.')
    expect(await page.getByLabel('Finding', { exact: true }).inputValue()).toBe('Half-typed second finding')
    await page.getByTestId('drill-record-restored').scrollIntoViewIfNeeded()
    await shot(page, 'drills-record-restored-1366')

    // Leaving for another page asks first; staying keeps everything.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Drills' }).click()
    await page.getByRole('dialog').getByText('Leave without saving?').waitFor()
    await shot(page, 'drills-leave-asks-1366')
    await page.getByRole('button', { name: 'Stay and save' }).click()
    expect(new URL(page.url()).pathname).toBe(`/drills/${drillId}`)

    // The save stores exactly what was typed, and the notice counts what the server stored.
    await page.getByRole('button', { name: 'Save the record' }).click()
    await expect.poll(() => page.getByTestId('drill-status').textContent()).toBe('completed')
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/2 of \d+ steps done, 1 of 3 times measured, observations stored/)
    await expect.poll(() => page.getByTestId('drill-record-unsaved').textContent()).toMatch(/All entries saved/)
    const saved = (await officer.get(`/api/drills/${drillId}`).expect(200)).body
    expect(saved.record.steps.filter((s: { done: boolean }) => s.done).map((s: { atS: number }) => s.atS)).toEqual([12, 48])
    expect(saved.record.measured.alarmToEvacuatedS).toBe(70)
    expect(saved.record.observations).toBe('Warden radio was flat; trolley at door A.')
    expect(saved.findings).toHaveLength(1)
    // Saved: the restored note is gone after a reload, and the stored values show.
    await page.reload()
    await page.getByTestId('drill-record').waitFor()
    expect(await page.getByTestId('drill-record-restored').count()).toBe(0)
    expect(await page.getByLabel('Step 2 time in seconds').inputValue()).toBe('48')
    expect(problems).toEqual([])
    await ctx.close()
  })

  // Issue 15.8: one floor drilled does not make the site "On schedule" while its other floor never was.
  it('the site card counts the floors never drilled instead of saying "On schedule"', async () => {
    const ctx = await browser.newContext({ viewport: LAPTOP })
    const page = await ctx.newPage()
    await page.goto(`${server.url}/drills`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    const card = page.getByTestId('drill-sites').locator('.q-card').filter({ hasText: siteName })
    await expect.poll(() => card.textContent()).toMatch(/1 of 2 floors never drilled/)
    expect(await card.textContent()).not.toContain('On schedule')
    expect(await card.textContent()).toMatch(/Level 2 [^:]*: never drilled/)
    await card.scrollIntoViewIfNeeded()
    await shot(page, 'drills-site-undrilled-1366')
    await ctx.close()
  })
})
