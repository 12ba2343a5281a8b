import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { utcToLocal } from '../../shared/drills/time'
import type { Runtime } from '../../server/runtime'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, planFixture } from './plans-fixtures'

// Issue 14 item 3: a PATCH changes only the fields it was given. Defaults inside `.partial()` used to put back
// managerIds: [], memberIds: [] on a floor rename and an empty address on a site rename.
let rt: Runtime
let officer: ApiAgent
let admin: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>

beforeAll(async () => {
  rt = await startTestRuntime()
  fx = await planFixture(rt)
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
  admin = await signIn(rt, acct('admin').email, acct('admin').password)
})
afterAll(() => rt.close())

describe('PATCH changes only what it is sent', () => {
  it('PATCH /api/floors/:id with a name keeps the floor\'s managers, members and ceiling', async () => {
    const before = (await officer.get(`/api/floors/${fx.floorId}`).expect(200)).body
    expect(before.managerIds.length).toBeGreaterThan(0)
    expect(before.memberIds.length).toBeGreaterThan(0)
    const res = await officer.patch(`/api/floors/${fx.floorId}`).send({ name: 'Level 1 renamed' }).expect(200)
    expect(res.body.name).toBe('Level 1 renamed')
    expect(res.body.managerIds.sort()).toEqual(before.managerIds.sort())
    expect(res.body.memberIds.sort()).toEqual(before.memberIds.sort())
    expect(res.body.ceilingHeightM).toBe(before.ceilingHeightM)
    // And sending only the people keeps the name.
    const people = await officer.patch(`/api/floors/${fx.floorId}`).send({ memberIds: [] }).expect(200)
    expect(people.body.name).toBe('Level 1 renamed')
    expect(people.body.memberIds).toEqual([])
    expect(people.body.managerIds.sort()).toEqual(before.managerIds.sort())
  })

  it('PATCH /api/sites/:id with a name keeps the address, and with an address keeps the name', async () => {
    const created = (await officer.post('/api/sites').send({ name: `Partial site ${Date.now()}`, address: '12 Harbour Road, Calder' }).expect(201)).body
    const renamed = (await officer.patch(`/api/sites/${created.id}`).send({ name: `${created.name} (east)` }).expect(200)).body
    expect(renamed.address).toBe('12 Harbour Road, Calder')
    const moved = (await officer.patch(`/api/sites/${created.id}`).send({ address: '14 Harbour Road' }).expect(200)).body
    expect(moved).toMatchObject({ name: `${created.name} (east)`, address: '14 Harbour Road' })
  })

  it('PATCH /api/drill-findings/:id with a status keeps the note', async () => {
    const plan = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Partial update plan' }).expect(201)).body
    await officer.post(`/api/plans/${plan.id}/publish`).send({}).expect(200)
    const local = utcToLocal(new Date(Date.now() + 7 * 86_400_000), 'Europe/Berlin')
    const drill = (await officer.post('/api/drills').send({
      planId: plan.id, planVersion: 1, title: 'Partial update drill', date: local.date, time: local.time, timeZone: 'Europe/Berlin', durationMinutes: 30,
      location: 'Gas room A', scenario: 'Ammonia cylinder leak', officerId: fx.officerId, reminderMinutes: 60, participants: { groups: [], userIds: [], guests: [{ name: 'Visiting Auditor', email: 'auditor@partial.invalid' }] },
    }).expect(201)).body
    const added = (await officer.post(`/api/drills/${drill.id}/findings`).send({ finding: 'Door A blocked', action: 'Keep it clear', ownerId: fx.managerId, dueDate: '2027-01-31' }).expect(201)).body
    const f = added.findings[0]
    await officer.patch(`/api/drill-findings/${f.id}`).send({ status: 'closed', note: 'Markings painted' }).expect(200)
    const reopened = (await officer.patch(`/api/drill-findings/${f.id}`).send({ status: 'open' }).expect(200)).body
    expect(reopened.findings[0]).toMatchObject({ status: 'open', note: 'Markings painted' })
  })

  it('PATCH /api/users/:id with a name keeps the role and status; PATCH preferences keeps the name', async () => {
    const list = (await admin.get('/api/users').expect(200)).body.users
    const staff = list.find((u: { email: string }) => u.email === acct('staff').email)
    const res = (await admin.patch(`/api/users/${staff.id}`).send({ name: 'Sam Staff (renamed)' }).expect(200)).body
    expect(res).toMatchObject({ role: staff.role, status: staff.status, name: 'Sam Staff (renamed)' })
    await admin.patch(`/api/users/${staff.id}`).send({ name: staff.name }).expect(200)
    const me = (await officer.get('/api/auth/me').expect(200)).body
    const pref = (await officer.patch('/api/auth/preferences').send({ unitSystem: 'imperial' }).expect(200)).body
    expect(pref).toMatchObject({ name: me.name, role: me.role, email: me.email })
  })
})
