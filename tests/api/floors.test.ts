import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { demoFloorPlan, ensureDemoSite, seedDemoFloor } from '../../server/seed/demo-floor'
import { emptyPlan } from '../../shared/floorplan/plan-schema'
import { contract, pathOf } from '../../shared/contract'
import { createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { rectRoom, source } from '../unit/floorplan-fixtures'

const acct = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!
const as = (role: string) => signIn(rt, acct(role).email, acct(role).password)

let rt: Runtime
let officer: ApiAgent
let siteId: number
let userIds: Record<string, number>

beforeAll(async () => {
  rt = await startTestRuntime()
  officer = await as('ehs_officer')
  // The demo accounts by e-mail: other test files add more people with the same roles.
  const people = (await officer.get(contract.sites.people.path).expect(200)).body.people as { id: number; role: string; email?: string; name: string }[]
  userIds = Object.fromEntries(DEMO_ACCOUNTS.map((a) => [a.role, people.find((p) => p.name === a.name)!.id]))
  siteId = (await officer.post(contract.sites.create.path).send({ name: `Site ${Date.now()}`, address: '1 Test Way' }).expect(201)).body.id
})
afterAll(() => rt.close())

async function newFloor(over: Record<string, unknown> = {}) {
  const res = await officer.post(pathOf(contract.sites.createFloor, { id: siteId }))
    .send({ name: `Floor ${Math.random().toString(36).slice(2, 7)}`, ceilingHeightM: 3, managerIds: [userIds.lab_manager], memberIds: [userIds.staff], ...over })
    .expect(201)
  return res.body as { id: number; version: number }
}

function validPlan() {
  return { ...emptyPlan(), rooms: [rectRoom('a', 0, 0, 6, 4), rectRoom('b', 6, 0, 12, 4)],
    openings: [{ id: 'd1', name: 'D1', kind: 'door', segment: [[6, 1], [6, 2]], open: true },
      { id: 'x1', name: 'Stair door', kind: 'door', segment: [[12, 1], [12, 2]], open: false, exit: 'stair' }],
    sources: [source('s1', 1, 1)],
    detectors: [{ id: 'det1', name: 'NH3 detector', gasId: 'NH3', position: [2, 2], mountingHeightM: 2.5, alarmLowPpm: 12.5, alarmHighPpm: 35 }] }
}

describe('POST /api/sites/:id/floors', () => {
  it('creates a floor with its people, an empty plan at version 1', async () => {
    const floor = await newFloor({ name: 'Level 1' })
    const res = await officer.get(pathOf(contract.floors.get, { id: floor.id })).expect(200)
    expect(res.body).toMatchObject({ name: 'Level 1', ceilingHeightM: 3, version: 1, siteId, managerIds: [userIds.lab_manager],
      memberIds: [userIds.staff], planValid: false, canEdit: true })
    expect(res.body.plan.rooms).toEqual([])
  })
  it('names the field of a bad value', async () => {
    const res = await officer.post(pathOf(contract.sites.createFloor, { id: siteId })).send({ name: '', ceilingHeightM: 0.5 }).expect(400)
    expect(res.body.error.code).toBe('validation_failed')
    expect(res.body.error.fields).toMatchObject({ name: expect.any(String), ceilingHeightM: 'At least 1.8 m' })
  })
  it('refuses staff as the responsible lab manager', async () => {
    const res = await officer.post(pathOf(contract.sites.createFloor, { id: siteId })).send({ name: 'X', ceilingHeightM: 3, managerIds: [userIds.staff] }).expect(400)
    expect(res.body.error.fields['managerIds.0']).toMatch(/lab manager/)
  })
  it('answers 404 for a site that does not exist', async () => {
    await officer.post(pathOf(contract.sites.createFloor, { id: 999999 })).send({ name: 'X', ceilingHeightM: 3 }).expect(404)
  })
})

describe('PUT /api/floors/:id/plan', () => {
  it('saves a valid plan, bumps the version and reads back the same document', async () => {
    const floor = await newFloor()
    const res = await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan: validPlan() }).expect(200)
    expect(res.body).toMatchObject({ version: 2, planValid: true, problems: [] })
    const back = await officer.get(pathOf(contract.floors.get, { id: floor.id })).expect(200)
    expect(back.body.version).toBe(2)
    expect(back.body.plan.rooms.map((r: { id: string }) => r.id)).toEqual(['a', 'b'])
    expect(back.body.plan.openings[0].segment).toEqual([[6, 1], [6, 2]])
    expect(back.body.roomCount).toBe(2)
  })
  it('stores a draft with problems, marked invalid, listing them', async () => {
    const floor = await newFloor()
    const plan = validPlan()
    plan.rooms[1] = rectRoom('b', 5, 0, 12, 4)
    const res = await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan }).expect(200)
    expect(res.body.planValid).toBe(false)
    expect(res.body.problems.map((p: { code: string }) => p.code)).toContain('room_overlap')
    expect((await officer.get(pathOf(contract.floors.get, { id: floor.id }))).body.planValid).toBe(false)
  })
  it('answers 409 stale_version when someone saved in between, and keeps their save', async () => {
    const floor = await newFloor()
    await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan: validPlan() }).expect(200)
    const res = await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan: emptyPlan() }).expect(409)
    expect(res.body.error.code).toBe('stale_version')
    const back = await officer.get(pathOf(contract.floors.get, { id: floor.id }))
    expect(back.body.version).toBe(2)
    expect(back.body.plan.rooms).toHaveLength(2)
  })
  it('refuses a malformed plan naming the field', async () => {
    const floor = await newFloor()
    const plan = validPlan() as Record<string, any>
    plan.rooms[0].ventilation = { mode: 'ach', airChangesPerHour: -3 }
    plan.sources[0].gasId = ''
    const res = await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan }).expect(400)
    expect(res.body.error.fields).toMatchObject({ 'plan.rooms.0.ventilation.airChangesPerHour': 'Cannot be negative', 'plan.sources.0.gasId': 'Choose a gas' })
  })
  it('re-checks the plan when the ceiling is lowered below a release height', async () => {
    const floor = await newFloor()
    const plan = validPlan()
    plan.sources[0]!.releaseHeightM = 2.8
    await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan }).expect(200)
    const res = await officer.patch(pathOf(contract.floors.update, { id: floor.id })).send({ ceilingHeightM: 2.5 }).expect(200)
    expect(res.body.planValid).toBe(false)
    expect(res.body.problems[0].code).toBe('above_ceiling')
  })
})

