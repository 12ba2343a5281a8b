import { sql } from 'kysely'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { stampResult, sweepCodeVersions } from '../../server/services/staleness.service'
import { ENGINE_VERSION } from '../../shared/engine-version'
import { currentGasFingerprint } from '../../shared/gases/version'
import { signIn, startTestRuntime, waitForMail, type ApiAgent } from '../support/test-runtime'
import { fixtureFloor, fixtureSummary } from '../unit/plans-fixtures'
import { acct, insertFinishedRun, planFixture } from './plans-fixtures'
import { waitForRun } from './runs-fixtures'

/**
 * Issue 17, staleness: a change of each kind (floor plan, scenario, gas library entry, engine version) marks exactly
 * the plans built on it, with the reason in words; new results settle it; the new version is acknowledged again once.
 */
let rt: Runtime
let officer: ApiAgent
const officerName = acct('ehs_officer').name
const today = new Date().toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' })

type Fx = Awaited<ReturnType<typeof planFixture>>
const newPlan = async (floorId: number, runIds: number[], title: string) =>
  (await officer.post('/api/plans').send({ floorId, runIds, title }).expect(201)).body.id as number
const staleOf = async (id: number) => (await officer.get(`/api/plans/${id}`).expect(200)).body.staleness as null | { reasons: { kind: string; reason: string }[] }
const openRefs = async (planIds: number[]) =>
  (await rt.ctx.db.selectFrom('plan_stale_reasons').select(['plan_id', 'kind']).where('plan_id', 'in', planIds).where('cleared_at', 'is', null).orderBy('plan_id').execute())
    .map((r) => `${r.plan_id}:${r.kind}`)
const finishedRun = (fx: Fx, floorId: number, label: string, summary = fixtureSummary()) =>
  insertFinishedRun(rt, { orgId: fx.orgId, floorId, userId: fx.officerId, label, summary })
const scenarioBody = (name: string, over: Record<string, unknown> = {}) =>
  ({ name, sourceIds: ['cyl'], release: 'blowdown', durationS: 60, outputIntervalS: 10, ventilationState: 'normal', cellM: 0.5, layers: 3, ...over })

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 1 }, { background: true })
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

describe('a floor plan change', () => {
  it('marks the plans of that floor with what changed, and no plan of another floor', async () => {
    const fx = await planFixture(rt)
    const onFloor = await newPlan(fx.floorId, [fx.runId], 'Floor 1 plan')
    const otherRun = await finishedRun(fx, fx.floor2Id, 'Floor 2 run')
    const onOther = await newPlan(fx.floor2Id, [otherRun.id], 'Floor 2 plan')
    expect(await staleOf(onFloor)).toBeNull()

    // Saving the drawing unchanged (a new floor version) changes no result: nothing is marked.
    const plan = fixtureFloor()
    let v = (await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: 1, plan }).expect(200)).body.version
    expect(await openRefs([onFloor, onOther])).toEqual([])

    plan.rooms[1]!.ventilation = { mode: 'ach', airChangesPerHour: 4 }
    v = (await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: v, plan }).expect(200)).body.version
    const s = await staleOf(onFloor)
    expect(s!.reasons).toEqual([{ kind: 'floor', reason: `room Lab B's air changes changed from 6 to 4 on ${today} by ${officerName}`, at: expect.any(String) }])
    expect(await staleOf(onOther)).toBeNull()
    expect(await openRefs([onFloor, onOther])).toEqual([`${onFloor}:floor`])

    // The ceiling is part of the floor too.
    await officer.patch(`/api/floors/${fx.floorId}`).send({ ceilingHeightM: 3.5 }).expect(200)
    expect((await staleOf(onFloor))!.reasons.map((r) => r.reason)[1]).toBe(`ceiling height changed from 3 m to 3.5 m on ${today} by ${officerName}`)

    // The plans list and the overview read the same flags.
    const list = (await officer.get('/api/plans').expect(200)).body.plans as { id: number; staleness: unknown }[]
    expect(list.find((p) => p.id === onFloor)!.staleness).not.toBeNull()
    expect(list.find((p) => p.id === onOther)!.staleness).toBeNull()
  })
})

