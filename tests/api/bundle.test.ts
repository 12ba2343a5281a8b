import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertFloor } from '../../server/repositories/floors.repo'
import type { Runtime } from '../../server/runtime'
import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { conservativeCase } from '../../shared/runs/bundle'
import { RunBundle } from '../../shared/schemas/bundles'
import { RunDetail, type RunSummary } from '../../shared/schemas/runs'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { shortcutPlan } from './egress-fixtures'
import { acct, demoFloorAndScenario, waitForRun } from './runs-fixtures'

/**
 * Issue 17, items 1–4: a run of a scenario with its sensitivity cases on is a bundle of ordinary runs (D ×0.3 and ×3,
 * the named ventilation failure, the leak moved 1 m each way inside its room), each its own job; the band's edges and
 * the case named as driving the earliest equal what the same cases give when run separately as scenarios of their
 * own (the position cases on floors where the cylinder is drawn 1 m away).
 */
let rt: Runtime
let officer: ApiAgent
let orgId: number
let siteId: number

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 2 }, { background: true })
  ;({ orgId } = await demoFloorAndScenario(rt))
  siteId = (await rt.ctx.db.selectFrom('sites').select('id').where('org_id', '=', orgId).orderBy('id').executeTakeFirstOrThrow()).id
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

let n = 0
async function floorWith(dx: number, dy: number) {
  const plan = shortcutPlan()
  const src = plan.sources[0]!
  src.position = [src.position[0] + dx, src.position[1] + dy]
  const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
  return (await insertFloor(rt.ctx.db, { orgId, siteId, name: `Bundle floor ${Date.now()}-${++n}`, ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: null })).id
}
const base = { sourceIds: ['cyl'], durationS: 120, outputIntervalS: 10, cellM: 0.5, layers: 4 }
async function scenario(floorId: number, name: string, over: Record<string, unknown> = {}) {
  return (await officer.post(`/api/floors/${floorId}/scenarios`).send({ ...base, name, ...over }).expect(201)).body.id as number
}
async function runOf(scenarioId: number) {
  const started = await officer.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
  return started.body.id as number
}
async function finished(runId: number): Promise<RunSummary> {
  const { run } = await waitForRun(officer, runId, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status), 120_000)
  expect(run.status).toBe('succeeded')
  return RunDetail.parse(run).summary!
}

