import type { Browser, Page } from 'playwright-core'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { drillClock } from '../../server/services/drill-notices.service'
import { launchBrowser } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { linkFrom, waitForMail } from '../support/test-runtime'
import { closeMenu, fieldText, openActor, pick, shot, signIn, textOf, type Actor } from './journey/helpers'

/**
 * The whole job in one browser journey (issue 8): the admin invites three people by e-mail; the new EHS officer
 * draws a floor, runs leaks, places detectors with the advisor, generates and publishes a response plan; the new
 * lab manager acknowledges it from the e-mailed link; the officer schedules a drill, the staff member confirms
 * receipt from the e-mail without signing in, and the officer records the drill against the predictions.
 * Steps share state and run in order; each leaves screenshots in tests/artifacts/journey-<nn>-<step>.png.
 */

const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
// Unique addresses and names, so the journey runs on a database other browser tests have used.
const tag = Date.now().toString(36)
const people = {
  officer: { email: `officer.${tag}@calder-ridge.example`, name: `Ines Marchetti ${tag}`, role: /^EHS officer/, password: 'officer-journey-pass-1' },
  manager: { email: `manager.${tag}@calder-ridge.example`, name: `Kofi Lindqvist ${tag}`, role: /^Lab manager/, password: 'manager-journey-pass-1' },
  staff: { email: `staff.${tag}@calder-ridge.example`, name: `Mei Adebayo ${tag}`, role: /^Staff/, password: 'staff-journey-pass-1' },
}
const siteName = `Building F ${tag}`
const floorName = 'Level 2, process lab'
const nh3Scenario = 'Ammonia cylinder valve leak'
const n2Scenario = 'LN2 dewar vent into the lab'

