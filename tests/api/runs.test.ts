import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { countResults } from '../../server/repositories/runs.repo'
import type { Runtime } from '../../server/runtime'
import { RunDetail, RunFieldsMeta, SweepDetail } from '../../shared/schemas/runs'
import { createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, demoFloorAndScenario, waitForRun } from './runs-fixtures'

let rt: Runtime
let officer: ApiAgent
let floorId: number
let scenarioId: number
const as = (role: string) => signIn(rt, acct(role).email, acct(role).password)
const finished = (r: { status: string }) => ['succeeded', 'failed', 'cancelled'].includes(r.status)

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 1 }, { background: true })
  ;({ floorId, scenarioId } = await demoFloorAndScenario(rt))
  officer = await as('ehs_officer')
})
afterAll(() => rt.close())

describe('the queue end to end (pg-boss, worker thread, PostgreSQL)', () => {
  it('runs the demo scenario: queued → running with progress → succeeded, one stored result', async () => {
    const started = await officer.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
    expect(RunDetail.parse(started.body).status).toMatch(/queued|running/)
    const { run, seen } = await waitForRun(officer, started.body.id, finished)
    expect(run.status).toBe('succeeded')
    expect(run.progress).toBe(1)
    // Progress only goes up.
    for (let i = 1; i < seen.length; i++) expect(seen[i]!.progress).toBeGreaterThanOrEqual(seen[i - 1]!.progress)
    const detail = RunDetail.parse(run)
    expect(detail.summary!.gas.id).toBe('NH3')
    expect(detail.summary!.ventilationState).toBe('normal')
    expect(detail.summary!.limits.map((l) => l.key)).toEqual(expect.arrayContaining(['rel_twa', 'idlh', 'alarm_12_5']))
    const det = detail.summary!.receptors.find((r) => r.id === 'det-nh3-gr')!
    expect(det.alarmLowS).toBeGreaterThan(0)
    expect(detail.summary!.firstAlarm?.detectorId).toBe('det-nh3-gr')
    expect(await countResults(rt.ctx.db, run.id)).toBe(1)

    const meta = RunFieldsMeta.parse(detail.meta)
    const fields = await officer.get(`/api/runs/${run.id}/fields`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c)).on('end', () => cb(null, Buffer.concat(chunks)))
    }).expect(200)
    expect(fields.headers['content-type']).toBe('application/octet-stream')
    const nPlan = meta.nx * meta.ny
    expect((fields.body as Buffer).length).toBe((meta.timesS.length + meta.limits.length + 1) * nPlan * 4)
    const f = new Float32Array(new Uint8Array(fields.body as Buffer).buffer)
    // The map changes over time: the first frame is clean, the last is not.
    const maxOf = (k: number) => { let m = 0; for (let p = 0; p < nPlan; p++) { const v = f[k * nPlan + p]!; if (v > m) m = v } return m }
    expect(maxOf(0)).toBe(0)
    expect(maxOf(meta.timesS.length - 1)).toBeGreaterThan(10)

    const series = (await officer.get(`/api/runs/${run.id}/series`).expect(200)).body
    expect(series.series['det-nh3-gr']).toHaveLength(meta.timesS.length)
    expect(series.series['ws-cvd']).toHaveLength(meta.timesS.length)
  })

  it('cancels a running run: it stops, ends cancelled and stores nothing', async () => {
    const sc = await officer.post(`/api/floors/${floorId}/scenarios`).send({
      name: 'Slow NH3 run for cancel', sourceIds: ['nh3-cabinet'], durationS: 14400, outputIntervalS: 60, cellM: 0.1, layers: 12,
    }).expect(201)
    const started = await officer.post(`/api/scenarios/${sc.body.id}/runs`).expect(202)
    await waitForRun(officer, started.body.id, (r) => r.status === 'running' && r.progress > 0)
    await officer.post(`/api/runs/${started.body.id}/cancel`).expect(200)
    const { run } = await waitForRun(officer, started.body.id, finished, 20_000)
    expect(run.status).toBe('cancelled')
    expect(await countResults(rt.ctx.db, run.id)).toBe(0)
    await officer.post(`/api/runs/${started.body.id}/cancel`).expect(409)
  })

  it('keeps the web server responsive while a run goes on', async () => {
    const sc = await officer.post(`/api/floors/${floorId}/scenarios`).send({
      name: 'Responsiveness probe', sourceIds: ['nh3-cabinet'], durationS: 1800, outputIntervalS: 60, cellM: 0.15, layers: 8,
    }).expect(201)
    const started = await officer.post(`/api/scenarios/${sc.body.id}/runs`).expect(202)
    await waitForRun(officer, started.body.id, (r) => r.status === 'running')
    let worst = 0
    for (let i = 0; i < 10; i++) {
      const t0 = performance.now()
      await officer.get('/api/health').expect(200)
      worst = Math.max(worst, performance.now() - t0)
    }
    expect(worst).toBeLessThan(500)
    await officer.post(`/api/runs/${started.body.id}/cancel`)
  })
})

