import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { signIn as apiSignIn } from '../support/test-runtime'
import { acct, planFixture } from '../api/plans-fixtures'

// Issue 15.7: a contact e-mail that is not one is refused beside the field and never saved into the plan;
// the lab-manager picker offers lab managers only.
describe('mail addresses and pickers', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let fx: Awaited<ReturnType<typeof planFixture>>
  let planId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    fx = await planFixture(server.rt)
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    planId = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Contacts plan' }).expect(201)).body.id
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('"not-an-email" is marked beside the field and the save is refused; the picker lists lab managers only', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/plans/${planId}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await page.getByRole('button', { name: 'Edit' }).click()
    const email = page.getByLabel(/^E-mail for /).first()
    await email.fill('not-an-email')
    await expect.poll(() => page.getByTestId('plan-people').textContent()).toMatch(/“not-an-email” is not an e-mail address/)
    await page.getByTestId('plan-save-sticky').click()
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Not saved\. E-mail for .*“not-an-email” is not an e-mail address/)
    await email.scrollIntoViewIfNeeded()
    await shot(page, 'ui-mail-bad-contact')
    const stored = await page.evaluate(async (id) => (await (await fetch(`/api/plans/${id}`)).json()).current.content.roles.map((r: { email: string }) => r.email), planId)
    expect(stored).not.toContain('not-an-email')
    // A real address saves.
    await email.fill('warden@calder-ridge.example')
    await page.getByTestId('plan-save-sticky').click()
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Draft of version \d+ saved/)

    // The floor's lab-manager picker: lab managers, not officers or admins.
    await page.goto(`${server.url}/floors/${fx.floorId}`)
    await page.getByRole('button', { name: 'Floor settings' }).click()
    await page.getByLabel('Responsible lab managers').click()
    const names = await page.getByRole('option').allTextContents()
    expect(names.join('|')).toContain(acct('lab_manager').name)
    expect(names.join('|')).not.toContain(acct('ehs_officer').name)
    expect(names.join('|')).not.toContain(acct('admin').name)
    await shot(page, 'ui-mail-manager-picker')
    expect(problems).toEqual([])
  })
})
