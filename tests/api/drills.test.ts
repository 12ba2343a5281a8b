import ICAL from 'ical.js'
import { execFileSync } from 'node:child_process'
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { utcToLocal } from '../../shared/drills/time'
import { startFakeSmtp } from '../../server/mail/fake-smtp'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import type { Runtime } from '../../server/runtime'
import { drillClock, tickReminders } from '../../server/services/drill-notices.service'
import { createOtherOrg, linkFrom, signIn, startTestRuntime, waitForMail, apiAgent, type ApiAgent } from '../support/test-runtime'
import { acct, EXTRA_PASSWORD, planFixture } from './plans-fixtures'

const DAY = 86_400_000
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))
const realNow = drillClock.now

type Captured = Awaited<ReturnType<typeof waitForMail>>
function icsOf(mail: Captured) {
  const att = mail.attachments.find((a) => /calendar|ics/.test(a.contentType) && a.content)
  if (!att) throw new Error(`No calendar attachment in ${mail.subject}`)
  const comp = new ICAL.Component(ICAL.parse(att.content!))
  const ev = comp.getFirstSubcomponent('vevent')!
  return {
    method: String(comp.getFirstPropertyValue('method')),
    uid: String(ev.getFirstPropertyValue('uid')),
    sequence: Number(ev.getFirstPropertyValue('sequence')),
    status: String(ev.getFirstPropertyValue('status') ?? ''),
    start: (ev.getFirstPropertyValue('dtstart') as ICAL.Time).toJSDate().toISOString(),
    summary: String(ev.getFirstPropertyValue('summary')),
    attendees: ev.getAllProperties('attendee').map((p) => String(p.getFirstValue()).replace(/^mailto:/i, '').toLowerCase()),
  }
}
const tokenOf = (mail: Captured) => new URL(linkFrom(mail.text_body, '/drills/confirm?token=')).searchParams.get('token')!
const mailsTo = async (rt: Runtime, to: string, subject: RegExp) => (await listCapturedTo(rt.ctx.db, to)).filter((m) => subject.test(m.subject))
const binary = (res: import('superagent').Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => cb(null, Buffer.concat(chunks)))
}

/** A published plan on the fixture floor, ready for drills. */
async function publishedPlan(rt: Runtime, officer: ApiAgent) {
  const fx = await planFixture(rt)
  const plan = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Ammonia cylinder plan' }).expect(201)).body
  await officer.post(`/api/plans/${plan.id}/publish`).send({}).expect(200)
  return { fx, planId: plan.id as number }
}

function drillBody(planId: number, officerId: number, startsAt: Date, tz: string, over: Record<string, unknown> = {}) {
  const local = utcToLocal(startsAt, tz)
  return {
    planId, planVersion: 1, title: 'NH3 leak drill <Bay A>', date: local.date, time: local.time, timeZone: tz, durationMinutes: 45,
    location: 'Gas room A and corridor C', scenario: 'Ammonia cylinder valve leak in gas room A; detector A alarms.', officerId,
    reminderMinutes: 24 * 60, participants: { groups: ['floor_staff'], userIds: [], guests: [{ name: 'Contractor <Kai>', email: 'kai@contractor.invalid' }] },
    ...over,
  }
}

