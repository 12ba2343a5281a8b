import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { signIn as apiSignIn } from '../support/test-runtime'
import { acct, insertFinishedRun, planFixture } from '../api/plans-fixtures'
import { fixtureSummary } from '../unit/plans-fixtures'

const LAPTOP = { width: 1366, height: 900 }



describe('response plans in the browser', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let fx: Awaited<ReturnType<typeof planFixture>>

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    fx = await planFixture(server.rt)
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })


  it('an officer generates, edits and publishes; the lab manager opens the plan and acknowledges it', async () => {
    // Officer: generate from the result, fill the assembly point, publish.
    const ctx1 = await browser.newContext({ viewport: LAPTOP })
    const page = await ctx1.newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/plans/new`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await page.getByRole('heading', { name: 'Generate a response plan' }).waitFor()
    // The floors load on mount: reopen the menu until they are there
    // (another e2e file may have made its own "Level 1": pick this fixture's floor by its id-stamped name)
    const floorName = (await server.rt.ctx.db.selectFrom('floors').select('name').where('id', '=', fx.floorId).executeTakeFirstOrThrow()).name
    const option = page.getByRole('option', { name: new RegExp(floorName.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')) })
    await expect.poll(async () => {
      await page.keyboard.press('Escape')
      await page.getByTestId('plan-floor').click()
      return option.count()
    }).toBeGreaterThan(0)
    await option.click()
    await page.getByRole('checkbox', { name: /NH3 cylinder, normal ventilation/ }).click()
    await page.getByLabel('Title (optional)').fill('Ammonia cylinder <leak> plan')
    await shot(page, 'plans-new-1366')
    await page.setViewportSize({ width: 820, height: 1180 })
    await shot(page, 'plans-new-820')
    await page.setViewportSize(LAPTOP)
    await page.getByRole('button', { name: 'Generate the draft' }).click()
    await page.getByTestId('plan-title').waitFor()
    await expect.poll(() => page.getByTestId('plan-title').textContent()).toBe('Ammonia cylinder <leak> plan')
    await expect.poll(() => page.getByTestId('plan-predicted').textContent()).toContain('50 s')
    // A draft reminds the officer to review; the first alarm is one timeline row; the isolation figure is in words or time
    await page.getByTestId('plan-review-hint').waitFor()
    expect(await page.getByTestId('plan-timeline').getByText(/^Low \(warning\) alarm$/).count()).toBe(0)
    expect(await page.getByTestId('plan-predicted').textContent()).not.toMatch(/–/)
    await shot(page, 'plans-draft-officer-1366')
    await shot(page, 'plans-draft-officer-full', true)

    await page.getByRole('button', { name: 'Edit' }).click()
    await page.getByLabel('Assembly point').fill('Car park P3, north-west corner')
    await page.getByLabel('Person for Incident lead').fill('Tomasz Oyelaran')
    await shot(page, 'plans-editing-1366')
    await page.getByTestId('plan-save-sticky').click()
    await expect.poll(() => page.getByText('Assembly point: Car park P3').isVisible()).toBe(true)
    await page.getByRole('button', { name: 'Publish version 1' }).click()
    await page.getByRole('dialog').getByRole('button', { name: 'Publish' }).click()
    await expect.poll(() => page.getByTestId('plan-version').textContent()).toContain('published')
    const planId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(problems).toEqual([])
    await ctx1.close()

    // Lab manager: sees what waits, opens it, acknowledges.
    const ctx2 = await browser.newContext({ viewport: LAPTOP })
    const mp = await ctx2.newPage()
    const p2 = watch(mp)
    await mp.goto(`${server.url}/plans`)
    await signIn(mp, acct('lab_manager').email, acct('lab_manager').password)
    await mp.getByTestId('my-pending').waitFor()
    // Other browser tests may leave plans waiting for the same lab manager: at least this one and the earlier one.
    await expect.poll(async () => Number((await mp.getByTestId('ack-totals').textContent())?.match(/(\d+)\s*Lab-manager acknowledgments waiting/)?.[1] ?? 0)).toBeGreaterThanOrEqual(2)
    await shot(mp, 'plans-list-manager-1366')
    await mp.getByTestId('my-pending').getByRole('link', { name: 'Ammonia cylinder <leak> plan' }).click()
    await mp.getByTestId('ack-request').waitFor()
    await expect.poll(() => mp.getByRole('button', { name: 'Edit' }).count()).toBe(0)
    // Published: no review reminder for the lab manager
    expect(await mp.getByTestId('plan-review-hint').count()).toBe(0)
    expect(await mp.getByText('Review every section before publishing').count()).toBe(0)
    await shot(mp, 'plans-manager-open-1366')
    await mp.setViewportSize({ width: 820, height: 1180 })
    await shot(mp, 'plans-manager-open-820')
    await mp.getByTestId('plan-evacuation').scrollIntoViewIfNeeded()
    await shot(mp, 'plans-manager-evacuation-820')
    await mp.setViewportSize(LAPTOP)
    await mp.getByRole('button', { name: 'Acknowledge', exact: true }).click()
    await mp.getByLabel('Comment (optional)').fill('Briefed the thin-film team')
    await mp.getByTestId('plan-acks').scrollIntoViewIfNeeded()
    await shot(mp, 'plans-manager-ack-form-1366')
    await mp.getByRole('button', { name: 'Acknowledge version 1' }).click()
    await expect.poll(() => mp.getByTestId(`ack-state-${fx.managerId}`).textContent()).toBe('Acknowledged')
    await expect.poll(() => mp.getByTestId('plan-acks').textContent()).toContain('Briefed the thin-film team')
    await expect.poll(() => mp.getByTestId('ack-request').count()).toBe(0)
    await mp.getByTestId('plan-acks').scrollIntoViewIfNeeded()
    await shot(mp, 'plans-manager-acknowledged-1366')
    expect(p2).toEqual([])
    await ctx2.close()

    // The server has the record
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    const detail = (await officer.get(`/api/plans/${planId}`).expect(200)).body
    expect(detail.acknowledgments.map((a: { name: string; version: number }) => `${a.version}:${a.name}`)).toEqual([`1:${acct('lab_manager').name}`])
  })

  it('when a newer result finishes, the officer refreshes the published plan into the next draft and keeps the own text', async () => {
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    const created = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Refresh test plan' }).expect(201)).body
    const content = created.current.content
    content.evacuation.assemblyPoint = 'Loading dock, east gate'
    await officer.put(`/api/plans/${created.id}/draft`).send({ content }).expect(200)
    await officer.post(`/api/plans/${created.id}/publish`).send({ ackDueDays: 7 }).expect(200)
    const later = fixtureSummary({
      firstAlarm: { detectorId: 'det-a', level: 'low', timeS: 55 },
      receptors: fixtureSummary().receptors.map((r) => (r.id === 'det-a' ? { ...r, alarmLowS: 55, alarmHighS: 90 } : r)),
    })
    const newer = await insertFinishedRun(server.rt, { orgId: fx.orgId, floorId: fx.floorId, userId: fx.officerId, label: 'NH3 cylinder, exhaust upgraded', summary: later })

    const ctx = await browser.newContext({ viewport: LAPTOP })
    const page = await ctx.newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/plans/${created.id}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await page.getByTestId('plan-newer-results').waitFor()
    expect(await page.getByTestId('plan-newer-results').textContent()).toContain(`#${newer.id} NH3 cylinder, exhaust upgraded`)
    await shot(page, 'plans-newer-results-1366')
    await page.getByTestId('plan-newer-results').getByRole('button', { name: 'Refresh from results' }).click()
    const dialog = page.getByTestId('plan-refresh-dialog')
    await dialog.waitFor()
    // The newer result is offered in place of the plan's own
    expect(await dialog.getByRole('checkbox', { name: new RegExp(`#${newer.id} `) }).getAttribute('aria-checked')).toBe('true')
    expect(await dialog.getByRole('checkbox', { name: new RegExp(`#${fx.runId} `) }).getAttribute('aria-checked')).toBe('false')
    await shot(page, 'plans-refresh-dialog-1366')
    await dialog.getByTestId('plan-refresh-confirm').click()
    await expect.poll(() => page.getByTestId('plan-version').textContent()).toContain('Version 2')
    // Alarm heard at 55 + 30 s; room A still reaches IDLH at 120 s: 35 s left for egress (was 50 s)
    await expect.poll(() => page.getByTestId('plan-predicted').textContent()).toMatch(/55 s.*first detector alarm.*35 s/)
    expect(await page.getByText('Assembly point: Loading dock, east gate').isVisible()).toBe(true)
    await expect.poll(() => page.getByTestId('plan-newer-results').count()).toBe(0)
    await shot(page, 'plans-refreshed-1366')
    expect(problems).toEqual([])
    await ctx.close()
  })
})