describe('sensitivity bundles', () => {
  it('queues the cases as separate runs, and the band edges equal the same cases run separately', async () => {
    const floorId = await floorWith(0, 0)
    const bad = await officer.post(`/api/floors/${floorId}/scenarios`).send({ ...base, name: 'Bad', sensitivity: { ventilationFailure: 'windows_open' } }).expect(400)
    expect(Object.keys(bad.body.error.fields)).toContain('sensitivity.ventilationFailure')

    const sc = await scenario(floorId, 'NH3 bundle', { sensitivity: { enabled: true, ventilationFailure: 'exhaust_failed', positions: true } })
    const nominalId = await runOf(sc)
    let b = RunBundle.parse((await officer.get(`/api/runs/${nominalId}/bundle`).expect(200)).body)
    // The cylinder sits 1 m from the gas room's south wall: that position is left out, the other three are run.
    expect(b.cases.map((c) => c.key)).toEqual(['nominal', 'd_x0.3', 'd_x3', 'vent_exhaust_failed', 'pos_east', 'pos_west', 'pos_north'])
    expect(new Set(b.cases.map((c) => c.runId)).size).toBe(7)
    const nominal = await finished(nominalId)
    for (let i = 0; i < 600 && !b.complete; i++) {
      await new Promise((r) => setTimeout(r, 200))
      b = RunBundle.parse((await officer.get(`/api/runs/${nominalId}/bundle`).expect(200)).body)
    }
    expect(b.complete).toBe(true)
    expect(b.cases.every((c) => c.status === 'succeeded')).toBe(true)
    // Lists show what the officer started: the nominal run, not its cases (they are reached through the bundle).
    const listed = ((await officer.get(`/api/floors/${floorId}/runs`).expect(200)).body.runs as { id: number }[]).map((r) => r.id)
    expect(listed).toContain(nominalId)
    for (const c of b.cases.slice(1)) expect(listed).not.toContain(c.runId)
    // A member answers for its bundle.
    expect(RunBundle.parse((await officer.get(`/api/runs/${b.cases[1]!.runId}/bundle`).expect(200)).body).nominalRunId).toBe(nominalId)
    expect(b.cost.runs).toBe(7)
    expect(b.cost.text).toMatch(/^7 runs \(the nominal and 6 sensitivity cases\): [\d.]+ s of worker time against [\d.]+ s for the nominal alone \(×[\d.]+\)/)

    // The same cases as scenarios of their own: D given explicitly, the failure as the scenario's state, the cylinder drawn 1 m away.
    const D = nominal.diffusivityM2S
    const separate: Record<string, number> = {
      'd_x0.3': await runOf(await scenario(floorId, 'D low', { diffusivityM2S: D * 0.3 })),
      d_x3: await runOf(await scenario(floorId, 'D high', { diffusivityM2S: D * 3 })),
      vent_exhaust_failed: await runOf(await scenario(floorId, 'Exhaust off', { ventilationState: 'exhaust_failed' })),
      pos_east: await runOf(await scenario(await floorWith(1, 0), 'East')),
      pos_west: await runOf(await scenario(await floorWith(-1, 0), 'West')),
      pos_north: await runOf(await scenario(await floorWith(0, 1), 'North')),
    }
    const sums: { key: string; s: RunSummary }[] = [{ key: 'nominal', s: nominal }]
    for (const [key, id] of Object.entries(separate)) sums.push({ key, s: await finished(id) })
    expect(sums.find((x) => x.key === 'd_x3')!.s.diffusivityM2S).toBeCloseTo(3 * D, 12)

    let checked = 0
    for (const row of b.band.filter((r) => r.kind !== 'first_alarm')) {
      const pick = (s: RunSummary) => (row.kind === 'receptor' ? s.receptors.find((x) => x.id === row.id) : s.rooms.find((x) => x.id === row.id))?.firstExceedS[row.limitKey] ?? null
      const vals = sums.map((x) => ({ key: x.key, t: pick(x.s) }))
      const reached = vals.filter((v) => v.t !== null) as { key: string; t: number }[]
      const earliest = reached.length ? Math.min(...reached.map((v) => v.t)) : null
      expect(row.nominalS, `${row.name} ${row.limitKey}`).toBe(pick(nominal))
      expect(row.earliestS, `${row.name} ${row.limitKey}`).toBe(earliest)
      expect(row.latestS, `${row.name} ${row.limitKey}`).toBe(reached.length === vals.length ? Math.max(...reached.map((v) => v.t)) : null)
      if (earliest !== null) {
        expect(reached.find((v) => v.t === earliest)!.key, `${row.name} ${row.limitKey}`).toBe(row.earliestCase)
        checked++
      }
    }
    // Enough times were reached for the check to mean something, and the cases do differ.
    expect(checked).toBeGreaterThanOrEqual(5)
    expect(b.band.some((r) => r.earliestS !== null && r.latestS !== null && r.latestS > r.earliestS)).toBe(true)
    // The fronts map's band: cell by cell the earliest and latest over the cases' own stored fronts.
    const bin = (r: import('supertest').Response) => new Float32Array(new Uint8Array(r.body).buffer)
    const getBin = (url: string) => officer.get(url).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = []
      res.on('data', (x: Buffer) => chunks.push(x)).on('end', () => cb(null, Buffer.concat(chunks)))
    })
    const band3 = bin(await getBin(`/api/runs/${nominalId}/bundle/fronts?limitKey=idlh`).expect(200))
    const metaOf = async (id: number) => RunDetail.parse((await officer.get(`/api/runs/${id}`).expect(200)).body).meta!
    const meta = await metaOf(nominalId)
    const nPlan = meta.nx * meta.ny
    const k = meta.limits.findIndex((l) => l.key === 'idlh')
    const casePlanes = await Promise.all(b.cases.map(async (c) => bin(await getBin(`/api/runs/${c.runId}/fields`).expect(200)).slice((meta.timesS.length + k) * nPlan, (meta.timesS.length + k + 1) * nPlan)))
    expect(band3.length).toBe(3 * nPlan)
    let differ = 0
    for (let i = 0; i < nPlan; i++) {
      const vs = casePlanes.map((p) => p[i]!)
      if (vs.some(Number.isNaN)) { expect(band3[nPlan + i]).toBeNaN(); continue }
      expect(band3[i]).toBe(casePlanes[0]![i])
      expect(band3[nPlan + i]).toBe(Math.fround(Math.min(...vs)))
      expect(band3[2 * nPlan + i]).toBe(Math.fround(Math.max(...vs)))
      if (band3[2 * nPlan + i]! > band3[nPlan + i]!) differ++
    }
    expect(differ).toBeGreaterThan(0)
    const badKey = await officer.get(`/api/runs/${nominalId}/bundle/fronts?limitKey=nope`).expect(400)
    expect(badKey.body.error.fields).toHaveProperty('limitKey')
    for (const p of b.peaks) {
      const peaks = sums.map((x) => x.s.receptors.find((r) => r.id === p.id)!.peakPpm)
      expect(p.highPpm).toBe(Math.max(...peaks))
      expect(p.lowPpm).toBe(Math.min(...peaks))
    }
  }, 300_000)

  it('a scenario with the cases off is a bundle of one, and says how to turn them on', async () => {
    const floorId = await floorWith(0, 0)
    const id = await runOf(await scenario(floorId, 'Single'))
    await finished(id)
    const b = RunBundle.parse((await officer.get(`/api/runs/${id}/bundle`).expect(200)).body)
    expect(b.cases.map((c) => c.key)).toEqual(['nominal'])
    expect(b.cost.text).toMatch(/^A single run: the sensitivity cases are off/)
    expect(b.band.every((r) => r.earliestS === r.nominalS && r.earliestCase === (r.nominalS === null ? null : 'nominal'))).toBe(true)
  }, 120_000)

  it('a plan from a bundled result uses its conservative end, says so, and gives the nominal beside it', async () => {
    const floorId = await floorWith(0, 0)
    // The office's desk is the workstation; the corridor and the office see the gas only through doors.
    const sc = await scenario(floorId, 'NH3 plan bundle', { durationS: 180, sensitivity: { enabled: true, ventilationFailure: 'exhaust_failed', positions: false } })
    const nominalId = await runOf(sc)
    await finished(nominalId)
    let b = RunBundle.parse((await officer.get(`/api/runs/${nominalId}/bundle`).expect(200)).body)
    for (let i = 0; i < 600 && !b.complete; i++) {
      await new Promise((r) => setTimeout(r, 200))
      b = RunBundle.parse((await officer.get(`/api/runs/${nominalId}/bundle`).expect(200)).body)
    }
    expect(b.cases.map((c) => c.key)).toEqual(['nominal', 'd_x0.3', 'd_x3', 'vent_exhaust_failed'])
    const cases = await Promise.all(b.cases.map(async (c) => ({ ...c, summary: await finished(c.runId) })))
    const pick = conservativeCase(cases)!
    const plan = (await officer.post('/api/plans').send({ floorId, runIds: [nominalId] }).expect(201)).body
    const content = plan.current.content
    expect(plan.runIds).toEqual([nominalId])
    expect(content.summary).toContain('Times are the conservative end of the sensitivity band of NH3 plan bundle (4 cases; the case reaching a critical level first)')
    expect(content.summary).toMatch(/Nominal beside it: first alarm .+, smallest time left for egress .+, isolate within .+\./)
    // The timeline is the picked case's, row for row (its own run id in each row).
    const critS = pick.summary.rooms.find((r) => r.id === 'S')!.firstExceedS.idlh
    const row = content.timeline.rows.find((r: { id: string }) => r.id === `tl-${pick.runId}-S-idlh`)
    expect(row?.timeS).toBe(critS)
    // With the extract off the gas room reaches IDLH soonest: the plan is built on that case, not on the nominal.
    expect(pick.key).toBe('vent_exhaust_failed')
    {
      expect(content.summary).toContain(`${pick.label}, run #${pick.runId}, in place of the nominal run #${nominalId}`)
      expect(content.timeline.rows.some((r: { id: string }) => r.id.startsWith(`tl-${nominalId}-`))).toBe(false)
    }
    // The detector advisor places for the worst of the cases: the same answer as listing every case by hand.
    const ask = (runIds: number[]) => officer.post(`/api/floors/${floorId}/advisor`).send({ runIds, gridSpacingM: 1, count: 1, deadlineS: 120 }).expect(200)
    const viaBundle = (await ask([nominalId])).body
    const byHand = (await ask(b.cases.map((c) => c.runId))).body
    expect(viaBundle.perRun.map((r: { runId: number }) => r.runId).sort()).toEqual(b.cases.map((c) => c.runId).sort())
    expect(viaBundle.chosen).toEqual(byHand.chosen)
    expect(viaBundle.worstTimeS).toBe(byHand.worstTimeS)
    expect(viaBundle.notes[0]).toMatch(/^Placed for the conservative end: the sensitivity cases of NH3 plan bundle \(3 sensitivity cases\)/)
    // No case reaches a critical level sooner in room S than the one the plan uses.
    for (const c of cases) expect(c.summary.rooms.find((r) => r.id === 'S')!.firstExceedS.idlh ?? Infinity).toBeGreaterThanOrEqual(critS ?? Infinity)
  }, 240_000)
})
