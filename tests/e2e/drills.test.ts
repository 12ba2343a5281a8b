import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { linkFrom, signIn as apiSignIn, waitForMail } from '../support/test-runtime'
import { acct, planFixture } from '../api/plans-fixtures'
import { drillClock } from '../../server/services/drill-notices.service'

const LAPTOP = { width: 1366, height: 900 }


describe('drills in the browser', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let planId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const fx = await planFixture(server.rt)
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    planId = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Ammonia cylinder plan' }).expect(201)).body.id
    await officer.post(`/api/plans/${planId}/publish`).send({}).expect(200)
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('an officer schedules a drill and a staff member confirms receipt from the e-mail link, without signing in', async () => {
    const ctx1 = await browser.newContext({ viewport: LAPTOP, timezoneId: 'Europe/Berlin' })
    const page = await ctx1.newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/plans/${planId}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await page.getByRole('link', { name: 'Schedule a drill' }).click()
    await page.getByRole('heading', { name: 'Schedule a drill' }).waitFor()
    await expect.poll(() => page.getByLabel('Title').inputValue()).toBe('Ammonia cylinder plan')
    await page.getByLabel('Title').fill('Quarterly NH3 drill <gas room A>')
    await page.getByLabel('Time', { exact: true }).fill('09:30')
    await page.getByLabel('Scenario to enact').fill('Detector A alarms low at a simulated ammonia leak in gas room A; the warden runs the evacuation.')
    await shot(page, 'drills-schedule-1366')
    await page.setViewportSize({ width: 820, height: 1180 })
    // The time stays readable at tablet width
    expect((await page.getByLabel('Time', { exact: true }).boundingBox())!.width).toBeGreaterThan(120)
    await shot(page, 'drills-schedule-820')
    await page.setViewportSize(LAPTOP)
    await page.getByRole('button', { name: 'Schedule and send invitations' }).click()
    await page.getByTestId('drill-title').waitFor()
    await expect.poll(() => page.getByTestId('drill-title').textContent()).toBe('Quarterly NH3 drill <gas room A>')
    await expect.poll(() => page.getByTestId('drill-roster').textContent()).toContain(acct('staff').name)
    await expect.poll(async () => (await page.getByText(/09:30 \(Europe\/Berlin\)/).count()) > 0).toBe(true)
    await shot(page, 'drills-detail-officer-1366')

    // The staff member's invitation, over SMTP, with the receipt link
    const mail = await waitForMail(server.rt.ctx.db, acct('staff').email, /^Drill invitation: Quarterly NH3 drill/)
    const link = linkFrom(mail.text_body, '/drills/confirm?token=')
    expect(new URL(link).origin).toBe(server.url)

    const ctx2 = await browser.newContext({ viewport: { width: 820, height: 900 } })
    const sp = await ctx2.newPage()
    const p2 = watch(sp)
    await sp.goto(link)
    await expect.poll(() => sp.getByTestId('confirm-title').textContent()).toBe('Quarterly NH3 drill <gas room A>')
    await shot(sp, 'drills-confirm-page-820')
    await sp.getByRole('button', { name: 'Confirm I received this notice' }).click()
    await sp.getByTestId('confirm-done').waitFor()
    await shot(sp, 'drills-confirm-done-820')
    // The link works once
    await sp.goto(link)
    await expect.poll(() => sp.getByTestId('confirm-problem').textContent()).toMatch(/already been used/)
    await shot(sp, 'drills-confirm-used-820')
    expect(p2).toEqual([])
    await ctx2.close()

    await page.reload()
    await expect.poll(() => page.getByTestId('drill-roster').textContent()).toMatch(/Confirmed/)
    await page.getByTestId('drill-roster').scrollIntoViewIfNeeded()
    await shot(page, 'drills-roster-confirmed-1366')

    // After the drill: record the measured times and a finding (the server's drill clock moves past the start)
    const drillId = Number(new URL(page.url()).pathname.split('/').pop())
    const detail = (await (await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)).get(`/api/drills/${drillId}`).expect(200)).body
    // Before the start the record cannot be completed: the form says so and only saves progress
    await page.getByTestId('drill-not-started').waitFor()
    expect(await page.getByRole('button', { name: 'Save the record' }).isDisabled()).toBe(true)
    await page.getByTestId('drill-record').scrollIntoViewIfNeeded()
    await shot(page, 'drills-record-before-start-1366')
    await page.setViewportSize({ width: 820, height: 1180 })
    await page.getByTestId('drill-record').scrollIntoViewIfNeeded()
    await shot(page, 'drills-record-before-start-820')
    await page.setViewportSize(LAPTOP)
    expect(await page.getByTestId('drill-roster').textContent()).toMatch(/as floor staff|by name/)
    expect(await page.getByText(/calendar sequence/).count()).toBe(0)
    const realNow = drillClock.now
    drillClock.now = () => new Date(new Date(detail.startsAt).getTime() + 3600_000)
    await page.clock.setSystemTime(new Date(new Date(detail.startsAt).getTime() + 3600_000))
    await page.reload()
    await page.getByTestId('drill-record').waitFor()
    try {
      await page.getByRole('checkbox', { name: 'Step 1 done' }).click()
      await page.getByLabel('Step 1 time in seconds').fill('0')
      await page.getByRole('checkbox', { name: 'Step 2 done' }).click()
      await page.getByLabel('Step 2 time in seconds').fill('65')
      await expect.poll(() => page.getByTestId('step-verdict-2').textContent()).toMatch(/Slower than predicted\s*1 min 5 s against 50 s/)
      await page.getByLabel('Alarm to evacuation complete').fill('65')
      await page.getByLabel('Alarm to source isolated').fill('25')
      await page.getByLabel('Observations (hot wash)').fill('Door A approach blocked by a trolley.')
      await page.getByRole('button', { name: 'Save the record' }).click()
      await expect.poll(() => page.getByTestId('drill-status').textContent()).toBe('completed')
      await expect.poll(() => page.getByTestId('drill-comparison').textContent()).toMatch(/\+15 s\s*Slower than predicted/)
      await page.getByLabel('Finding', { exact: true }).fill('Evacuation of gas room A 15 s slower than predicted')
      await page.getByLabel('Corrective action').fill('Keep the Door A approach clear; weekly walk-through')
      await page.getByLabel('Owner').click()
      await page.getByRole('option', { name: acct('lab_manager').name }).click()
      await page.getByLabel('Due date').fill('2027-01-15')
      await page.getByRole('button', { name: 'Add the finding' }).click()
      await expect.poll(() => page.getByTestId('drill-findings').textContent()).toContain('weekly walk-through')
      await shot(page, 'drills-recorded-full', true)
      await page.setViewportSize({ width: 820, height: 1180 })
      await page.getByTestId('drill-record').scrollIntoViewIfNeeded()
      await shot(page, 'drills-recorded-record-820')
      await page.setViewportSize(LAPTOP)
    } finally {
      drillClock.now = realNow
    }
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Drills' }).click()
    await page.getByTestId('drills-upcoming').waitFor()
    await expect.poll(() => page.getByTestId('drills-history').textContent()).toContain('completed')
    await expect.poll(() => page.getByTestId('open-actions').textContent()).toContain('weekly walk-through')
    await shot(page, 'drills-list-officer-1366')
    expect(problems).toEqual([])
    await ctx1.close()

    // Staff see their own drill in the list
    const ctx3 = await browser.newContext({ viewport: LAPTOP })
    const st = await ctx3.newPage()
    await st.goto(`${server.url}/drills`)
    await signIn(st, acct('staff').email, acct('staff').password)
    await expect.poll(() => st.getByTestId('drills-history').textContent()).toContain('Quarterly NH3 drill <gas room A>')
    await shot(st, 'drills-list-staff-1366')
    await ctx3.close()
  })
})
