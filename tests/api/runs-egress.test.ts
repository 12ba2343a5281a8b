import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { insertFloor } from '../../server/repositories/floors.repo'
import { insertScenario } from '../../server/repositories/scenarios.repo'
import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import type { Plan } from '../../shared/floorplan/plan-schema'
import { EgressResult } from '../../shared/schemas/egress'
import { RunDetail, ScenarioConfig } from '../../shared/schemas/runs'
import { apiAgent, createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, demoFloorAndScenario, waitForRun } from './runs-fixtures'

/**
 * GET /api/runs/:id/egress on real engine runs: the demo floor (exits at both corridor ends and out of the write-up
 * room), and a floor where the only short way out passes through the gas room (the longer way must be chosen).
 */
let rt: Runtime
let officer: ApiAgent
let orgId: number

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 1 }, { background: true })
  ;({ orgId } = await demoFloorAndScenario(rt))
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] => [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]

/** Office A beside gas room S; S has its own outside exit (6 m from A's centre), the corridor's stair is ≈ 30 m away. */
function shortcutPlan(): Plan {
  return {
    rooms: [
      { id: 'A', name: 'Office A', kind: 'other', polygon: rect(0, 0, 4, 4), ventilation: { mode: 'ach', airChangesPerHour: 6 } },
      { id: 'S', name: 'Gas room S', kind: 'gas_room', polygon: rect(4, 0, 8, 4), ventilation: { mode: 'ach', airChangesPerHour: 6 } },
      { id: 'C', name: 'Corridor C', kind: 'corridor', polygon: rect(0, 4, 30, 6), ventilation: { mode: 'ach', airChangesPerHour: 4 } },
    ],
    openings: [
      { id: 'd-as', name: 'A–S door', kind: 'door', segment: [[4, 1.5], [4, 2.5]], open: false },
      { id: 'd-ac', name: 'A–C door', kind: 'door', segment: [[1.5, 4], [2.5, 4]], open: true },
      { id: 'E1', name: 'Gas room exit', kind: 'door', segment: [[8, 1.5], [8, 2.5]], open: false, exit: 'outdoors' },
      { id: 'E2', name: 'Stair door', kind: 'door', segment: [[30, 4.5], [30, 5.5]], open: false, exit: 'stair' },
    ],
    sources: [
      // A large ammonia leak (2 mm orifice at the vapour pressure): the 48 m³ gas room is above IDLH within seconds.
      { id: 'cyl', name: 'NH3 cylinder', kind: 'cylinder', gasId: 'NH3', position: [6, 1], releaseHeightM: 1, inventoryKg: 20, liquefied: true,
        pressurePa: 8e5, waterVolumeM3: 0.04, restriction: { kind: 'orifice', diameterM: 0.002 }, dischargeCoefficient: 0.62 },
    ],
    detectors: [],
    exhausts: [],
    workstations: [{ id: 'ws-a', name: 'Desk A', position: [3, 1], breathingHeightM: 1.1 }],
    underlay: null,
    assemblyPoints: [{ id: 'ap', name: 'Car park', position: [32, 5] }],
  }
}

async function runToEnd(scenarioId: number) {
  const started = await officer.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
  const { run } = await waitForRun(officer, started.body.id, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status), 120_000)
  expect(run.status).toBe('succeeded')
  return RunDetail.parse(run)
}

