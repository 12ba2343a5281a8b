import { createHash } from 'node:crypto'
import { execFileSync } from 'node:child_process'
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { sql } from 'kysely'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { hashInput } from '../../shared/plans/canonical'
import type { Runtime } from '../../server/runtime'
import { createOtherOrg, signIn, startTestRuntime, waitForMail, type ApiAgent } from '../support/test-runtime'
import { acct, EXTRA_PASSWORD, planFixture } from './plans-fixtures'

let rt: Runtime
let officer: ApiAgent, manager: ApiAgent, manager2: ApiAgent, otherManager: ApiAgent, staff: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>
let planId: number

const pdfText = (buf: Buffer) => {
  const dir = mkdtempSync(path.join(tmpdir(), 'plan-pdf-'))
  writeFileSync(path.join(dir, 'p.pdf'), buf)
  return execFileSync('pdftotext', ['-layout', path.join(dir, 'p.pdf'), '-'], { encoding: 'utf8' })
}
const binary = (res: import('superagent').Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => cb(null, Buffer.concat(chunks)))
}

beforeAll(async () => {
  rt = await startTestRuntime()
  fx = await planFixture(rt)
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
  manager = await signIn(rt, acct('lab_manager').email, acct('lab_manager').password)
  staff = await signIn(rt, acct('staff').email, acct('staff').password)
  manager2 = await signIn(rt, fx.manager2.email, EXTRA_PASSWORD)
  otherManager = await signIn(rt, fx.otherManager.email, EXTRA_PASSWORD)
})
afterAll(() => rt.close())

describe('generating a plan from a stored result', () => {
  it('bad input is a 400 naming the field', async () => {
    const a = await officer.post('/api/plans').send({ floorId: 'x', runIds: [] }).expect(400)
    expect(Object.keys(a.body.error.fields).sort()).toEqual(['floorId', 'runIds'])
    const b = await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId, 999999] }).expect(400)
    expect(b.body.error.fields).toEqual({ 'runIds.1': 'No finished result with this id on this floor' })
    // A run of this floor is not a run of the other floor
    await officer.post('/api/plans').send({ floorId: fx.floor2Id, runIds: [fx.runId] }).expect(400)
  })

  it('generates the draft of version 1 by the rules, each line traced to the run', async () => {
    const res = await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Ammonia <b>release</b> plan' }).expect(201)
    planId = res.body.id
    const c = res.body.current
    expect(c).toMatchObject({ version: 1, status: 'draft', contentHash: null })
    expect(c.content.title).toBe('Ammonia <b>release</b> plan')
    expect(c.content.predicted).toEqual({ egressMarginS: 50, isolationByS: 30, firstAlarmS: 40 })
    expect(c.content.evacuation.rooms.map((r: { roomId: string; alarmLevel: string }) => `${r.roomId}:${r.alarmLevel}`)).toEqual(['A:low', 'B:high', 'C:none'])
    expect(c.content.timeline.rows.every((r: { from: { runId: number } }) => r.from.runId === fx.runId)).toBe(true)
    expect(res.body.managers.map((m: { name: string }) => m.name).sort()).toEqual(['Ana <i>Second</i> Manager', acct('lab_manager').name].sort())
    expect(res.body.canEdit).toBe(true)
  })

  it('lab managers do not see unpublished plans; staff and other organizations are refused', async () => {
    await manager.get(`/api/plans/${planId}`).expect(404)
    expect((await manager.get('/api/plans').expect(200)).body.plans.some((p: { id: number }) => p.id === planId)).toBe(false)
    await staff.get(`/api/plans/${planId}`).expect(403)
    await staff.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(403)
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const otherOfficer = await signIn(rt, other.users.ehs_officer.email, other.password)
    await otherOfficer.get(`/api/plans/${planId}`).expect(404)
    await otherOfficer.put(`/api/plans/${planId}/draft`).send({ content: (await officer.get(`/api/plans/${planId}`)).body.current.content }).expect(404)
    await otherOfficer.post(`/api/plans/${planId}/publish`).send({}).expect(404)
  })
})

