import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { acct, planFixture } from '../api/plans-fixtures'

// Issue 15.6: staff read their floor without editing tools; the overview promises nothing that is not there.
describe('staff views', () => {
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

  it('the view-only editor has no palette, import, undo/redo or handles; the overview has no "Coming soon"', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/`)
    await signIn(page, acct('staff').email, acct('staff').password)
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
    await expect.poll(() => page.getByText('Know your site plan').count()).toBe(1)
    expect(await page.getByText('Coming soon').count()).toBe(0)

    await page.goto(`${server.url}/floors/${fx.floorId}`)
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toMatch(/^Level 1/)
    await page.getByText('View only').waitFor()
    expect(await page.getByTestId('tool-room-rect').count()).toBe(0)
    expect(await page.getByRole('button', { name: 'Import' }).count()).toBe(0)
    expect(await page.getByTestId('undo').count()).toBe(0)
    expect(await page.getByTestId('redo').count()).toBe(0)
    // Selecting a room shows its facts, read-only, without drag handles on the canvas.
    await page.getByTestId('element-list').click()
    await page.getByTestId('element-A').click()
    await expect.poll(() => page.getByTestId('prop-name').inputValue()).toBe('Gas room A')
    const handles = await page.evaluate(() => {
      const w = window as unknown as { Konva?: { stages: { find: (s: string) => { attrs: { width?: number; height?: number } }[] }[] } }
      return (w.Konva?.stages ?? []).flatMap((st) => st.find('Rect')).filter((r) => r.attrs.width === 10 && r.attrs.height === 10).length
    })
    expect(handles).toBe(0)
    await shot(page, 'ui-staff-view-only-editor')
    expect(problems).toEqual([])
  })
})