describe('GET /api/runs/:id/egress', () => {
  it('on a floor where the short way out crosses the gas room, the longer corridor route is chosen', async () => {
    const db = rt.ctx.db
    const site = await db.selectFrom('sites').select('id').where('org_id', '=', orgId).executeTakeFirstOrThrow()
    const plan = shortcutPlan()
    const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
    const floor = await insertFloor(db, { orgId, siteId: site.id, name: `Egress shortcut ${Date.now()}`, ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: null })
    const config = ScenarioConfig.parse({ name: 'NH3 2 mm leak', sourceIds: ['cyl'], durationS: 300, outputIntervalS: 10, cellM: 0.25, layers: 6 })
    const sc = await insertScenario(db, { orgId, floorId: floor.id, name: config.name, config, userId: null })
    const run = await runToEnd(sc.id)
    const s = run.summary!
    expect(s.firstAlarm).toBeNull()
    const gasRoomIdlh = s.rooms.find((r) => r.id === 'S')!.firstExceedS.idlh
    expect(gasRoomIdlh).not.toBeNull()
    expect(gasRoomIdlh!).toBeLessThan(60)

    const body = EgressResult.parse((await officer.get(`/api/runs/${run.id}/egress?discoveryS=90`).expect(200)).body)
    expect(body.startS).toBe(90)
    expect(body.startBasis).toMatch(/No detector alarms/)
    expect(body.criticalLimit?.key).toBe('idlh')
    expect(body.exitIds.sort()).toEqual(['E1', 'E2'])
    for (const from of [{ room: 'A', ws: null }, { room: 'A', ws: 'ws-a' }]) {
      const r = body.routes.find((x) => x.fromRoomId === from.room && x.fromWorkstationId === from.ws)!
      expect(r.safe, JSON.stringify(r)).toBe(true)
      expect(r.exitOpeningId).toBe('E2')
      expect(r.viaRoomIds).toEqual(['C'])
      expect(r.viaRoomIds).not.toContain('S')
      expect(r.crossesCriticalRoom).toBe(false)
      expect(r.peakPpm).toBeLessThan(300)
    }
    // People in the gas room itself: its exit is the only way that does not cross another room, and the walk starts inside the gas.
    const fromS = body.routes.find((x) => x.fromRoomId === 'S' && x.fromWorkstationId === null)!
    expect(fromS.peakPpm).toBeGreaterThan(300)
    expect(fromS.safe).toBe(false)
    expect(fromS.reason).toMatch(/^No safe route from Gas room S under these conditions/)
    expect(body.caution).toMatch(/not live guidance/)

    // Reduced mobility walks slower: the same route takes twice as long at 0.6 m/s against 1.2 m/s.
    const slow = EgressResult.parse((await officer.get(`/api/runs/${run.id}/egress?discoveryS=90&mobility=reduced`).expect(200)).body)
    const fast = body.routes.find((x) => x.fromWorkstationId === 'ws-a')!
    const slowWs = slow.routes.find((x) => x.fromWorkstationId === 'ws-a')!
    if (slowWs.exitOpeningId === fast.exitOpeningId) expect(slowWs.walkS).toBeCloseTo(fast.walkS * 2, 6)

    // Bad input: a clear 400 naming the field; another organization sees a 404; signed-out a 401.
    const bad = await officer.get(`/api/runs/${run.id}/egress?discoveryS=-5`).expect(400)
    expect(JSON.stringify(bad.body.error.fields)).toMatch(/discoveryS/)
    const badKey = await officer.get(`/api/runs/${run.id}/egress?limitKey=nope`).expect(400)
    expect(badKey.body.error.fields).toHaveProperty('limitKey')
    const other = await createOtherOrg(db, rt.ctx.config)
    const outsider = await signIn(rt, other.users.ehs_officer.email, 'other-org-pass-1')
    await outsider.get(`/api/runs/${run.id}/egress`).expect(404)
    await (await apiAgent(rt)).get(`/api/runs/${run.id}/egress`).expect(401)
  }, 180_000)

  it('on the demo floor every room and workstation gets a route to a marked exit, and no safe route crosses IDLH', async () => {
    const scenarioId = (await rt.ctx.db.selectFrom('scenarios').select('id').where('name', '=', 'Ammonia cabinet valve leak, normal ventilation').executeTakeFirstOrThrow()).id
    const run = await runToEnd(scenarioId)
    const s = run.summary!
    const body = EgressResult.parse((await officer.get(`/api/runs/${run.id}/egress`).expect(200)).body)
    expect(body.exitIds.sort()).toEqual(['exit-east-stair', 'exit-west-stair', 'exit-write-up'])
    expect(body.assemblyPoints.map((a) => a.id)).toEqual(['assembly-north'])
    if (s.firstAlarm) expect(body.startS).toBe(s.firstAlarm.timeS + 30)
    const starts = body.routes.map((r) => `${r.fromRoomId}/${r.fromWorkstationId}`)
    for (const room of s.rooms) expect(starts).toContain(`${room.id}/null`)
    for (const w of s.receptors.filter((r) => r.kind === 'workstation')) expect(starts.some((x) => x.endsWith(`/${w.id}`))).toBe(true)
    for (const r of body.routes) {
      expect(r.exitOpeningId).not.toBeNull()
      if (r.safe) {
        expect(r.crossesCriticalRoom).toBe(false)
        expect(r.peakPpm).toBeLessThan(body.criticalLimit!.ppm)
      } else expect(r.reason).toMatch(/^No safe route/)
    }
    // The write-up room has its own outside door: its route leaves by it without entering the corridor.
    const writeUp = body.routes.find((r) => r.fromRoomId === 'write-up' && r.fromWorkstationId === null)!
    expect(writeUp.exitOpeningId).toBe('exit-write-up')
    expect(writeUp.viaRoomIds).toEqual([])
  }, 180_000)
})