describe('scenarios: validation', () => {
  it('400 names the field for bad input, never 500', async () => {
    const bad1 = await officer.post(`/api/floors/${floorId}/scenarios`).send({ name: 'x', sourceIds: ['no-such-source'], durationS: 600 }).expect(400)
    expect(bad1.body.error.fields).toHaveProperty(['sourceIds.0'])
    const bad2 = await officer.post(`/api/floors/${floorId}/scenarios`).send({ name: 'x', sourceIds: ['nh3-cabinet'], durationS: 10 }).expect(400)
    expect(bad2.body.error.fields).toHaveProperty('durationS')
    const bad3 = await officer.post(`/api/floors/${floorId}/scenarios`).send({ name: 'x', sourceIds: ['nh3-cabinet', 'cl2-cabinet'], durationS: 600 }).expect(400)
    expect(bad3.body.error.fields).toHaveProperty(['sourceIds.1'])
    const bad4 = await officer.post(`/api/floors/${floorId}/scenarios`).send({ name: 'x', sourceIds: ['nh3-cabinet'], durationS: 600, ventilationState: 'windy' }).expect(400)
    expect(bad4.body.error.fields).toHaveProperty('ventilationState')
    await officer.post(`/api/floors/${floorId}/scenarios`).send('not json').set('content-type', 'application/json').expect(400)
    await officer.get('/api/runs/abc').expect(400)
  })
  it('lists the saved scenarios of a floor, names unique per floor (409)', async () => {
    const list = (await officer.get(`/api/floors/${floorId}/scenarios`).expect(200)).body.scenarios
    expect(list.map((s: { name: string }) => s.name)).toContain('Ammonia cabinet valve leak, normal ventilation')
    await officer.post(`/api/floors/${floorId}/scenarios`).send({ name: 'Ammonia cabinet valve leak, normal ventilation', sourceIds: ['nh3-cabinet'], durationS: 600 }).expect(409)
  })
  it('builds each ventilation state into a different engine input', async () => {
    for (const v of ['exhaust_failed', 'door_propped_open', 'downflow_off']) {
      await officer.post(`/api/floors/${floorId}/scenarios`).send({ name: `NH3 ${v}`, sourceIds: ['nh3-cabinet'], durationS: 600, ventilationState: v }).expect(201)
    }
  })
})

describe('roles and organizations', () => {
  let runId: number
  beforeAll(async () => {
    const started = await officer.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
    runId = (await waitForRun(officer, started.body.id, finished)).run.id
  })
  it('lab managers and staff of the floor view results but cannot run, cancel, sweep or advise (403)', async () => {
    for (const role of ['lab_manager', 'staff']) {
      const a = await as(role)
      const run = (await a.get(`/api/runs/${runId}`).expect(200)).body
      expect(run.summary.gas.id).toBe('NH3')
      expect(run.canRun).toBe(false)
      await a.get(`/api/runs/${runId}/series`).expect(200)
      await a.get(`/api/floors/${floorId}/scenarios`).expect(200)
      await a.post(`/api/scenarios/${scenarioId}/runs`).expect(403)
      await a.post(`/api/runs/${runId}/cancel`).expect(403)
      await a.post(`/api/floors/${floorId}/sweeps`).send({ config: { name: 's', sourceIds: ['nh3-cabinet'], durationS: 600 } }).expect(403)
      await a.post(`/api/floors/${floorId}/advisor`).send({ runIds: [runId], count: 1, gridSpacingM: 2 }).expect(403)
    }
  })
  it('admins run too', async () => {
    const admin = await as('admin')
    const r = await admin.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
    await waitForRun(admin, r.body.id, finished)
  })
  it('another organization gets 404 for the run, its fields, the scenario and the floor lists', async () => {
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    for (const role of ['admin', 'ehs_officer', 'staff'] as const) {
      const a = await signIn(rt, other.users[role].email, other.password)
      await a.get(`/api/runs/${runId}`).expect(404)
      await a.get(`/api/runs/${runId}/fields`).expect(404)
      await a.get(`/api/runs/${runId}/series`).expect(404)
      await a.get(`/api/scenarios/${scenarioId}`).expect(404)
      await a.get(`/api/floors/${floorId}/scenarios`).expect(404)
      await a.get(`/api/floors/${floorId}/runs`).expect(404)
      if (role !== 'staff') {
        await a.post(`/api/scenarios/${scenarioId}/runs`).expect(404)
        await a.post(`/api/runs/${runId}/cancel`).expect(404)
      }
      const list = (await a.get('/api/runs').expect(200)).body.runs
      expect(list).toHaveLength(0)
    }
  })
})