describe('GET /api/floors/:id/scenario', () => {
  it('exports a valid floor as a scenario file', async () => {
    const floor = await newFloor()
    await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan: validPlan() }).expect(200)
    const res = await officer.get(pathOf(contract.floors.exportScenario, { id: floor.id })).expect(200)
    expect(res.body).toMatchObject({ format: 'driftwarden-scenario/1', ceiling_m: 3, gas: { id: 'NH3' } })
    expect(res.headers['content-disposition']).toMatch(/attachment/)
  })
  it('refuses an invalid floor with 400 listing the reasons by path', async () => {
    const floor = await newFloor()
    const plan = validPlan()
    plan.openings[0]!.segment = [[3, 1], [3, 2]]
    plan.sources[0]!.gasId = 'XYZ'
    await officer.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan }).expect(200)
    const res = await officer.get(pathOf(contract.floors.exportScenario, { id: floor.id })).expect(400)
    expect(res.body.error.code).toBe('plan_invalid')
    expect(Object.keys(res.body.error.fields)).toEqual(['openings.0.segment', 'sources.0.gasId'])
  })
})

describe('roles', () => {
  it('staff and lab managers cannot create, edit or save (403)', async () => {
    const floor = await newFloor()
    for (const role of ['staff', 'lab_manager']) {
      const a = await as(role)
      await a.post(contract.sites.create.path).send({ name: 'Nope' }).expect(403)
      await a.post(pathOf(contract.sites.createFloor, { id: siteId })).send({ name: 'Nope', ceilingHeightM: 3 }).expect(403)
      await a.patch(pathOf(contract.floors.update, { id: floor.id })).send({ name: 'Nope' }).expect(403)
      await a.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan: validPlan() }).expect(403)
    }
  })
  it('staff see the floors they are assigned to, read-only, and not the others (404)', async () => {
    const mine = await newFloor()
    const notMine = await newFloor({ memberIds: [], managerIds: [] })
    const staff = await as('staff')
    const res = await staff.get(pathOf(contract.floors.get, { id: mine.id })).expect(200)
    expect(res.body.canEdit).toBe(false)
    await staff.get(pathOf(contract.floors.get, { id: notMine.id })).expect(404)
    const list = (await staff.get(contract.floors.list.path).expect(200)).body.floors.map((f: { id: number }) => f.id)
    expect(list).toContain(mine.id)
    expect(list).not.toContain(notMine.id)
  })
  it('lab managers see the floors they are responsible for', async () => {
    const mine = await newFloor({ memberIds: [] })
    const other = await newFloor({ managerIds: [] , memberIds: [] })
    const mgr = await as('lab_manager')
    await mgr.get(pathOf(contract.floors.get, { id: mine.id })).expect(200)
    await mgr.get(pathOf(contract.floors.get, { id: other.id })).expect(404)
    const sites = (await mgr.get(contract.sites.list.path).expect(200)).body.sites
    expect(sites.find((s: { id: number }) => s.id === siteId).floorCount).toBeGreaterThan(0)
  })
  it('officers can reassign people', async () => {
    const floor = await newFloor({ memberIds: [] })
    const res = await officer.patch(pathOf(contract.floors.update, { id: floor.id })).send({ memberIds: [userIds.staff] }).expect(200)
    expect(res.body.memberIds).toEqual([userIds.staff])
    await (await as('staff')).get(pathOf(contract.floors.get, { id: floor.id })).expect(200)
  })
})

