import { mkdirSync } from 'node:fs'
import path from 'node:path'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ARTIFACTS, launchBrowser } from '../support/browser'
import { signIn } from '../support/test-runtime'
import { startTestServer } from '../support/test-server'
import { fixtureFloor } from '../unit/plans-fixtures'
import { planFixture } from '../api/plans-fixtures'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!

/** Issue 17, item 6: a stale plan says so, with the reason, on its page, in the plans list and on the overview. */
describe('stale plans in the browser', () => {
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

  it('shows the out-of-date notice with its reason on the plan page, the plans list and the overview', async () => {
    const fx = await planFixture(server.rt)
    const api = await signIn(server.rt, officer.email, officer.password)
    const title = `Stale browser plan ${Date.now()}`
    const id = (await api.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title }).expect(201)).body.id
    await api.post(`/api/plans/${id}/publish`).send({}).expect(200)

    const context = await browser.newContext({ viewport: { width: 1366, height: 900 } })
    const page = await context.newPage()
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`))
    await page.goto(`${server.url}/sign-in`)
    await page.getByLabel('E-mail address').fill(officer.email)
    await page.getByLabel('Password', { exact: true }).fill(officer.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))

    // Up to date: no notice.
    await page.goto(`${server.url}/plans/${id}`)
    await page.getByTestId('plan-title').waitFor()
    expect(await page.getByTestId('plan-stale').count()).toBe(0)

    const floor = fixtureFloor()
    floor.rooms[1]!.ventilation = { mode: 'ach', airChangesPerHour: 4 }
    await api.put(`/api/floors/${fx.floorId}/plan`).send({ version: 1, plan: floor }).expect(200)
    const reason = "room Lab B's air changes changed from 6 to 4"

    await page.reload()
    const banner = page.getByTestId('plan-stale')
    await banner.waitFor()
    expect(await banner.innerText()).toMatch(/This plan is out of date since .*: what it is built on has changed/)
    expect(await banner.innerText()).toContain(`Floor plan changed: ${reason}`)
    await page.getByTestId('plan-bring-up-to-date').waitFor()
    mkdirSync(ARTIFACTS, { recursive: true })
    await page.screenshot({ path: path.join(ARTIFACTS, 'stale-plan-1366.png') })

    await page.goto(`${server.url}/plans`)
    const row = page.getByTestId('plan-table').locator('tr', { hasText: title })
    await expect.poll(() => row.getByTestId('plan-stale-badge').innerText()).toContain(`Out of date`)
    expect(await row.getByTestId('plan-stale-badge').innerText()).toContain(`Floor plan changed: ${reason}`)

    await page.goto(`${server.url}/`)
    const overview = page.getByTestId('overview-stale-plans')
    await overview.waitFor()
    const item = overview.locator('.q-item', { hasText: title })
    expect(await item.innerText()).toContain(`Floor plan changed: ${reason}`)
    await item.click()
    await page.waitForURL(new RegExp(`/plans/${id}$`))
    expect(errors).toEqual([])
  }, 120_000)
})