describe('versions, publishing and acknowledgments', () => {
  let hash1: string
  it('editing the draft keeps version 1; a draft cannot be acknowledged', async () => {
    const content = (await officer.get(`/api/plans/${planId}`)).body.current.content
    content.evacuation.assemblyPoint = 'Car park P3, north-west corner (upwind)'
    content.roles[0].person = 'Tomasz Oyelaran'
    const saved = await officer.put(`/api/plans/${planId}/draft`).send({ content }).expect(200)
    expect(saved.body.current).toMatchObject({ version: 1, status: 'draft' })
    expect(saved.body.current.content.evacuation.assemblyPoint).toMatch(/Car park P3/)
    const bad = await officer.put(`/api/plans/${planId}/draft`).send({ content: { ...content, title: '' } }).expect(400)
    expect(bad.body.error.fields).toHaveProperty('content.title')
    await manager.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(404)
  })

  it('publishing freezes version 1 with the sha256 of its canonical JSON and e-mails the lab managers', async () => {
    const res = await officer.post(`/api/plans/${planId}/publish`).send({ ackDueDays: 7 }).expect(200)
    const cur = res.body.current
    expect(cur.status).toBe('published')
    hash1 = cur.contentHash
    expect(hash1).toBe(createHash('sha256').update(hashInput({ planId, version: 1, floorId: fx.floorId, content: cur.content })).digest('hex'))
    expect(res.body.managers.every((m: { state: string }) => m.state === 'pending')).toBe(true)
    await officer.post(`/api/plans/${planId}/publish`).send({}).expect(409)

    // Other files publish plans to the same lab manager: wait for this plan's message.
    const mail = await waitForMail(rt.ctx.db, acct('lab_manager').email, /Please acknowledge: Ammonia <b>release<\/b> plan \(version 1\)/)
    expect(mail.subject).toContain('Ammonia <b>release</b> plan (version 1)')
    expect(mail.html_body).toContain('Ammonia &lt;b&gt;release&lt;/b&gt; plan')
    expect(mail.text_body).toContain(hash1)
    expect(mail.text_body).toMatch(/Screening estimate/i)
    expect(mail.text_body).toContain(`/plans/${planId}`)
    const mail2 = await waitForMail(rt.ctx.db, fx.manager2.email, /Please acknowledge/)
    expect(mail2.html_body).toContain('Ana &lt;i&gt;Second&lt;/i&gt; Manager')
    const toOther = await rt.ctx.db.selectFrom('captured_mail').select('id').where(sql<boolean>`${fx.otherManager.email} = any(envelope_to)`).execute()
    expect(toOther).toEqual([])
  })

  it('only a lab manager of the floor acknowledges, once', async () => {
    await otherManager.get(`/api/plans/${planId}`).expect(404)
    await otherManager.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(404)
    await officer.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(403)
    const view = await manager.get(`/api/plans/${planId}`).expect(200)
    expect(view.body).toMatchObject({ canAcknowledge: true, canEdit: false, latestPublished: 1 })
    const tooLong = await manager.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({ comment: 'x'.repeat(1001) }).expect(400)
    expect(tooLong.body.error.fields).toHaveProperty('comment')
    const ack = await manager.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({ comment: 'Read with my team <script>' }).expect(201)
    expect(ack.body).toMatchObject({ name: acct('lab_manager').name, version: 1, comment: 'Read with my team <script>' })
    const again = await manager.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(409)
    expect(again.body.error.code).toBe('already_acknowledged')
    const after = await manager.get(`/api/plans/${planId}`).expect(200)
    expect(after.body.canAcknowledge).toBe(false)
    const list = (await officer.get('/api/plans').expect(200)).body.plans.find((p: { id: number }) => p.id === planId)
    expect(list.acks).toEqual({ done: 1, pending: 1, overdue: 0 })
    // The officer who published is told, with the comment as text, who is still waiting, and the caution
    // The officer's mailbox is shared with other test files: wait for this plan's acknowledgment, not any.
    const told = await waitForMail(rt.ctx.db, acct('ehs_officer').email, /^Acknowledged: .*Ammonia <b>release<\/b> plan/)
    expect(told.subject).toContain(`(version 1) by ${acct('lab_manager').name}`)
    expect(told.text_body).toContain('Read with my team <script>')
    expect(told.html_body).toContain('Read with my team &lt;script&gt;')
    expect(told.text_body).toMatch(/Still to acknowledge \(1 of 2\): Ana <i>Second<\/i> Manager/)
    expect(told.text_body).toMatch(/Screening estimate/i)
    expect(told.text_body).toContain(`/plans/${planId}`)
  })

  it('a later edit starts version 2; once published, version 1 is stale and everyone is asked again', async () => {
    const content = (await officer.get(`/api/plans/${planId}`)).body.current.content
    content.actions.notes = 'Gas technician on call: extension 4411.'
    const saved = await officer.put(`/api/plans/${planId}/draft`).send({ content }).expect(200)
    expect(saved.body.current).toMatchObject({ version: 2, status: 'draft', contentHash: null })
    expect(saved.body.versions.map((v: { version: number; status: string }) => `${v.version}:${v.status}`)).toEqual(['2:draft', '1:published'])
    // Lab managers still see version 1 while 2 is a draft
    expect((await manager2.get(`/api/plans/${planId}`).expect(200)).body.current.version).toBe(1)
    const pub = await officer.post(`/api/plans/${planId}/publish`).send({}).expect(200)
    expect(pub.body.current.contentHash).not.toBe(hash1)
    const stale = await manager2.post(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(409)
    expect(stale.body.error.code).toBe('stale_version')
    const detail = (await manager.get(`/api/plans/${planId}`).expect(200)).body
    expect(detail).toMatchObject({ canAcknowledge: true, latestPublished: 2 })
    expect(detail.managers.map((m: { state: string }) => m.state)).toEqual(['pending', 'pending'])
    await waitForMail(rt.ctx.db, acct('lab_manager').email, /version 2/)
    await manager2.post(`/api/plans/${planId}/versions/2/acknowledgments`).send({ comment: '' }).expect(201)
    // The version-1 acknowledgment stays on record
    const acks = (await officer.get(`/api/plans/${planId}`)).body.acknowledgments.map((a: { version: number; name: string }) => `${a.version}:${a.name}`)
    expect(acks).toEqual([`1:${acct('lab_manager').name}`, '2:Ana <i>Second</i> Manager'])
  })

  it('overdue when the due date has passed (by the stored due date)', async () => {
    await sql`alter table plan_versions disable trigger plan_versions_frozen`.execute(rt.ctx.db)
    await sql`update plan_versions set ack_due_at = now() - interval '1 day' where plan_id = ${planId} and version = 2`.execute(rt.ctx.db)
    await sql`alter table plan_versions enable trigger plan_versions_frozen`.execute(rt.ctx.db)
    const list = (await manager.get('/api/plans').expect(200)).body.plans.find((p: { id: number }) => p.id === planId)
    expect(list).toMatchObject({ mine: 'overdue', acks: { done: 1, pending: 0, overdue: 1 } })
  })

  it('acknowledgments and published versions cannot be altered, also in the database', async () => {
    const db = rt.ctx.db
    await expect(sql`update plan_acknowledgments set comment = 'changed' where plan_version_id in (select id from plan_versions where plan_id = ${planId})`.execute(db)).rejects.toThrow(/cannot be changed or deleted/)
    await expect(sql`delete from plan_acknowledgments where plan_version_id in (select id from plan_versions where plan_id = ${planId})`.execute(db)).rejects.toThrow(/cannot be changed or deleted/)
    await expect(sql`truncate plan_acknowledgments`.execute(db)).rejects.toThrow(/cannot be changed or deleted/)
    await expect(sql`update plan_versions set content = '{}'::jsonb where plan_id = ${planId} and version = 1`.execute(db)).rejects.toThrow(/frozen/)
    const n = await sql<{ n: number }>`select count(*)::int as n from plan_acknowledgments where plan_version_id in (select id from plan_versions where plan_id = ${planId})`.execute(db)
    expect(n.rows[0]!.n).toBe(2)
    // No API route changes or removes one
    await manager.patch(`/api/plans/${planId}/versions/1/acknowledgments`).send({}).expect(404)
    await manager.delete(`/api/plans/${planId}/versions/1/acknowledgments`).expect(404)
  })

  it('the audit log records who did what', async () => {
    const res = await officer.get(`/api/plans/${planId}/audit`).expect(200)
    const actions = res.body.entries.map((e: { action: string; actor: string }) => `${e.action}:${e.actor}`)
    expect(actions).toEqual(expect.arrayContaining([
      `plan.generated:${acct('ehs_officer').name}`, `plan.published:${acct('ehs_officer').name}`, `plan.acknowledged:${acct('lab_manager').name}`,
      'plan.acknowledged:Ana <i>Second</i> Manager', `plan.draft_saved:${acct('ehs_officer').name}`,
    ]))
  })
})

describe('the plan PDF', () => {
  it('holds the key figures, the checklist, the acknowledgment record, the hash and the cautions', async () => {
    const res = await officer.get(`/api/plans/${planId}/versions/1/pdf`).buffer(true).parse(binary).expect(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    const buf = res.body as Buffer
    expect(buf.subarray(0, 5).toString()).toBe('%PDF-')
    mkdirSync('tests/artifacts', { recursive: true })
    writeFileSync('tests/artifacts/plan-v1.pdf', buf)
    const text = pdfText(buf)
    const flat = text.replace(/\s+/g, ' ')
    const v1 = (await officer.get(`/api/plans/${planId}/versions/1`)).body
    expect(flat).toContain('Ammonia <b>release</b> plan')
    expect(flat).toContain(v1.contentHash)
    expect(flat).toMatch(/Screening estimate, not a safety determination/)
    expect(flat).toMatch(/authority having jurisdiction/)
    expect(flat).toContain('smallest time left for egress: 50 s')
    expect(flat).toContain('isolate within: 30 s')
    expect(flat).toContain('Predicted first alarm: 40 s')
    expect(flat).toContain('IDLH 300 ppm')
    expect(flat).toContain('Car park P3')
    expect(flat).toMatch(/Leave Gas room A by Door A/)
    expect(flat).toContain(acct('lab_manager').name)
    expect(flat).toContain('Read with my team <script>')
    expect(flat).toMatch(/Figure: fronts and limit areas/)
    // The caution is in every page footer
    const pages = text.split('\f').filter((p) => p.trim())
    expect(pages.length).toBeGreaterThan(2)
    for (const p of pages) expect(p.replace(/\s+/g, ' ')).toMatch(/Caution: Screening estimate only/)
  })

  it('lab managers download published versions only', async () => {
    await manager.get(`/api/plans/${planId}/versions/2/pdf`).buffer(true).parse(binary).expect(200)
    await otherManager.get(`/api/plans/${planId}/versions/2/pdf`).expect(404)
  })
})