describe('a scenario change', () => {
  it('a real run records the versions it was computed with; a change of its scenario marks only the plans built on its results', async () => {
    const fx = await planFixture(rt)
    const s1 = (await officer.post(`/api/floors/${fx.floorId}/scenarios`).send(scenarioBody('Cylinder, 60 s')).expect(201)).body.id
    const s2 = (await officer.post(`/api/floors/${fx.floorId}/scenarios`).send(scenarioBody('Cylinder, door open', { ventilationState: 'door_propped_open', proppedOpeningIds: ['door-a'] })).expect(201)).body.id
    const started = await officer.post(`/api/scenarios/${s1}/runs`).expect(202)
    const { run } = await waitForRun(officer, started.body.id, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status), 120_000)
    expect(run.status).toBe('succeeded')
    const stamped = await rt.ctx.db.selectFrom('run_results').select(['engine_version', 'gas_library_version', 'gas_id', 'gas_entry_hash', 'scenario_version'])
      .where('run_id', '=', run.id).executeTakeFirstOrThrow()
    expect(stamped).toEqual({ engine_version: ENGINE_VERSION, gas_library_version: 1, gas_id: 'NH3', gas_entry_hash: currentGasFingerprint('NH3'), scenario_version: 1 })

    const other = await finishedRun(fx, fx.floorId, 'Door open')
    await sql`update runs set scenario_id = ${s2} where id = ${other.id}`.execute(rt.ctx.db)
    const onS1 = await newPlan(fx.floorId, [run.id], 'Built on scenario 1')
    const onS2 = await newPlan(fx.floorId, [other.id], 'Built on scenario 2')
    const onNeither = await newPlan(fx.floorId, [fx.runId], 'Built on neither')

    await officer.put(`/api/scenarios/${s1}`).send(scenarioBody('Cylinder, 60 s', { durationS: 120 })).expect(200)
    expect((await staleOf(onS1))!.reasons).toEqual([{ kind: 'scenario', reason: `scenario Cylinder, 60 s: duration changed from 60 s to 120 s on ${today} by ${officerName}`, at: expect.any(String) }])
    expect(await openRefs([onS1, onS2, onNeither])).toEqual([`${onS1}:scenario`])
    expect((await rt.ctx.db.selectFrom('scenarios').select('version').where('id', '=', s1).executeTakeFirstOrThrow()).version).toBe(2)

    // Saving the same settings again changes nothing and marks nothing more.
    await officer.put(`/api/scenarios/${s1}`).send(scenarioBody('Cylinder, 60 s', { durationS: 120 })).expect(200)
    expect(await openRefs([onS1, onS2, onNeither])).toEqual([`${onS1}:scenario`])

    // Refreshing from the same (older) result leaves it stale; a result started after the change settles it.
    await officer.post(`/api/plans/${onS1}/refresh`).send({ runIds: [run.id] }).expect(200)
    expect(await staleOf(onS1)).not.toBeNull()
    const rerun = await finishedRun(fx, fx.floorId, 'Cylinder, 120 s')
    await sql`update runs set scenario_id = ${s1} where id = ${rerun.id}`.execute(rt.ctx.db)
    await officer.post(`/api/plans/${onS1}/refresh`).send({ runIds: [rerun.id] }).expect(200)
    expect(await staleOf(onS1)).toBeNull()
  }, 180_000)
})

describe('a gas library entry or engine version change', () => {
  it('marks the plans whose results used the earlier gas entry, and no others in the whole database', async () => {
    const fx = await planFixture(rt)
    const older = await finishedRun(fx, fx.floorId, 'Older library')
    const current = await finishedRun(fx, fx.floorId, 'Current library')
    for (const r of [older, current]) await stampResult(rt.ctx.db, r.id, 'NH3')
    // As stored by a deployment whose ammonia entry had other values.
    await sql`update run_results set gas_entry_hash = 'deadbeef' where run_id = ${older.id}`.execute(rt.ctx.db)
    const onOlder = await newPlan(fx.floorId, [older.id], 'Older gas entry')
    const onCurrent = await newPlan(fx.floorId, [current.id], 'Current gas entry')

    const marked = await sweepCodeVersions(rt.ctx.db)
    expect(marked.map((m) => m.plan_id)).toEqual([onOlder])
    expect((await staleOf(onOlder))!.reasons[0]).toMatchObject({ kind: 'gas', reason: `the gas library entry for Ammonia changed (library version 1); result ${older.id} used the earlier values` })
    expect(await staleOf(onCurrent)).toBeNull()
    // A second sweep records nothing new.
    expect(await sweepCodeVersions(rt.ctx.db)).toEqual([])
  })

  it('marks the plans whose results came from another engine version, and no others in the whole database', async () => {
    const fx = await planFixture(rt)
    const old = await finishedRun(fx, fx.floorId, 'Old engine')
    const now = await finishedRun(fx, fx.floorId, 'Current engine')
    await sql`update run_results set engine_version = ${ENGINE_VERSION - 1} where run_id = ${old.id}`.execute(rt.ctx.db)
    const onOld = await newPlan(fx.floorId, [old.id], 'Old engine plan')
    const onNow = await newPlan(fx.floorId, [now.id], 'Current engine plan')
    const both = await newPlan(fx.floorId, [now.id, old.id], 'Mixed plan')

    const marked = await sweepCodeVersions(rt.ctx.db)
    expect(marked.map((m) => m.plan_id).sort()).toEqual([onOld, both].sort())
    expect((await staleOf(both))!.reasons).toEqual([{ kind: 'engine', at: expect.any(String),
      reason: `the engine is now at version ${ENGINE_VERSION} (its outputs changed); result ${old.id} came from version ${ENGINE_VERSION - 1}` }])
    expect(await staleOf(onNow)).toBeNull()
    // Results of the current engine settle it.
    await officer.post(`/api/plans/${both}/refresh`).send({ runIds: [now.id] }).expect(200)
    expect(await staleOf(both)).toBeNull()
  })
})