describe('drills', () => {
  let rt: Runtime
  let officer: ApiAgent, staff: ApiAgent, manager: ApiAgent, otherManager: ApiAgent
  let fx: Awaited<ReturnType<typeof planFixture>>
  let planId: number
  let officerId: number
  let drillId: number
  let startsAt: Date
  const staffEmail = acct('staff').email

  beforeAll(async () => {
    rt = await startTestRuntime({}, { background: true })
    officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
    staff = await signIn(rt, staffEmail, acct('staff').password)
    manager = await signIn(rt, acct('lab_manager').email, acct('lab_manager').password)
    ;({ fx, planId } = await publishedPlan(rt, officer))
    otherManager = await signIn(rt, fx.otherManager.email, EXTRA_PASSWORD)
    officerId = (await officer.get('/api/auth/me')).body.id
  })
  afterAll(async () => {
    drillClock.now = realNow
    await rt.close()
  })

  it('bad input is a 400 naming the field', async () => {
    const past = drillBody(planId, officerId, new Date(Date.now() - DAY), 'Europe/Berlin')
    expect(Object.keys((await officer.post('/api/drills').send(past).expect(400)).body.error.fields)).toEqual(['date'])
    const bad = { ...drillBody(planId, officerId, new Date(Date.now() + 3 * DAY), 'Europe/Berlin'), timeZone: 'Nowhere/City', time: '9am' }
    expect(Object.keys((await officer.post('/api/drills').send(bad).expect(400)).body.error.fields).sort()).toEqual(['time', 'timeZone'])
    const staffInCharge = drillBody(planId, fx.staffId, new Date(Date.now() + 3 * DAY), 'Europe/Berlin')
    expect((await officer.post('/api/drills').send(staffInCharge).expect(400)).body.error.fields).toHaveProperty('officerId')
    const draftVersion = drillBody(planId, officerId, new Date(Date.now() + 3 * DAY), 'Europe/Berlin', { planVersion: 2 })
    expect((await officer.post('/api/drills').send(draftVersion).expect(400)).body.error.fields).toHaveProperty('planVersion')
    await staff.post('/api/drills').send(drillBody(planId, officerId, new Date(Date.now() + 3 * DAY), 'UTC')).expect(403)
  })

  it('schedules a drill; invitations with a parseable .ics reach the fake SMTP server', async () => {
    startsAt = new Date(Math.ceil((Date.now() + 3 * DAY) / 60_000) * 60_000)
    const res = await officer.post('/api/drills').send(drillBody(planId, officerId, startsAt, 'America/Los_Angeles')).expect(201)
    drillId = res.body.id
    expect(res.body).toMatchObject({ status: 'scheduled', sequence: 0, planVersion: 1, participants: 2, confirmed: 0, startsAt: startsAt.toISOString() })
    expect(res.body.checklist.map((s: { id: string }) => s.id)).toContain('ck-evac-A')
    expect(res.body.predicted).toEqual({ egressMarginS: 50, isolationByS: 30, firstAlarmS: 40 })
    expect(res.body.localStart).toMatch(/\(America\/Los_Angeles\)$/)

    const mail = await waitForMail(rt.ctx.db, staffEmail, /^Drill invitation: NH3 leak drill <Bay A>$/)
    expect(mail.html_body).toContain('NH3 leak drill &lt;Bay A&gt;')
    expect(mail.text_body).toMatch(/Screening estimate/i)
    expect(mail.text_body).toContain(res.body.localStart)
    const ics = icsOf(mail)
    expect(ics).toMatchObject({ method: 'REQUEST', uid: `drill-${drillId}@driftwarden`, sequence: 0, status: 'CONFIRMED', start: startsAt.toISOString() })
    expect(ics.summary).toBe('Drill: NH3 leak drill <Bay A>')
    expect(ics.attendees).toEqual([staffEmail])
    // Only the invited: the lab manager was not in the groups chosen
    expect(await mailsTo(rt, acct('lab_manager').email, /Drill invitation/)).toHaveLength(0)
  })

  it('the roster shows the bounced address and who confirmed', async () => {
    await expect.poll(async () => (await officer.get(`/api/drills/${drillId}`)).body.roster.find((r: { email: string }) => r.email === 'kai@contractor.invalid')?.mail, { timeout: 15_000 }).toBe('bounced')
    const roster = (await officer.get(`/api/drills/${drillId}`).expect(200)).body.roster
    expect(roster.find((r: { email: string }) => r.email === staffEmail)).toMatchObject({ mail: 'sent', confirmedAt: null })
    expect(roster.find((r: { email: string }) => r.email === 'kai@contractor.invalid').mailError).toMatch(/550|No such mailbox/)
  })

  it('the receipt link works once, without signing in; a tampered link is refused', async () => {
    const token = tokenOf(await waitForMail(rt.ctx.db, staffEmail, /^Drill invitation/))
    const anon = await apiAgent(rt)
    const info = await anon.get(`/api/drills/confirm?token=${encodeURIComponent(token)}`).expect(200)
    expect(info.body).toMatchObject({ drillTitle: 'NH3 leak drill <Bay A>', name: acct('staff').name, alreadyConfirmed: false })
    const tampered = token.slice(0, -3) + (token.endsWith('AAA') ? 'BBB' : 'AAA')
    await anon.post('/api/drills/confirm').send({ token: tampered }).expect(410)
    const otherParticipant = token.replace(/^\d+/, (n) => String(Number(n) + 1))
    await anon.post('/api/drills/confirm').send({ token: otherParticipant }).expect(410)
    await anon.post('/api/drills/confirm').send({ token: 'garbage' }).expect(400)
    const ok = await anon.post('/api/drills/confirm').send({ token }).expect(200)
    expect(ok.body.alreadyConfirmed).toBe(true)
    const again = await anon.post('/api/drills/confirm').send({ token }).expect(410)
    expect(again.body.error.message).toMatch(/already been used/)
    const roster = (await officer.get(`/api/drills/${drillId}`)).body
    expect(roster.confirmed).toBe(1)
    expect(roster.roster.find((r: { email: string }) => r.email === staffEmail).confirmedAt).not.toBeNull()
  })

  it('staff see their own drills only; lab managers their floors; other organizations get 404', async () => {
    const mine = (await staff.get('/api/drills').expect(200)).body.drills.map((d: { id: number }) => d.id)
    expect(mine).toContain(drillId)
    const detail = (await staff.get(`/api/drills/${drillId}`).expect(200)).body
    expect(detail.mine).toBe(true)
    expect(detail.roster.find((r: { name: string }) => r.name === 'Contractor <Kai>').email).toBe('')
    await staff.put(`/api/drills/${drillId}/record`).send({ steps: [], measured: {} }).expect(403)
    expect((await manager.get('/api/drills').expect(200)).body.drills.map((d: { id: number }) => d.id)).toContain(drillId)
    await manager.get(`/api/drills/${drillId}`).expect(200)
    await otherManager.get(`/api/drills/${drillId}`).expect(404)
    expect((await otherManager.get('/api/drills').expect(200)).body.drills.map((d: { id: number }) => d.id)).not.toContain(drillId)
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const otherOfficer = await signIn(rt, other.users.ehs_officer.email, other.password)
    await otherOfficer.get(`/api/drills/${drillId}`).expect(404)
    await otherOfficer.patch(`/api/drills/${drillId}`).send({ location: 'x' }).expect(404)

    // A second drill the staff member is not invited to stays invisible to them
    const quiet = drillBody(planId, officerId, new Date(Date.now() + 5 * DAY), 'UTC', { participants: { userIds: [fx.managerId], groups: [], guests: [] } })
    const q = (await officer.post('/api/drills').send(quiet).expect(201)).body
    await staff.get(`/api/drills/${q.id}`).expect(404)
    expect((await staff.get('/api/drills')).body.drills.map((d: { id: number }) => d.id)).not.toContain(q.id)
    await officer.post(`/api/drills/${q.id}/cancel`).send({ reason: 'Clashes with the shutdown' }).expect(200)
    const cancelMail = await waitForMail(rt.ctx.db, acct('lab_manager').email, /^Drill cancelled/)
    const ics = icsOf(cancelMail)
    expect(ics).toMatchObject({ method: 'CANCEL', uid: `drill-${q.id}@driftwarden`, sequence: 1, status: 'CANCELLED' })
    expect(cancelMail.text_body).toContain('Clashes with the shutdown')
    await officer.post(`/api/drills/${q.id}/cancel`).send({ reason: 'again' }).expect(409)
  })

  it('moving the drill sends the next SEQUENCE, asks to confirm again, and replaces the old link', async () => {
    const oldToken = tokenOf((await mailsTo(rt, staffEmail, /^Drill invitation/))[0]!)
    const moved = new Date(startsAt.getTime() + 2 * 3600_000)
    const local = utcToLocal(moved, 'America/Los_Angeles')
    const res = await officer.patch(`/api/drills/${drillId}`).send({ time: local.time, reason: 'Fire marshal unavailable' }).expect(200)
    expect(res.body).toMatchObject({ sequence: 1, startsAt: moved.toISOString(), confirmed: 0 })
    const mail = await waitForMail(rt.ctx.db, staffEmail, /^Drill moved/)
    expect(icsOf(mail)).toMatchObject({ method: 'REQUEST', uid: `drill-${drillId}@driftwarden`, sequence: 1, start: moved.toISOString() })
    expect(mail.text_body).toContain('Fire marshal unavailable')
    const anon = await apiAgent(rt)
    await anon.post('/api/drills/confirm').send({ token: oldToken }).expect(410)
    const newToken = tokenOf(mail)
    // Expired: a week after the drill the link no longer works
    drillClock.now = () => new Date(moved.getTime() + 8 * DAY)
    const expired = await anon.post('/api/drills/confirm').send({ token: newToken }).expect(410)
    expect(expired.body.error.message).toMatch(/expired/)
    drillClock.now = realNow
    await anon.post('/api/drills/confirm').send({ token: newToken }).expect(200)
    startsAt = moved
  })

  it('the reminder job fires when the clock is moved forward', async () => {
    await tickReminders(rt.ctx)
    await sleep(2500)
    expect((await officer.get(`/api/drills/${drillId}`)).body.reminderSentAt).toBeNull()
    expect(await mailsTo(rt, staffEmail, /^Reminder: drill/)).toHaveLength(0)

    // 23 hours before the start: inside the 24-hour reminder window
    drillClock.now = () => new Date(startsAt.getTime() - 23 * 3600_000)
    await tickReminders(rt.ctx)
    const reminder = await waitForMail(rt.ctx.db, staffEmail, /^Reminder: drill NH3 leak drill <Bay A>/)
    expect(reminder.text_body).toMatch(/Screening estimate/i)
    // Already confirmed: no new receipt link in the reminder
    expect(reminder.text_body).not.toContain('/drills/confirm?token=')
    await expect.poll(async () => (await officer.get(`/api/drills/${drillId}`)).body.reminderSentAt).not.toBeNull()
    // Once only
    await tickReminders(rt.ctx)
    await sleep(2000)
    expect(await mailsTo(rt, staffEmail, /^Reminder: drill/)).toHaveLength(1)
    drillClock.now = realNow
  })

  it('records the drill and compares the measured times with the predictions', async () => {
    await officer.put(`/api/drills/${drillId}/record`).send({ steps: [], measured: {}, completed: true }).expect(400)
    // Before the start: progress can be saved without completing; the detail says it has not started
    const progress = await officer.put(`/api/drills/${drillId}/record`).send({ steps: [], measured: {}, observations: 'Prepared the stopwatch', completed: false }).expect(200)
    expect(progress.body).toMatchObject({ status: 'scheduled', hasStarted: false, record: { observations: 'Prepared the stopwatch' } })
    drillClock.now = () => new Date(startsAt.getTime() + 3600_000)
    expect((await officer.get(`/api/drills/${drillId}`).expect(200)).body.hasStarted).toBe(true)
    const bad = await officer.put(`/api/drills/${drillId}/record`).send({ steps: [{ stepId: 'nope', done: true }], measured: {} }).expect(400)
    expect(bad.body.error.fields).toHaveProperty('steps.0.stepId')
    const rec = await officer.put(`/api/drills/${drillId}/record`).send({
      steps: [{ stepId: 'ck-alarm', done: true, atS: 0 }, { stepId: 'ck-evac-A', done: true, atS: 65, note: 'Door A was blocked by a trolley' }, { stepId: 'ck-isolate', done: true, atS: 25 }],
      measured: { alarmToEvacuatedS: 65, alarmToIsolationS: 25, alarmToHeadcountS: 240 },
      observations: 'Two people went back for their phones.',
    }).expect(200)
    expect(rec.body.status).toBe('completed')
    expect(rec.body.comparison.map((c: { measure: string; verdict: string; deltaS: number | null }) => `${c.measure}:${c.verdict}:${c.deltaS}`)).toEqual([
      'alarm_to_evacuated:over:15', 'alarm_to_isolation:within:-5', 'alarm_to_headcount:no_prediction:null',
    ])
    const steps = Object.fromEntries(rec.body.stepComparison.map((s: { stepId: string; verdict: string }) => [s.stepId, s.verdict]))
    expect(steps).toMatchObject({ 'ck-alarm': 'within', 'ck-evac-A': 'over', 'ck-isolate': 'within', 'ck-headcount': 'not_measured' })
    drillClock.now = realNow
  })

  it('findings with corrective actions are followed up until closed; history shows sites and open actions', async () => {
    const bad = await officer.post(`/api/drills/${drillId}/findings`).send({ finding: '', action: 'x', ownerId: 999999, dueDate: '2026-13-01' }).expect(400)
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['dueDate', 'finding'])
    await officer.post(`/api/drills/${drillId}/findings`).send({ finding: 'x', action: 'y', ownerId: 999999, dueDate: '2027-01-15' }).expect(400)
    const added = await officer.post(`/api/drills/${drillId}/findings`).send({
      finding: 'Evacuation of gas room A took 15 s longer than predicted: Door A blocked', action: 'Keep the Door A approach clear; weekly check', ownerId: fx.managerId, dueDate: '2020-01-31',
    }).expect(201)
    const f = added.body.findings[0]
    expect(f).toMatchObject({ status: 'open', overdue: true, ownerName: acct('lab_manager').name })
    const ov = (await officer.get('/api/drills/overview').expect(200)).body
    expect(ov.openFindings.map((x: { id: number }) => x.id)).toContain(f.id)
    const site = ov.sites.find((s: { floors: { floorId: number }[] }) => s.floors.some((fl) => fl.floorId === fx.floorId))
    expect(site).toMatchObject({ frequencyDays: 90, overdue: false })
    expect(site.floors.find((fl: { floorId: number }) => fl.floorId === fx.floorId)).toMatchObject({ held: 1 })
    // A site drilled longer ago than its frequency is overdue
    drillClock.now = () => new Date(Date.now() + 120 * DAY)
    expect((await officer.get('/api/drills/overview')).body.sites.find((s: { siteId: number }) => s.siteId === site.siteId).overdue).toBe(true)
    drillClock.now = realNow
    await officer.put(`/api/drills/site-frequency/${site.siteId}`).send({ drillFrequencyDays: 30 }).expect(200)
    await officer.put(`/api/drills/site-frequency/${site.siteId}`).send({ drillFrequencyDays: 0 }).expect(400)
    // The lab manager's overview lists it too; staff see only actions they own
    expect((await manager.get('/api/drills/overview').expect(200)).body.openFindings.map((x: { id: number }) => x.id)).toContain(f.id)
    expect((await staff.get('/api/drills/overview').expect(200)).body).toEqual({ sites: [], openFindings: [] })
    const closed = await officer.patch(`/api/drill-findings/${f.id}`).send({ status: 'closed', note: 'Floor markings painted' }).expect(200)
    expect(closed.body.findings[0]).toMatchObject({ status: 'closed', overdue: false, note: 'Floor markings painted' })
    expect((await officer.get('/api/drills/overview')).body.openFindings.map((x: { id: number }) => x.id)).not.toContain(f.id)
  })

  it('the drill report PDF holds the comparison, the roster and the cautions', async () => {
    const res = await officer.get(`/api/drills/${drillId}/pdf`).buffer(true).parse(binary).expect(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    mkdirSync('tests/artifacts', { recursive: true })
    writeFileSync('tests/artifacts/drill-report.pdf', res.body)
    const dir = mkdtempSync(path.join(tmpdir(), 'drill-pdf-'))
    writeFileSync(path.join(dir, 'd.pdf'), res.body)
    const text = execFileSync('pdftotext', ['-layout', path.join(dir, 'd.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')
    expect(text).toContain('NH3 leak drill <Bay A>')
    expect(text).toMatch(/Alarm to evacuation 50 s 1 min 5 s \+15 s Slower than predicted/)
    expect(text).toMatch(/Alarm to source isolated 30 s 25 s -5 s Within the predicted time/)
    expect(text).toContain('1 of 2 confirmed receipt')
    expect(text).toContain('Contractor <Kai>')
    expect(text).toContain('bounced')
    expect(text).toMatch(/Evacuation of gas room A took 15/)
    expect(text).toMatch(/2020-01-31 closed/)
    expect(text).toMatch(/Caution: Screening estimate only/)
    await staff.get(`/api/drills/${drillId}/pdf`).expect(200)
  })
})

describe('a failed send is retried and not lost', () => {
  let rt: Runtime
  beforeAll(async () => {
    rt = await startTestRuntime()
  })
  afterAll(() => rt.close())

  it('keeps the invitation queued while SMTP is down and delivers it once when it returns', async () => {
    const officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
    const { fx, planId } = await publishedPlan(rt, officer)
    const me = (await officer.get('/api/auth/me')).body
    await sleep(500)
    const port = rt.fakeSmtp!.port
    await rt.fakeSmtp!.close()
    const guest = `retry.${Date.now()}@calder-ridge.example`
    const body = drillBody(planId, me.id, new Date(Date.now() + 4 * DAY), 'Europe/Berlin', { participants: { userIds: [fx.managerId], groups: [], guests: [{ name: 'Retry Guest', email: guest }] } })
    const drill = (await officer.post('/api/drills').send(body).expect(201)).body
    await expect.poll(async () => (await rt.ctx.mail.outgoing(me.orgId)).find((m) => m.to === guest)?.lastError ?? '', { timeout: 10_000 }).toMatch(/ECONNREFUSED|connect/i)
    const queued = (await rt.ctx.mail.outgoing(me.orgId)).find((m) => m.to === guest)!
    expect(queued.status).toBe('pending')
    expect(queued.lastError).toMatch(/ECONNREFUSED|connect/i)
    expect((await officer.get(`/api/drills/${drill.id}`)).body.roster.find((r: { email: string }) => r.email === guest).mail).toBe('pending')

    const back = await startFakeSmtp(rt.ctx.db, port)
    try {
      const mail = await waitForMail(rt.ctx.db, guest, /^Drill invitation/, 30_000)
      expect(icsOf(mail)).toMatchObject({ method: 'REQUEST', uid: `drill-${drill.id}@driftwarden` })
      // The fake server has the message once DATA ends; the sender records "sent" after the server's reply.
      await expect.poll(async () => (await rt.ctx.mail.outgoing(me.orgId)).find((m) => m.to === guest)?.status, { timeout: 10_000 }).toBe('sent')
      const sent = (await rt.ctx.mail.outgoing(me.orgId)).find((m) => m.to === guest)!
      expect(sent.attempts).toBeGreaterThan(1)
      await sleep(1500)
      expect(await listCapturedTo(rt.ctx.db, guest)).toHaveLength(1)
      expect((await officer.get(`/api/drills/${drill.id}`)).body.roster.find((r: { email: string }) => r.email === guest).mail).toBe('sent')
    } finally {
      await back.close()
    }
  })
})
