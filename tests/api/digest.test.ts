import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import type { Runtime } from '../../server/runtime'
import { DIGEST_CRON, DIGEST_QUEUE, sendWeeklyDigest, weekKey } from '../../server/services/stale-digest.service'
import { createOtherOrg, signIn, startTestRuntime, waitForMail, type ApiAgent } from '../support/test-runtime'
import { fixtureFloor } from '../unit/plans-fixtures'
import { acct, planFixture } from './plans-fixtures'

/**
 * Issue 17, item 8: the weekly digest to EHS officers, a pg-boss schedule, through the real fake SMTP server: stale
 * plans with their reasons, missing and overdue acknowledgments, acknowledgments older than the site's review
 * interval; once per officer per week; nothing about another organization; the cautions in the e-mail.
 */
let rt: Runtime
let officer: ApiAgent
const officerEmail = acct('ehs_officer').email
const managerName = acct('lab_manager').name

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 0 }, { background: true })
  officer = await signIn(rt, officerEmail, acct('ehs_officer').password)
})
afterAll(() => rt.close())

const digestsTo = async (email: string) => (await listCapturedTo(rt.ctx.db, email)).filter((m) => /^Weekly plan digest/.test(m.subject))

describe('weekly digest', () => {
  it('is scheduled weekly, lists the stale plan with its reason and the missing and old acknowledgments, once a week, with the cautions', async () => {
    const schedules = await rt.ctx.jobs.boss.getSchedules()
    expect(schedules.find((s) => s.name === DIGEST_QUEUE)).toMatchObject({ cron: DIGEST_CRON })

    const fx = await planFixture(rt)
    const title = `Digest plan ${Date.now()}`
    const id = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title }).expect(201)).body.id as number
    await officer.post(`/api/plans/${id}/publish`).send({ ackDueDays: 3 }).expect(200)
    const manager = await signIn(rt, acct('lab_manager').email, acct('lab_manager').password)
    await manager.post(`/api/plans/${id}/versions/1/acknowledgments`).send({ comment: '' }).expect(201)
    // A floor change the plan is built on: it becomes stale with the change in words.
    const floor = fixtureFloor()
    floor.rooms[1]!.ventilation = { mode: 'ach', airChangesPerHour: 4 }
    await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: 1, plan: floor }).expect(200)
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)

    // The scheduled job, as the cron would start it.
    await rt.ctx.jobs.boss.send(DIGEST_QUEUE, {})
    const mail = await waitForMail(rt.ctx.db, officerEmail, /^Weekly plan digest: \d+ out of date, \d+ waiting for acknowledgment$/, 20_000)
    const text = mail.text_body.replace(/\s+/g, ' ')
    expect(text).toContain(`the week of ${weekKey(new Date())}`)
    expect(text).toMatch(new RegExp(`${title} \\(Plan test site [^)]+ · Level 1 [^)]+\\): Out of date since \\d{4}-\\d\\d-\\d\\d: Floor plan changed: room Lab B's air changes changed from 6 to 4`))
    expect(text).toMatch(new RegExp(`${title} \\([^)]+\\): Version 1 not yet acknowledged by Ana <i>Second</i> Manager \\(due \\d{4}-\\d\\d-\\d\\d\\)\\.`))
    expect(text).toContain(`/plans/${id}`)
    // Cautions: screening estimate, AHJ and licensed practice, planning advice for drills, not live guidance.
    expect(text).toContain('not live guidance during an incident')
    expect(text).toContain('local codes, the authority having jurisdiction and licensed practice govern')
    expect(text).toContain('Screening estimate only')
    expect(text).toContain('In an emergency: evacuate')
    // The HTML body escapes names typed by users.
    expect(mail.html_body).toContain('Ana &lt;i&gt;Second&lt;/i&gt; Manager')

    // Once a week: the same week again queues nothing; another organization hears nothing of this plan.
    expect(await sendWeeklyDigest(rt.ctx)).toBe(0)
    await rt.ctx.mail.flush()
    expect(await digestsTo(officerEmail)).toHaveLength(1)
    for (const m of await listCapturedTo(rt.ctx.db, other.users.ehs_officer.email)) expect(m.text_body).not.toContain(title)

    // Two weeks on, with a 7-day review interval: the acknowledgment is older than the interval, and the missing one is overdue.
    const siteId = (await rt.ctx.db.selectFrom('floors').select('site_id').where('id', '=', fx.floorId).executeTakeFirstOrThrow()).site_id
    await officer.put(`/api/sites/${siteId}/review-interval`).send({ days: 7 }).expect(200)
    const later = new Date(Date.now() + 14 * 86_400_000)
    expect(await sendWeeklyDigest(rt.ctx, later)).toBeGreaterThanOrEqual(1)
    await rt.ctx.mail.flush()
    let second: Awaited<ReturnType<typeof digestsTo>>[number] | undefined
    for (let i = 0; i < 75 && !second; i++) {
      second = (await digestsTo(officerEmail)).find((m) => m.text_body.includes(`the week of ${weekKey(later)}`))
      if (!second) await new Promise((r) => setTimeout(r, 200))
    }
    const t2 = second!.text_body.replace(/\s+/g, ' ')
    expect(t2).toMatch(new RegExp(`Version 1 not yet acknowledged by Ana <i>Second</i> Manager \\(overdue since \\d{4}-\\d\\d-\\d\\d\\)\\.`))
    expect(t2).toContain(`Acknowledged by ${managerName} 14 days ago, longer than the site's review interval of 7 days`)
  }, 60_000)
})