describe('acknowledging again', () => {
  it('a new version built on new results asks each lab manager once, with the difference summarised', async () => {
    const fx = await planFixture(rt)
    const id = await newPlan(fx.floorId, [fx.runId], 'Re-acknowledged plan')
    await officer.post(`/api/plans/${id}/publish`).send({}).expect(200)
    await waitForMail(rt.ctx.db, fx.manager2.email, /Please acknowledge: Re-acknowledged plan \(version 1\)/)
    const basis1 = (await rt.ctx.db.selectFrom('plan_versions').select('basis').where('plan_id', '=', id).where('version', '=', 1).executeTakeFirstOrThrow()).basis
    expect(basis1).toMatchObject({ floorId: fx.floorId, floorVersion: 1, runs: [{ runId: fx.runId, engineVersion: ENGINE_VERSION, floorVersion: 1 }] })

    const plan = fixtureFloor()
    plan.rooms[0]!.ventilation = { mode: 'ach', airChangesPerHour: 5 }
    await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: 1, plan }).expect(200)
    expect(await staleOf(id)).not.toBeNull()
    // Less extract in the gas room: IDLH at bench A 30 s sooner (a made-up result of the re-run).
    const summary = fixtureSummary()
    summary.receptors.find((r) => r.id === 'ws-a')!.firstExceedS.idlh = 120
    const rerun = await finishedRun(fx, fx.floorId, 'After the change', summary)
    await officer.post(`/api/plans/${id}/refresh`).send({ runIds: [rerun.id] }).expect(200)
    expect(await staleOf(id)).toBeNull()
    await officer.post(`/api/plans/${id}/publish`).send({}).expect(200)

    const mail = await waitForMail(rt.ctx.db, fx.manager2.email, /Please acknowledge: Re-acknowledged plan \(version 2\)/)
    expect(mail.text_body).toContain(`Why there is a new version: room Gas room A's air changes changed from 10 to 5 on ${today} by ${officerName}.`)
    expect(mail.text_body).toContain('Times to limits, version 1 → this version (earliest first): Bench A: IDLH 300 ppm: 150 s → 120 s (30 s sooner).')

    // More marks, saves and refreshes without a publish ask nobody again; a second publish of nothing is refused.
    plan.rooms[0]!.ventilation = { mode: 'ach', airChangesPerHour: 6 }
    await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: 2, plan }).expect(200)
    await officer.post(`/api/plans/${id}/publish`).send({}).expect(409)
    await new Promise((r) => setTimeout(r, 500))
    const asks = await rt.ctx.db.selectFrom('outgoing_mail').select(['ref', 'to_address']).where('kind', '=', 'plan_ack_request').where('ref', 'like', `plan:${id}:%`).orderBy('id').execute()
    expect(asks.map((a) => (a.ref ?? "").replace(/:user:\d+$/, '')).sort()).toEqual([`plan:${id}:v1`, `plan:${id}:v1`, `plan:${id}:v2`, `plan:${id}:v2`])
    const captured = await rt.ctx.db.selectFrom('captured_mail').select('subject').where(sql<boolean>`${fx.manager2.email} = any(envelope_to)`)
      .where('subject', 'like', 'Please acknowledge: Re-acknowledged plan%').execute()
    expect(captured.map((c) => c.subject).sort()).toEqual(['Please acknowledge: Re-acknowledged plan (version 1)', 'Please acknowledge: Re-acknowledged plan (version 2)'])
  })
})

