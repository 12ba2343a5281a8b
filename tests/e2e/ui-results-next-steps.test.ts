import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { acct, planFixture } from '../api/plans-fixtures'

// Issue 15.5: a finished result leads on (make a plan from it, advisor, compare, back to the scenarios and the floor);
// the caution stays but takes one line after the first view, so the page starts higher up at 1366 × 768.
describe('results page next steps', () => {
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

  it('offers the next steps, makes a plan from the result with it ticked, and shrinks the caution after the first view', async () => {
    const ctx = await browser.newContext({ viewport: { width: 1366, height: 768 } })
    const page = await ctx.newPage()
    const problems = watch(page, /401|409/)
    await page.goto(`${server.url}/runs/${fx.runId}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    const next = page.getByTestId('result-next-steps')
    await next.waitFor()
    await expect.poll(() => next.textContent()).toMatch(/Make a response plan from this result[\s\S]*Detector advisor[\s\S]*Compare with other runs[\s\S]*Back to the scenarios[\s\S]*Back to the floor Level 1/)
    const firstBanner = (await page.getByTestId('caution-banner').boundingBox())!.height
    await shot(page, 'ui-results-first-view')

    // Second view: the caution is one line, and the next steps sit in the first screen.
    await page.reload()
    await next.waitFor()
    const slimBanner = (await page.getByTestId('caution-banner').boundingBox())!.height
    expect(slimBanner).toBeLessThan(firstBanner * 0.7)
    expect(await page.getByTestId('caution-banner').textContent()).toMatch(/Screening estimate[\s\S]*Read the full caution/)
    expect((await next.boundingBox())!.y).toBeLessThan(300)
    await shot(page, 'ui-results-second-view')

    // Back to the floor, and back again: the links go where they say.
    await next.getByTestId('next-floor').click()
    await page.waitForURL(new RegExp(`/floors/${fx.floorId}$`))
    await page.goBack()
    await next.waitFor()

    // Make a plan: the new-plan page opens on this floor with this result ticked; generating says what it did.
    await next.getByTestId('next-make-plan').click()
    await page.waitForURL(/\/plans\/new/)
    await expect.poll(() => page.getByTestId('plan-run-choices').locator('[aria-checked="true"]').count()).toBe(1)
    await page.getByRole('button', { name: 'Generate the draft' }).click()
    await page.waitForURL(/\/plans\/\d+$/)
    await expect.poll(() => page.locator('.q-notification').last().textContent()).toMatch(/Draft plan generated from 1 result/)
    await shot(page, 'ui-results-plan-made')

    // The result now also points at that plan.
    await page.goto(`${server.url}/runs/${fx.runId}`)
    await expect.poll(() => next.textContent()).toMatch(/Open plan “/)
    expect(problems).toEqual([])
    await ctx.close()
  })
})
