import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertFloor } from '../../server/repositories/floors.repo'
import { findUserByEmail } from '../../server/repositories/users.repo'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { ensureDemoSite, seedDemoFloor } from '../../server/seed/demo-floor'
import { emptyPlan } from '../../shared/floorplan/plan-schema'
import { launchBrowser, shot } from '../support/browser'
import { startTestServer } from '../support/test-server'

const officer = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!


describe('floor-plan editor', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let floorId: number
  let demoFloorId: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    const db = server.rt.ctx.db
    const user = (await findUserByEmail(db, officer.email))!
    const siteId = await ensureDemoSite(db, user.org_id, 'E2E test building')
    floorId = (await insertFloor(db, { orgId: user.org_id, siteId, name: 'Drawn in the browser', ceilingHeightM: 3, plan: emptyPlan(), planValid: false, problems: [], userId: user.id })).id
    const manager = (await findUserByEmail(db, DEMO_ACCOUNTS.find((a) => a.role === 'lab_manager')!.email))!
    demoFloorId = (await seedDemoFloor(db, { orgId: user.org_id, siteId, labManagerIds: [manager.id], staffIds: [] })).floorId
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  async function signedInPage(account = officer, viewport = { width: 1440, height: 860 }): Promise<{ page: Page; errors: string[] }> {
    const context = await browser.newContext({ viewport })
    const page = await context.newPage()
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`))
    page.on('console', (m) => { if (m.type() === 'error' && !/401/.test(m.text())) errors.push(`console: ${m.text()}`) })
    await page.goto(`${server.url}/sign-in`)
    await page.getByLabel('E-mail address').fill(account.email)
    await page.getByLabel('Password', { exact: true }).fill(account.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
    return { page, errors }
  }

  it('draws a room and a door with the mouse, places a source, and finds them after a reload', async () => {
    const { page, errors } = await signedInPage()
    await page.goto(`${server.url}/floors/${floorId}`)
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toBe('Drawn in the browser')
    const canvas = page.getByTestId('editor-canvas')
    const box = (await canvas.boundingBox())!
    const at = (x: number, y: number) => [box.x + x, box.y + y] as const

    // A room: drag a rectangle with the room tool.
    await page.getByTestId('tool-room-rect').click()
    await page.mouse.move(...at(160, 140))
    await page.mouse.down()
    await page.mouse.move(...at(300, 250), { steps: 5 })
    await page.mouse.move(...at(480, 380), { steps: 5 })
    await page.mouse.up()
    // A second room sharing the right wall: its corners snap onto the first room's corners.
    await page.mouse.move(...at(484, 143))
    await page.mouse.down()
    await page.mouse.move(...at(700, 300), { steps: 5 })
    await page.mouse.move(...at(720, 377), { steps: 5 })
    await page.mouse.up()

    // A door on the shared wall (press D, hover the wall, click).
    await canvas.focus()
    await page.keyboard.press('d')
    await page.mouse.move(...at(478, 260), { steps: 3 })
    await page.mouse.click(...at(481, 262))

    // A source in the first room, then choose its gas in the property panel.
    await page.getByTestId('tool-source').click()
    await page.mouse.click(...at(260, 300))
    // The first source gets N2 by default, and the property panel says so.
    await expect.poll(() => page.getByTestId('gas-default-note').textContent()).toContain('Gas: N2 (the default for a first source)')
    await page.getByTestId('prop-gas').click()
    await page.getByRole('option', { name: /^NH3/ }).click()

    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 15_000 }).toBe('saved')
    await shot(page, 'editor-drawn')

    await page.reload()
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toBe('Drawn in the browser')
    const saved = await page.evaluate(async (id) => (await fetch(`/api/floors/${id}`)).json(), floorId)
    expect(saved.plan.rooms).toHaveLength(2)
    expect(saved.plan.openings).toHaveLength(1)
    expect(saved.plan.sources).toHaveLength(1)
    expect(saved.plan.sources[0].gasId).toBe('NH3')
    // The rooms share a wall exactly and the door sits on it: no overlap, no door off a wall.
    expect(saved.problems.map((p: { code: string }) => p.code)).not.toContain('room_overlap')
    expect(saved.problems.map((p: { code: string }) => p.code)).not.toContain('opening_not_on_wall')
    const [a, b] = saved.plan.rooms
    expect(a.polygon[1][0]).toBe(b.polygon[0][0])
    // The editor shows them again: the floor summary counts them, and select-all picks all four.
    await expect.poll(() => page.getByTestId('property-panel').textContent()).toContain('2 rooms · 1 opening · 1 source')
    await page.getByTestId('editor-canvas').click({ position: { x: 5, y: 5 } })
    await page.keyboard.press('Control+a')
    await expect.poll(() => page.getByTestId('property-panel').textContent()).toContain('4 items selected')
    await shot(page, 'editor-reloaded')
    expect(errors).toEqual([])
  })

  it('draws a polygon, flags an overlap, undoes it, and traces over an uploaded image', async () => {
    const { page, errors } = await signedInPage()
    const db = server.rt.ctx.db
    const user = (await findUserByEmail(db, officer.email))!
    const siteId = await ensureDemoSite(db, user.org_id, 'E2E test building')
    const id = (await insertFloor(db, { orgId: user.org_id, siteId, name: 'Polygon and trace', ceilingHeightM: 3, plan: emptyPlan(), planValid: false, problems: [], userId: user.id })).id
    await page.goto(`${server.url}/floors/${id}`)
    await expect.poll(() => page.getByTestId('floor-title').textContent()).toBe('Polygon and trace')
    const canvas = page.getByTestId('editor-canvas')
    const box = (await canvas.boundingBox())!
    const at = (x: number, y: number) => [box.x + x, box.y + y] as const

    // An L-shaped room, corner by corner, closed by clicking the first corner again.
    await page.getByTestId('tool-room-polygon').click()
    for (const [x, y] of [[150, 120], [420, 120], [420, 260], [300, 260], [300, 400], [150, 400]] as const) await page.mouse.click(...at(x, y))
    await page.mouse.move(...at(360, 330))
    await shot(page, 'editor-polygon-drawing')
    await page.mouse.click(...at(151, 121))
    // A rectangle that overlaps it.
    await page.keyboard.press('r')
    await page.mouse.move(...at(380, 200))
    await page.mouse.down()
    await page.mouse.move(...at(560, 340), { steps: 6 })
    await page.mouse.up()
    await expect.poll(() => page.getByTestId('problem-list').textContent()).toContain('overlap')
    await page.getByTestId('problem-list').getByText(/overlap/).click()
    await expect.poll(() => page.getByTestId('property-panel').textContent()).toContain('2 items selected')
    await shot(page, 'editor-problems')
    await page.keyboard.press('Control+z')
    await expect.poll(() => page.getByTestId('problem-list').textContent()).not.toContain('overlap')

    // Trace: upload a generated PNG floor plan, then calibrate a line drawn on it.
    const png = await page.evaluate(() => {
      const c = document.createElement('canvas')
      c.width = 800; c.height = 500
      const g = c.getContext('2d')!
      g.fillStyle = '#fff'; g.fillRect(0, 0, 800, 500)
      g.strokeStyle = '#333'; g.lineWidth = 6
      g.strokeRect(20, 20, 760, 460); g.beginPath(); g.moveTo(400, 20); g.lineTo(400, 480); g.moveTo(20, 250); g.lineTo(400, 250); g.stroke()
      g.font = '28px sans-serif'; g.fillStyle = '#333'; g.fillText('Old drawing, 1998', 440, 300)
      return c.toDataURL('image/png').split(',')[1]!
    })
    await page.getByTestId('underlay-file').setInputFiles({ name: 'scan.png', mimeType: 'image/png', buffer: Buffer.from(png, 'base64') })
    await expect.poll(() => page.getByRole('button', { name: 'Calibrate scale' }).count()).toBe(1)
    await page.getByRole('button', { name: 'Calibrate scale' }).click()
    await page.mouse.click(...at(200, 300))
    await page.mouse.click(...at(400, 300))
    await page.getByTestId('calibrate-length').fill('12 m')
    await page.getByTestId('calibrate-apply').click()
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 15_000 }).toBe('saved')
    const saved = await page.evaluate(async (floorId) => (await fetch(`/api/floors/${floorId}`)).json(), id)
    expect(saved.plan.rooms).toHaveLength(1)
    expect(saved.plan.rooms[0].polygon).toHaveLength(6)
    expect(saved.plan.underlay).toMatchObject({ opacity: 0.5 })
    expect(saved.plan.underlay.metresPerPixel).not.toBe(0.02)
    await page.keyboard.press('f')
    await shot(page, 'editor-trace')
    expect(errors).toEqual([])
  })

  it('shows the demo floor with its rooms, items and no problems', async () => {
    const { page, errors } = await signedInPage()
    await page.goto(`${server.url}/floors/${demoFloorId}`)
    await expect.poll(() => page.getByTestId('problem-list').textContent()).toContain('No problems')
    await shot(page, 'editor-demo-floor')

    // In imperial units, from the element list: the NH3 cabinet's fields read in psi, lb, in.
    await page.evaluate(async () => {
      const token = document.cookie.split('; ').find((c) => c.startsWith('dw_csrf='))!.slice('dw_csrf='.length)
      await fetch('/api/auth/preferences', { method: 'PATCH', headers: { 'content-type': 'application/json', 'x-csrf-token': decodeURIComponent(token) },
        body: JSON.stringify({ unitSystem: 'imperial' }) })
    })
    await page.reload()
    await page.getByTestId('element-list').getByText(/^Elements/).click()
    await page.getByTestId('element-nh3-cabinet').click()
    await expect.poll(() => page.getByTestId('property-panel').textContent()).toContain('Gas source')
    await expect.poll(() => page.getByTestId('prop-pressure').inputValue()).toBe(String(Number((7.9e5 / 6894.757293168).toPrecision(5))))
    await page.getByTestId('editor-canvas').hover({ position: { x: 200, y: 200 } })
    await expect.poll(() => page.getByTestId('cursor-coords').textContent()).toMatch(/ft/)
    await expect.poll(() => page.getByTestId('zoom-readout').textContent()).toMatch(/^\d+ px\/ft$/)
    await shot(page, 'editor-demo-imperial')
    // The demo officer is shared with later browser tests, which type metric values: put the preference back.
    await page.evaluate(async () => {
      const token = document.cookie.split('; ').find((c) => c.startsWith('dw_csrf='))!.slice('dw_csrf='.length)
      const res = await fetch('/api/auth/preferences', { method: 'PATCH', headers: { 'content-type': 'application/json', 'x-csrf-token': decodeURIComponent(token) },
        body: JSON.stringify({ unitSystem: 'metric' }) })
      if (!res.ok) throw new Error(`metric preference not restored: ${res.status}`)
    })
    await page.goto(`${server.url}/floors`)
    await expect.poll(() => page.getByText('E2E test building').count()).toBeGreaterThan(0)
    await shot(page, 'floor-list')
    expect(errors).toEqual([])
  })

  for (const viewport of [{ width: 1366, height: 768 }, { width: 820, height: 1180 }]) {
    it(`reads well at ${viewport.width}×${viewport.height}: whole plan in view, labels apart, default gas stated`, async () => {
      const { page, errors } = await signedInPage(officer, viewport)
      const w = viewport.width
      await page.goto(`${server.url}/floors/${demoFloorId}`)
      await expect.poll(() => page.getByTestId('problem-list').textContent()).toContain('No problems')
      // Nothing sticks out sideways; on a tablet the canvas gets the full width (panel below it).
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(w)
      const canvasBox = (await page.getByTestId('editor-canvas').boundingBox())!
      expect(canvasBox.width).toBeGreaterThan(w < 1024 ? w - 120 : w - 700)
      if (w < 1024) expect(await page.getByRole('button', { name: 'Export scenario' }).textContent()).not.toContain('Export scenario')
      await shot(page, `editor-demo-${w}`)

      // A source, then a detector right on it: both labelled, apart; the detector's gas follows the source's.
      const db = server.rt.ctx.db
      const user = (await findUserByEmail(db, officer.email))!
      const siteId = await ensureDemoSite(db, user.org_id, 'E2E test building')
      const id = (await insertFloor(db, { orgId: user.org_id, siteId, name: `Narrow-screen check, a floor name long enough to need cutting short ${w}`,
        ceilingHeightM: 3, plan: emptyPlan(), planValid: false, problems: [], userId: user.id })).id
      await page.goto(`${server.url}/floors/${id}`)
      await expect.poll(() => page.getByTestId('floor-title').textContent()).toContain('Narrow-screen check')
      const box = (await page.getByTestId('editor-canvas').boundingBox())!
      const at = (x: number, y: number) => [box.x + x, box.y + y] as const
      await page.getByTestId('tool-room-rect').click()
      await page.mouse.move(...at(120, 100))
      await page.mouse.down()
      await page.mouse.move(...at(420, 300), { steps: 6 })
      await page.mouse.up()
      await page.getByTestId('tool-door').click()
      await page.mouse.move(...at(260, 300), { steps: 3 })
      await page.mouse.click(...at(262, 300))
      await page.getByTestId('tool-source').click()
      await page.mouse.click(...at(250, 200))
      await page.getByTestId('prop-gas').click()
      await page.getByRole('option', { name: /^NH3/ }).click()
      await page.getByTestId('tool-detector').click()
      await page.mouse.click(...at(252, 202))
      await expect.poll(() => page.getByTestId('gas-default-note').textContent()).toContain('Gas: NH3 (the same as the last source)')
      await shot(page, `editor-detector-placed-${w}`)
      await page.getByTestId('tool-workstation').click()
      await page.mouse.click(...at(330, 160))
      await page.mouse.click(...at(5, 5))
      await shot(page, `editor-items-${w}`)
      expect(errors).toEqual([])
    })
  }

  it('refits the plan when the window narrows to a tablet', async () => {
    const { page, errors } = await signedInPage(officer, { width: 1366, height: 768 })
    await page.goto(`${server.url}/floors/${demoFloorId}`)
    await expect.poll(() => page.getByTestId('problem-list').textContent()).toContain('No problems')
    const wide = await page.getByTestId('zoom-readout').textContent()
    await page.setViewportSize({ width: 820, height: 1180 })
    await expect.poll(() => page.getByTestId('zoom-readout').textContent()).not.toBe(wide)
    await shot(page, 'editor-demo-resized-820')
    expect(errors).toEqual([])
  })

  it('lab managers see the floor they are responsible for, read-only', async () => {
    const { page, errors } = await signedInPage(DEMO_ACCOUNTS.find((a) => a.role === 'lab_manager')!)
    await page.goto(`${server.url}/floors/${demoFloorId}`)
    await expect.poll(() => page.getByText('View only').count()).toBe(1)
    // View only: no drawing tools at all (issue 15.6), not a palette of disabled ones.
    expect(await page.getByTestId('tool-room-rect').count()).toBe(0)
    expect(await page.getByTestId('save-state').count()).toBe(0)
    await page.getByTestId('element-list').getByText(/^Elements/).click()
    await page.getByTestId('element-det-nh3-gr').click()
    await expect.poll(() => page.getByTestId('property-panel').textContent()).toContain('Gas detector')
    await shot(page, 'editor-view-only')
    expect(errors).toEqual([])
  })
})