describe('bringing a plan up to date', () => {
  it('one action re-runs the scenarios on the floor as it is now, refreshes the draft, shows old against new times, publishes and asks again', async () => {
    const fx = await planFixture(rt)
    const s1 = (await officer.post(`/api/floors/${fx.floorId}/scenarios`).send(scenarioBody('Cylinder for update', { durationS: 120 })).expect(201)).body.id
    const first = await officer.post(`/api/scenarios/${s1}/runs`).expect(202)
    await waitForRun(officer, first.body.id, (r) => r.status === 'succeeded', 120_000)
    const id = await newPlan(fx.floorId, [first.body.id], 'Plan brought up to date')
    await officer.post(`/api/plans/${id}/publish`).send({}).expect(200)

    // Nothing can be re-run for a plan built on results without a scenario.
    const bare = await newPlan(fx.floorId, [fx.runId], 'No scenario')
    expect((await officer.post(`/api/plans/${bare}/bring-up-to-date`).send({}).expect(409)).body.error.code).toBe('nothing_to_rerun')
    expect((await officer.post(`/api/plans/${id}/bring-up-to-date`).send({ ackDueDays: 0 }).expect(400)).body.error.fields).toHaveProperty('ackDueDays')
    const manager = await signIn(rt, acct('lab_manager').email, acct('lab_manager').password)
    await manager.post(`/api/plans/${id}/bring-up-to-date`).send({}).expect(403)

    // The gas room loses most of its extract.
    const plan = fixtureFloor()
    plan.rooms[0]!.ventilation = { mode: 'ach', airChangesPerHour: 1 }
    await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: 1, plan }).expect(200)
    expect(await staleOf(id)).not.toBeNull()

    const asked = await officer.post(`/api/plans/${id}/bring-up-to-date`).send({ publish: true, ackDueDays: 7 }).expect(202)
    expect(asked.body).toMatchObject({ status: 'waiting', runIds: [expect.any(Number)] })
    await officer.post(`/api/plans/${id}/bring-up-to-date`).send({}).expect(409)
    const rerunId = asked.body.runIds[0] as number
    expect(rerunId).not.toBe(first.body.id)
    await waitForRun(officer, rerunId, (r) => r.status === 'succeeded', 120_000)
    const t0 = Date.now()
    let update = asked.body
    while (update.status === 'waiting' && Date.now() - t0 < 30_000) {
      await new Promise((r) => setTimeout(r, 300))
      update = (await officer.get(`/api/plans/${id}/update`).expect(200)).body
    }
    expect(update.status).toBe('published')
    const detail = (await officer.get(`/api/plans/${id}`).expect(200)).body
    expect(detail).toMatchObject({ latestPublished: 2, runIds: [rerunId], staleness: null, update: { status: 'published' } })
    // The re-run used the floor as drawn now (version 2) and the published basis says so.
    const basis = (await rt.ctx.db.selectFrom('plan_versions').select('basis').where('plan_id', '=', id).where('version', '=', 2).executeTakeFirstOrThrow()).basis
    expect(basis).toMatchObject({ floorVersion: 2, runs: [{ runId: rerunId, floorVersion: 2, scenarioId: s1, scenarioVersion: 1, engineVersion: ENGINE_VERSION }] })

    // What changed in the numbers: old against new, read here straight from the two stored summaries.
    const sums = await rt.ctx.db.selectFrom('run_results').select(['run_id', 'summary']).where('run_id', 'in', [first.body.id, rerunId]).execute()
    type Sum = { limits: { key: string; label: string }[]; rooms: { name: string; firstExceedS: Record<string, number | null> }[] }
    const sumOf = (runId: number) => sums.find((s) => s.run_id === runId)!.summary as Sum
    const expected: string[] = []
    for (const room of sumOf(rerunId).rooms) {
      const old = sumOf(first.body.id).rooms.find((r) => r.name === room.name)!
      for (const [k, t] of Object.entries(room.firstExceedS)) {
        const was = old.firstExceedS[k] ?? null
        if (was === t) continue
        const label = sumOf(rerunId).limits.find((l) => l.key === k)!.label
        expected.push(`room ${room.name}: ${label}: ${was === null ? 'not reached' : `${Math.round(was)} s`} → ${t === null ? 'not reached' : `${Math.round(t)} s`}`)
      }
    }
    expect(expected.length).toBeGreaterThan(0)
    for (const e of expected) expect(update.changes.some((c: string) => c.startsWith(e))).toBe(true)

    const mail = await waitForMail(rt.ctx.db, fx.manager2.email, /Please acknowledge: Plan brought up to date \(version 2\)/)
    expect(mail.text_body).toContain("Why there is a new version: room Gas room A's air changes changed from 10 to 1")
    const asks = await rt.ctx.db.selectFrom('outgoing_mail').select('ref').where('kind', '=', 'plan_ack_request').where('ref', 'like', `plan:${id}:v2:%`).execute()
    expect(asks).toHaveLength(2)
  }, 240_000)
})
