import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { utcToLocal } from '../../shared/drills/time'
import { launchBrowser, shot, signInThroughForm as signIn } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { signIn as apiSignIn } from '../support/test-runtime'
import { acct, planFixture } from '../api/plans-fixtures'

/**
 * WCAG 2.1 contrast (relative luminance, (L1 + 0.05) / (L2 + 0.05)) of every visible chip, badge, link and button
 * label against the first opaque background behind it; 4.5:1 for text under 18.66 px bold / 24 px.
 * The formula is the W3C's (WCAG 2.1, "contrast ratio" and "relative luminance" definitions).
 */
async function lowContrast(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const rgb = (c: string) => (c.match(/[\d.]+/g) ?? []).map(Number)
    const lum = ([r, g, b]: number[]) => {
      const f = (v: number) => { const s = v / 255; return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4 }
      return 0.2126 * f(r!) + 0.7152 * f(g!) + 0.0722 * f(b!)
    }
    const bgOf = (el: Element | null): number[] => {
      for (let e = el; e; e = e.parentElement) {
        const c = rgb(getComputedStyle(e).backgroundColor)
        if (c.length === 3 || (c.length === 4 && c[3]! > 0.9)) return c.slice(0, 3)
      }
      return [255, 255, 255]
    }
    const out: string[] = []
    for (const el of document.querySelectorAll('.q-chip, .q-badge, a, .q-btn, .text-caption, td')) {
      const text = (el as HTMLElement).innerText?.trim()
      const box = el.getBoundingClientRect()
      if (!text || box.width === 0 || box.height === 0) continue
      const st = getComputedStyle(el)
      if (st.visibility === 'hidden' || Number(st.opacity) < 0.5 || el.closest('[aria-disabled="true"], .disabled')) continue
      const size = parseFloat(st.fontSize), bold = Number(st.fontWeight) >= 700
      const need = size >= 24 || (bold && size >= 18.66) ? 3 : 4.5
      const a = lum(rgb(st.color).slice(0, 3)), b = lum(bgOf(el))
      const ratio = (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05)
      if (ratio < need) out.push(`${text.slice(0, 40)} ${ratio.toFixed(2)}:1 (${st.color} on rgb(${bgOf(el).join(',')}))`)
    }
    return out
  })
}
/** Checkboxes, switches and form fields without an accessible name (aria-label, aria-labelledby or own text). */
async function unnamed(page: Page): Promise<string[]> {
  return page.evaluate(() => [...document.querySelectorAll('[role="checkbox"], [role="switch"], input:not([type="hidden"]), textarea')].filter((el) => {
    // Not rendered (Quasar's hidden native inputs behind role="checkbox"): not in the accessibility tree.
    if (el.getClientRects().length === 0 || getComputedStyle(el).display === 'none') return false
    const label = el.getAttribute('aria-label') || (el.getAttribute('aria-labelledby') ?? '').split(' ').map((id) => document.getElementById(id)?.textContent ?? '').join('').trim()
      || (el as HTMLElement).innerText?.trim() || (el.id && document.querySelector(`label[for="${el.id}"]`)?.textContent?.trim()) || el.closest('label')?.textContent?.trim()
    return !label
  }).map((el) => el.outerHTML.slice(0, 120)))
}

// Issue 15.10: contrast and names tested in the browser on the plan, drill and scenario pages.
describe('accessibility: contrast and names', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let planId: number
  let drillId: number
  let fx: Awaited<ReturnType<typeof planFixture>>

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    fx = await planFixture(server.rt)
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    planId = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Contrast plan' }).expect(201)).body.id
    await officer.post(`/api/plans/${planId}/publish`).send({}).expect(200)
    const local = utcToLocal(new Date(Date.now() + 3 * 86_400_000), 'UTC')
    drillId = (await officer.post('/api/drills').send({
      planId, planVersion: 1, title: 'Contrast drill', date: local.date, time: local.time, timeZone: 'UTC', durationMinutes: 30,
      location: 'Gas room A', scenario: 'Detector A alarms.', officerId: fx.officerId, reminderMinutes: 60, participants: { groups: ['floor_staff'], userIds: [], guests: [] },
    }).expect(201)).body.id
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('the plan, drill and scenario pages have no small text under 4.5:1 and no unnamed checkbox or field', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    await page.goto(`${server.url}/plans/${planId}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await page.getByTestId('plan-evacuation').waitFor()
    // "Leave at the high alarm" is dark ink on amber, not white.
    await expect.poll(() => page.getByTestId('alarm-level-chip').filter({ hasText: 'Leave at the high alarm' }).count()).toBeGreaterThan(0)
    await page.getByTestId('plan-evacuation').scrollIntoViewIfNeeded()
    await shot(page, 'ui-a11y-plan')
    const found: Record<string, string[]> = {}
    found.plan = [...await lowContrast(page), ...await unnamed(page)]
    await page.goto(`${server.url}/drills/${drillId}`)
    await page.getByTestId('drill-record').waitFor()
    found.drill = [...await lowContrast(page), ...await unnamed(page)]
    await page.goto(`${server.url}/scenarios?floor=${fx.floorId}`)
    await page.getByRole('heading', { name: 'New scenario' }).waitFor()
    found.scenarios = [...await lowContrast(page), ...await unnamed(page)]
    expect(found).toEqual({ plan: [], drill: [], scenarios: [] })
  })
})