describe('organization isolation', () => {
  it("another organization's officer cannot see, save, export or list the floor (404)", async () => {
    const floor = await newFloor()
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const stranger = await signIn(rt, other.users.ehs_officer.email, other.password)
    await stranger.get(pathOf(contract.floors.get, { id: floor.id })).expect(404)
    await stranger.put(pathOf(contract.floors.savePlan, { id: floor.id })).send({ version: 1, plan: validPlan() }).expect(404)
    await stranger.patch(pathOf(contract.floors.update, { id: floor.id })).send({ name: 'Mine now' }).expect(404)
    await stranger.get(pathOf(contract.floors.exportScenario, { id: floor.id })).expect(404)
    await stranger.get(pathOf(contract.sites.floors, { id: siteId })).expect(404)
    await stranger.post(pathOf(contract.sites.createFloor, { id: siteId })).send({ name: 'X', ceilingHeightM: 3 }).expect(404)
    expect((await stranger.get(contract.floors.list.path).expect(200)).body.floors).toEqual([])
    expect((await stranger.get(contract.sites.list.path).expect(200)).body.sites).toEqual([])
  })
  it('refuses assigning people of another organization', async () => {
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const res = await officer.post(pathOf(contract.sites.createFloor, { id: siteId })).send({ name: 'X', ceilingHeightM: 3, memberIds: [other.users.staff.id] }).expect(400)
    expect(res.body.error.fields['memberIds.0']).toMatch(/No such person/)
  })
})

describe('demo floor seed', () => {
  it('adds one valid floor and is idempotent', async () => {
    const orgId = (await rt.ctx.db.selectFrom('users').select('org_id').where('id', '=', userIds.staff!).executeTakeFirstOrThrow()).org_id
    const demoSite = await ensureDemoSite(rt.ctx.db, orgId, 'Demo site for test')
    expect(await ensureDemoSite(rt.ctx.db, orgId, 'Demo site for test')).toBe(demoSite)
    const a = await seedDemoFloor(rt.ctx.db, { orgId, siteId: demoSite, labManagerIds: [userIds.lab_manager!], staffIds: [userIds.staff!] })
    const b = await seedDemoFloor(rt.ctx.db, { orgId, siteId: demoSite, labManagerIds: [userIds.lab_manager!], staffIds: [userIds.staff!] })
    expect(b.floorId).toBe(a.floorId)
    const floors = (await officer.get(pathOf(contract.sites.floors, { id: demoSite })).expect(200)).body.floors
    expect(floors).toHaveLength(1)
    const floor = (await (await as('staff')).get(pathOf(contract.floors.get, { id: a.floorId })).expect(200)).body
    expect(floor.planValid).toBe(true)
    expect(floor.plan.sources).toHaveLength(demoFloorPlan().sources.length)
  })
})
