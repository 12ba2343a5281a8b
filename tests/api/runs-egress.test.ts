import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { EgressResult } from '../../shared/schemas/egress'
import { RunDetail } from '../../shared/schemas/runs'
import { apiAgent, createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { shortcutFloorRun } from './egress-fixtures'
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

async function runToEnd(scenarioId: number) {
  const started = await officer.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
  const { run } = await waitForRun(officer, started.body.id, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status), 120_000)
  expect(run.status).toBe('succeeded')
  return RunDetail.parse(run)
}

describe('GET /api/runs/:id/egress', () => {
  it('on a floor where the short way out crosses the gas room, the longer corridor route is chosen', async () => {
    const { run } = await shortcutFloorRun(rt, officer, orgId)
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
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
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