describe('the whole job, in the browser', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let adminActor: Actor
  let officer: Actor
  const actors: Actor[] = []
  let floorId = 0
  let nh3RunId = 0
  let planId = 0
  let drillId = 0
  let clockRestore = () => {}
  const db = () => server.rt.ctx.db

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
  })
  // A failed step leaves a picture of every open page, to see what was on screen.
  afterEach(async (ctx) => {
    if (ctx.task.result?.state !== 'fail') return
    for (const [i, a] of actors.entries()) await a.page.screenshot({ path: `tests/artifacts/journey-failed-${ctx.task.name.slice(0, 2)}-${i}.png`, fullPage: true }).catch(() => undefined)
  })
  afterAll(async () => {
    clockRestore()
    for (const a of actors) await a.context.close().catch(() => undefined)
    await browser?.close()
    await server?.close()
  })

  async function actor(): Promise<Actor> {
    const a = await openActor(browser)
    actors.push(a)
    return a
  }
  const floorJson = (page: Page) => page.evaluate(async (id) => (await fetch(`/api/floors/${id}`)).json(), floorId)
  /** Every page error or console error of every browser context so far: none are expected. */
  const allProblems = () => actors.flatMap((a) => a.problems)

  it('01 the admin invites an officer, a lab manager and a staff member; each accepts from the e-mailed link', async () => {
    adminActor = await actor()
    const { page } = adminActor
    await page.goto(`${server.url}/admin/users`)
    await signIn(page, admin.email, admin.password)
    await page.getByRole('heading', { name: 'Users' }).waitFor()

    for (const person of Object.values(people)) {
      await page.getByRole('button', { name: 'Invite a person' }).click()
      const dialog = page.getByRole('dialog')
      await dialog.getByLabel('E-mail address').fill(person.email)
      await dialog.getByLabel('Name').fill(person.name)
      await pick(page, dialog, 'Role', person.role)
      if (person === people.officer) await shot(page, '01-invite-dialog', { fullPage: false })
      await dialog.getByRole('button', { name: 'Send invitation' }).click()
      await dialog.waitFor({ state: 'hidden' })
      const row = page.getByTestId('users-table').locator('tr', { hasText: person.email })
      await expect.poll(() => textOf(row)).toContain('Invited')
    }
    await shot(page, '01-users-invited', { tablet: true })

    // The invitations reached the fake SMTP server; the admin's Outbox shows what was captured.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outbox' }).click()
    await page.getByRole('heading', { name: 'Outbox' }).waitFor()
    const captured = page.getByTestId('captured-mail-item').filter({ hasText: people.officer.email }).first()
    await expect.poll(async () => {
      if (await captured.count()) return true
      await page.getByRole('button', { name: 'Refresh' }).click()
      return false
    }, { timeout: 30_000, interval: 1_000 }).toBe(true)
    await captured.click()
    await expect.poll(() => textOf(page.locator('article pre'))).toContain('/invite?token=')
    await shot(page, '01-outbox-invitation')

    for (const [key, person] of Object.entries(people)) {
      const mail = await waitForMail(db(), person.email, /invited/i, 30_000)
      const link = linkFrom(mail.text_body ?? '', '/invite?token=')
      expect(link.startsWith(server.url)).toBe(true)
      const invitee = await actor()
      await invitee.page.goto(link)
      await expect.poll(() => textOf(invitee.page.getByRole('main'))).toContain(person.email)
      await expect.poll(() => invitee.page.getByLabel('Your name').inputValue()).toBe(person.name)
      await invitee.page.getByLabel('New password', { exact: true }).fill(person.password)
      await invitee.page.getByLabel('Repeat the new password').fill(person.password)
      if (key === 'officer') await shot(invitee.page, '01-accept-invitation', { tablet: true })
      await invitee.page.getByRole('button', { name: 'Create my account' }).click()
      await invitee.page.getByRole('heading', { name: /^Welcome,/ }).waitFor()
      if (key === 'officer') {
        officer = invitee
        await shot(invitee.page, '01-officer-overview', { tablet: true })
      } else {
        // The others come back later in contexts of their own (the lab manager signs in; staff never need to).
        await invitee.context.close()
        actors.splice(actors.indexOf(invitee), 1)
      }
    }
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).click()
    for (const person of Object.values(people)) {
      await expect.poll(() => textOf(page.getByTestId('users-table').locator('tr', { hasText: person.email }))).toContain('Active')
    }
    await shot(page, '01-users-active')
    expect(allProblems()).toEqual([])
  })

  it('02 the officer adds a site and a floor with its people, draws two rooms, a door, two sources and a workstation', async () => {
    const { page } = officer
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: /floors/i }).click()
    await page.getByRole('heading', { name: 'Sites and floors' }).waitFor()
    await page.getByTestId('add-site').click()
    await page.getByRole('dialog').getByRole('textbox').fill(siteName)
    await page.getByRole('dialog').getByRole('button', { name: 'Add site' }).click()
    const site = page.locator('section', { has: page.getByRole('heading', { name: siteName }) })
    await site.waitFor()
    await site.getByRole('button', { name: 'Add floor' }).click()
    const form = page.getByTestId('floor-form')
    await form.getByTestId('floor-name').fill(floorName)
    await pick(page, form, 'Responsible lab managers', people.manager.name)
    await closeMenu(page)
    await pick(page, form, 'Staff assigned (can view)', people.staff.name)
    await closeMenu(page)
    await shot(page, '02-add-floor', { fullPage: false })
    await form.getByTestId('floor-form-submit').click()
    await page.waitForURL(/\/floors\/\d+$/)
    floorId = Number(new URL(page.url()).pathname.split('/').pop())
    await expect.poll(() => textOf(page.getByTestId('floor-title'))).toBe(floorName)

    const canvas = page.getByTestId('editor-canvas')
    const box = (await canvas.boundingBox())!
    const at = (x: number, y: number) => [box.x + x, box.y + y] as const
    // Gas room, 4 m × 5 m at the editor's 40 px/m, then the lab sharing its east wall (corners snap onto it).
    await page.getByTestId('tool-room-rect').click()
    await page.mouse.move(...at(100, 100))
    await page.mouse.down()
    await page.mouse.move(...at(200, 200), { steps: 5 })
    await page.mouse.move(...at(260, 300), { steps: 5 })
    await page.mouse.up()
    await page.mouse.move(...at(264, 103))
    await page.mouse.down()
    await page.mouse.move(...at(400, 200), { steps: 5 })
    await page.mouse.move(...at(500, 297), { steps: 5 })
    await page.mouse.up()
    // A door on the shared wall.
    await canvas.focus()
    await page.keyboard.press('d')
    await page.mouse.move(...at(258, 200), { steps: 3 })
    await page.mouse.click(...at(261, 202))

    // The ammonia cylinder in the gas room: liquefied, at its vapour pressure.
    await page.getByTestId('tool-source').click()
    await page.mouse.click(...at(150, 250))
    const panel = page.getByTestId('property-panel')
    await panel.getByLabel('Name').fill('NH3 cylinder')
    await page.getByTestId('prop-gas').click()
    await page.getByRole('option', { name: /^NH3/ }).click()
    await panel.getByText('Liquefied gas').click()
    await page.getByTestId('prop-pressure').fill('7.9 bar')
    await page.getByTestId('prop-pressure').press('Enter')
    await panel.getByLabel('Inventory').fill('20 kg')
    await panel.getByLabel('Inventory').press('Enter')
    await shot(page, '02-editor-source-properties')

    // The nitrogen dewar in the lab: a large-volume N2 source (the default gas of a new source).
    await page.getByTestId('tool-source').click()
    await page.mouse.click(...at(450, 250))
    await panel.getByLabel('Name').fill('LN2 dewar')
    // A new source starts with the gas last chosen, so pick nitrogen explicitly.
    await page.getByTestId('prop-gas').click()
    await page.getByRole('option', { name: /^N2 / }).click()
    await panel.getByLabel('Cylinder water volume').fill('180 L')
    await panel.getByLabel('Cylinder water volume').press('Enter')

    // A workstation where someone sits in the lab.
    await page.getByTestId('tool-workstation').click()
    await page.mouse.click(...at(330, 160))
    await panel.getByLabel('Name').fill('Wet bench')
    // And the gas room's cylinder-change position, where a person can be caught close to the leak.
    await page.getByTestId('tool-workstation').click()
    await page.mouse.click(...at(200, 150))
    await panel.getByLabel('Name').fill('Cylinder changeover')

    // Name the rooms from the element list.
    await page.getByTestId('element-list').getByText(/^Elements/).click()
    for (const [id, name, kind] of [['room-1', 'Gas room', /^Gas room$/], ['room-2', 'Process lab', /^Lab$/]] as const) {
      await page.getByTestId(`element-${id}`).click()
      await page.getByTestId('prop-name').fill(name)
      await pick(page, panel, 'Kind', kind)
    }
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 15_000 }).toBe('saved')
    await shot(page, '02-editor-drawn', { tablet: true })

    await page.reload()
    await expect.poll(() => textOf(page.getByTestId('floor-title'))).toBe(floorName)
    const saved = await floorJson(page)
    expect(saved.plan.rooms.map((r: { name: string }) => r.name)).toEqual(['Gas room', 'Process lab'])
    expect(saved.plan.openings).toHaveLength(1)
    expect(saved.plan.sources.map((s: { name: string; gasId: string }) => `${s.name}:${s.gasId}`)).toEqual(['NH3 cylinder:NH3', 'LN2 dewar:N2'])
    expect(saved.plan.sources[1].waterVolumeM3).toBeCloseTo(0.18)
    expect(saved.plan.workstations.map((w: { name: string }) => w.name)).toEqual(['Wet bench', 'Cylinder changeover'])
    expect(saved.problems.filter((p: { severity: string }) => p.severity === 'error')).toEqual([])
    await expect.poll(() => textOf(page.getByTestId('property-panel'))).toContain('2 rooms · 1 opening · 2 sources')
    await expect.poll(() => textOf(page.getByTestId('problem-list'))).toMatch(/No problems|warning/i)
    await shot(page, '02-editor-reloaded')
    expect(allProblems()).toEqual([])
  })

  async function createScenario(page: Page, name: string, source: RegExp) {
    await page.getByLabel('Name', { exact: true }).fill(name)
    // The form keeps the last scenario's settings (handy for variants): take the previous source off first.
    const sources = page.getByLabel('Leaking source(s)').locator('xpath=ancestor::*[contains(concat(" ", @class, " "), " q-field ")][1]')
    while (await sources.locator('.q-chip__icon--remove').count()) await sources.locator('.q-chip__icon--remove').first().click()
    await pick(page, page, 'Leaking source(s)', source)
    await closeMenu(page)
    await page.getByLabel('Duration, minutes').fill('5')
    await pick(page, page, 'Grid', '1 m cells')
    await page.getByRole('button', { name: 'Save scenario' }).click()
    await page.getByTestId('scenario-item').filter({ hasText: name }).waitFor()
  }
  async function runScenario(page: Page, name: string, screenshots: string | null) {
    await page.getByTestId('scenario-item').filter({ hasText: name }).getByRole('button', { name: 'Run' }).click()
    await page.waitForURL(/\/runs\/\d+$/)
    const runId = Number(new URL(page.url()).pathname.split('/').pop())
    if (screenshots) {
      // The progress bar shows while queued or running (it may already be done on a fast machine).
      await Promise.race([page.getByTestId('run-progress').waitFor({ timeout: 10_000 }), page.getByTestId('concentration-map').waitFor({ timeout: 10_000 })])
      if (await page.getByTestId('run-progress').isVisible()) await shot(page, `${screenshots}-progress`)
    }
    await page.getByTestId('concentration-map').waitFor({ timeout: 90_000 })
    await expect.poll(() => textOf(page.getByTestId('run-status'))).toContain('succeeded')
    await page.getByTestId('caution-banner').first().waitFor()
    return runId
  }
  /** The admin's Outbox, refreshed until the captured message to `to` with that subject shows; then opened. */
  async function openInOutbox(to: string, subject: RegExp) {
    const { page } = adminActor
    await page.goto(`${server.url}/admin/outbox`)
    await page.getByRole('heading', { name: 'Outbox' }).waitFor()
    const item = page.getByTestId('captured-mail-item').filter({ hasText: to }).filter({ hasText: subject }).first()
    await expect.poll(async () => {
      if (await item.count()) return true
      await page.getByRole('button', { name: 'Refresh' }).click()
      return false
    }, { timeout: 30_000, interval: 1_000 }).toBe(true)
    await item.click()
    return page
  }
  const mapPixels = (page: Page) => page.getByTestId('concentration-map').evaluate((c) => (c as HTMLCanvasElement).toDataURL())

  it('03 the officer runs the ammonia and nitrogen leaks, watches the map change, and accepts advised detectors', async () => {
    const { page } = officer
    await page.getByTestId('floor-scenarios').click()
    await page.getByRole('heading', { name: 'Scenarios & runs' }).waitFor()
    await expect.poll(() => fieldText(page, 'floor-select')).toContain(floorName)
    await createScenario(page, nh3Scenario, /^NH3 cylinder/)
    await createScenario(page, n2Scenario, /^LN2 dewar/)
    await shot(page, '03-scenarios', { tablet: true })

    nh3RunId = await runScenario(page, nh3Scenario, '03-nh3-run')
    const slider = page.getByTestId('time-slider')
    await slider.focus()
    await page.keyboard.press('Home')
    const atStart = await mapPixels(page)
    const startLabel = await textOf(page.getByTestId('time-label'))
    await page.keyboard.press('End')
    await expect.poll(() => textOf(page.getByTestId('time-label'))).not.toBe(startLabel)
    await expect.poll(() => mapPixels(page)).not.toBe(atStart)
    await shot(page, '03-nh3-result', { tablet: true, before: (p) => p.getByTestId('concentration-map').waitFor() })

    await page.goBack()
    await page.getByRole('heading', { name: 'Scenarios & runs' }).waitFor()
    const n2RunId = await runScenario(page, n2Scenario, null)
    expect(n2RunId).toBeGreaterThan(nh3RunId)
    await shot(page, '03-n2-result')

    // Detector advisor over the ammonia run.
    await page.goto(`${server.url}/scenarios?floor=${floorId}`)
    await page.getByRole('link', { name: 'Detector advisor' }).click()
    await page.getByRole('heading', { name: /^Detector advisor/ }).waitFor()
    await pick(page, page, 'Leak scenarios (runs)', new RegExp(`^#${nh3RunId} `))
    await closeMenu(page)
    await page.getByLabel('Number of detectors').fill('1')
    await page.getByRole('button', { name: 'Propose positions' }).click()
    const add = page.getByRole('button', { name: /^Add 1 detector/ })
    await add.waitFor({ timeout: 30_000 })
    await shot(page, '03-advisor-proposal', { tablet: true })
    await add.click()
    await page.getByText('Detectors added to the floor plan.').waitFor()
    const withDetector = await floorJson(page)
    expect(withDetector.plan.detectors).toHaveLength(1)
    expect(withDetector.plan.detectors[0].gasId).toBe('NH3')

    // The editor shows it; the ammonia leak is run again so the plan can count from the detector's alarm.
    await page.goto(`${server.url}/floors/${floorId}`)
    await expect.poll(() => textOf(page.getByTestId('property-panel'))).toContain('1 detector')
    await shot(page, '03-editor-with-detector')
    await page.goto(`${server.url}/scenarios?floor=${floorId}`)
    nh3RunId = await runScenario(page, nh3Scenario, null)
    await page.getByTestId('limit-table').scrollIntoViewIfNeeded()
    expect(await textOf(page.getByTestId('limit-table'))).toMatch(/detector/i)
    await shot(page, '03-nh3-rerun-with-detector')
    expect(allProblems()).toEqual([])
  })

  it('04 the officer generates a response plan from the result, completes it and publishes it', async () => {
    const { page } = officer
    await page.goto(`${server.url}/plans/new`)
    await page.getByRole('heading', { name: 'Generate a response plan' }).waitFor()
    await page.getByTestId('plan-floor').click()
    await page.getByRole('option', { name: new RegExp(floorName.replace(/[.,]/g, '.')) }).click()
    await page.getByRole('checkbox', { name: new RegExp(`^#${nh3RunId} `) }).click()
    await shot(page, '04-plan-new')
    await page.getByRole('button', { name: 'Generate the draft' }).click()
    await page.getByTestId('plan-title').waitFor()
    planId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(await textOf(page.getByTestId('plan-title'))).toMatch(/Ammonia|NH3/)
    await page.getByTestId('caution-banner').first().waitFor()
    await shot(page, '04-plan-draft', { tablet: true })

    await page.getByRole('button', { name: 'Edit' }).click()
    await page.getByLabel('Assembly point').fill('Visitor car park, east lawn')
    await page.getByRole('button', { name: 'Save draft of version 1' }).first().click()
    await expect.poll(() => page.getByText('Assembly point: Visitor car park').isVisible()).toBe(true)
    await page.getByRole('button', { name: 'Publish version 1' }).click()
    await shot(page, '04-plan-publish-dialog', { fullPage: false })
    await page.getByRole('dialog').getByRole('button', { name: 'Publish' }).click()
    await expect.poll(() => textOf(page.getByTestId('plan-version'))).toContain('published')
    await shot(page, '04-plan-published')
    expect(allProblems()).toEqual([])
  })

  it('05 the lab manager opens the plan from the e-mail, signs in and acknowledges it', async () => {
    const mail = await waitForMail(db(), people.manager.email, /^Please acknowledge/, 30_000)
    const link = linkFrom(mail.text_body ?? '', `/plans/${planId}`)
    const manager = await actor()
    const { page } = manager
    await page.goto(link)
    await signIn(page, people.manager.email, people.manager.password)
    await page.getByTestId('ack-request').waitFor()
    expect(new URL(page.url()).pathname).toBe(`/plans/${planId}`)
    await expect.poll(() => page.getByRole('button', { name: 'Edit' }).count()).toBe(0)
    await page.getByTestId('caution-banner').first().waitFor()
    await shot(page, '05-manager-plan', { tablet: true })
    await page.getByRole('button', { name: 'Acknowledge', exact: true }).click()
    await page.getByLabel('Comment (optional)').fill('Read with the process-lab team')
    await page.getByRole('button', { name: 'Acknowledge version 1' }).click()
    await expect.poll(() => page.getByTestId('ack-request').count()).toBe(0)
    await expect.poll(() => textOf(page.getByTestId('plan-acks'))).toContain('Read with the process-lab team')
    await page.getByTestId('plan-acks').scrollIntoViewIfNeeded()
    await shot(page, '05-manager-acknowledged', { fullPage: false })

    // The request the lab manager answered is in the fake SMTP server's capture, as the admin's Outbox shows.
    const outbox = await openInOutbox(people.manager.email, /Please acknowledge/)
    await expect.poll(() => textOf(outbox.locator('article pre'))).toContain(`/plans/${planId}`)
    await shot(outbox, '05-outbox-ack-request')

    // The officer sees it on the plan.
    await officer.page.reload()
    await expect.poll(() => textOf(officer.page.getByTestId('plan-acks'))).toContain(people.manager.name)
    expect(allProblems()).toEqual([])
  })

  it('06 the officer schedules a drill; the staff member confirms from the e-mail; the officer records it', async () => {
    const { page } = officer
    await page.getByRole('link', { name: 'Schedule a drill' }).click()
    await page.getByRole('heading', { name: 'Schedule a drill' }).waitFor()
    await expect.poll(() => fieldText(page, 'drill-plan')).toContain('v1')
    await page.getByLabel('Scenario to enact').fill('The gas-room ammonia detector alarms; the cylinder valve is assumed leaking.')
    await pick(page, page, 'More people', new RegExp(people.staff.email.replace(/\./g, '\\.')))
    await closeMenu(page)
    await shot(page, '06-drill-new', { tablet: true })
    await page.getByRole('button', { name: 'Schedule and send invitations' }).click()
    await page.waitForURL(/\/drills\/\d+$/)
    drillId = Number(new URL(page.url()).pathname.split('/').pop())
    const staffRow = page.getByTestId('drill-roster').locator('tr', { hasText: people.staff.email })
    await expect.poll(() => textOf(staffRow)).toContain('Not confirmed')
    await shot(page, '06-drill-scheduled')

    // Staff: the e-mailed receipt link works without signing in.
    const mail = await waitForMail(db(), people.staff.email, /^Drill invitation/, 30_000)
    const link = linkFrom(mail.text_body ?? '', '/drills/confirm?token=')
    const staff = await actor()
    const outbox = await openInOutbox(people.staff.email, /Drill invitation/)
    await expect.poll(() => textOf(outbox.locator('article pre'))).toContain('/drills/confirm?token=')
    await shot(outbox, '06-outbox-drill-invitation')
    await staff.page.goto(link)
    await staff.page.getByTestId('confirm-title').waitFor()
    await shot(staff.page, '06-staff-confirm', { tablet: true })
    await staff.page.getByRole('button', { name: 'Confirm I received this notice' }).click()
    await staff.page.getByTestId('confirm-done').waitFor()
    await shot(staff.page, '06-staff-confirmed')

    await page.reload()
    await expect.poll(() => textOf(staffRow)).toContain('Confirmed')

    // The day of the drill comes (the server's drill clock moves past its start), then the officer records it.
    const realNow = drillClock.now
    drillClock.now = () => new Date(Date.now() + 8 * 86_400_000)
    clockRestore = () => { drillClock.now = realNow }
    await page.reload()
    // Record: each checklist step done with its time, and the measured times.
    const record = page.getByTestId('drill-record')
    await record.getByLabel('Step 1 done').waitFor()
    const steps = await record.locator('tbody tr').count()
    expect(steps).toBeGreaterThan(0)
    for (let i = 1; i <= steps; i++) {
      await record.getByLabel(`Step ${i} done`).click()
      await record.getByLabel(`Step ${i} time in seconds`).fill(String(20 * i))
    }
    await page.getByLabel('Alarm to evacuation complete').fill('150')
    await page.getByLabel('Alarm to source isolated').fill('240')
    await page.getByLabel('Alarm to head count complete').fill('300')
    await page.getByLabel('Observations (hot wash)').fill('Door to the lab was propped; the bench user left by the far exit.')
    await page.getByRole('button', { name: 'Save the record' }).click()
    await expect.poll(() => textOf(page.getByTestId('drill-status'))).toContain('completed')
    const comparison = page.getByTestId('drill-comparison')
    await expect.poll(() => textOf(comparison)).toMatch(/150 s|2 min 30 s|2:30/)
    // The workstation in the gas room reaches a critical level, so the plan predicted an egress time to compare with.
    expect(await textOf(comparison.locator('tr', { hasText: 'Alarm to evacuation complete' }))).toMatch(/Within the predicted time|Slower than predicted|Detection too late to evacuate in time/)
    await comparison.scrollIntoViewIfNeeded()
    await shot(page, '06-drill-recorded', { tablet: true })
    expect(drillId).toBeGreaterThan(0)
    clockRestore()
    expect(allProblems()).toEqual([])
  })
})