describe('sweeps and the detector advisor', () => {
  it('sweeps the leak over two sources and reports the worst case per workstation; the advisor proposes and the officer accepts', async () => {
    const base = { name: 'Any NH3 source', sourceIds: ['nh3-cabinet', 'nh3-line-lab'], durationS: 600, outputIntervalS: 15, cellM: 0.4, layers: 6 }
    const bad = await officer.post(`/api/floors/${floorId}/sweeps`).send({ config: { ...base, sourceIds: ['nh3-cabinet', 'nope'] } }).expect(400)
    expect(bad.body.error.fields).toHaveProperty(['config.sourceIds.1'])
    const s = await officer.post(`/api/floors/${floorId}/sweeps`).send({ config: base }).expect(202)
    expect(s.body.runs).toHaveLength(2)
    let sweep = SweepDetail.parse(s.body)
    const t0 = Date.now()
    while (!sweep.complete && Date.now() - t0 < 60_000) {
      await new Promise((r) => setTimeout(r, 300))
      sweep = SweepDetail.parse((await officer.get(`/api/sweeps/${s.body.id}`).expect(200)).body)
    }
    expect(sweep.runs.every((r) => r.status === 'succeeded')).toBe(true)
    const cvd = sweep.worstCase.find((w) => w.workstationId === 'ws-cvd')!
    // The CVD operator stands next to the lab's NH3 line: the line, not the gas-room cabinet, is the worst source there.
    expect(cvd.peakSourceId).toBe('nh3-line-lab')
    expect(cvd.firstExceed.rel_twa!.sourceId).toBe('nh3-line-lab')

    const floor = (await officer.get(`/api/floors/${floorId}`).expect(200)).body
    const req = { runIds: sweep.runs.map((r) => r.id), count: 2, gridSpacingM: 1.5, deadlineS: 120 }
    const prop = (await officer.post(`/api/floors/${floorId}/advisor`).send(req).expect(200)).body
    expect(prop.chosen).toHaveLength(2)
    expect(prop.limit.ppm).toBe(12.5)
    expect(prop.worstTimeS).not.toBeNull()
    expect(prop.guarantee).toMatch(/1 − 1\/e/)
    // Two detectors, two leaks: one near each source, so both scenarios alarm.
    const rooms = prop.chosen.map((c: { roomId: string }) => c.roomId).sort()
    expect(rooms).toEqual(['gas-room', 'lab'])
    // Never on a leak point: every proposed position keeps at least 1 m from every source
    for (const c of prop.chosen as { position: [number, number] }[]) {
      for (const src of floor.plan.sources as { position: [number, number] }[]) expect(Math.hypot(c.position[0] - src.position[0], c.position[1] - src.position[1])).toBeGreaterThan(1)
    }
    // A candidate picked on a source is left out, and the notes say so
    const src0 = floor.plan.sources[0].position as [number, number]
    const picked = (await officer.post(`/api/floors/${floorId}/advisor`).send({ runIds: req.runIds, count: 1, deadlineS: 120, candidates: [src0] }).expect(400)).body
    expect(picked.error.fields.candidates).toMatch(/not on it/)
    await officer.post(`/api/floors/${floorId}/advisor`).send({ ...req, runIds: [999999] }).expect(400)
    await officer.post(`/api/floors/${floorId}/advisor`).send({ ...req, count: 0 }).expect(400)

    const accept = { version: floor.version, gasId: 'NH3', positions: prop.chosen.map((c: { position: number[] }) => c.position), mountingHeightM: prop.mountingHeightM, alarmLowPpm: 12.5, alarmHighPpm: 35 }
    await officer.post(`/api/floors/${floorId}/advisor/accept`).send(accept).expect(200)
    const after = (await officer.get(`/api/floors/${floorId}`).expect(200)).body
    expect(after.plan.detectors.length).toBe(floor.plan.detectors.length + 2)
    // The same proposal against the old version is refused: someone (we) saved since.
    await officer.post(`/api/floors/${floorId}/advisor/accept`).send(accept).expect(409)
  })
})
