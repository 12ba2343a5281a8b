import { describe, expect, it } from 'vitest'
import { computeEgress } from '../../shared/egress/compute'
import { buildEgressGraph, candidateRoutes, walkInsideRoom } from '../../shared/egress/graph'
import { REACTION_S, WALK_SPEED_M_S } from '../../shared/egress/walking'
import { EgressResult } from '../../shared/schemas/egress'
import { shortcutField, shortcutFloor, shortcutSummary } from './egress-fixtures'

const fromA = (r: ReturnType<typeof computeEgress>) => r.routes.find((x) => x.fromRoomId === 'A' && x.fromWorkstationId === null)!

describe('egress routes', () => {
  it('walks around the inside corner of an L-shaped room (shortest path bends at the corner)', () => {
    // L: the inside corner (2, 2) is in the way from (1, 3.5) to (3.5, 1) (the straight line passes (2.25, 2.25), outside).
    const L: [number, number][] = [[0, 0], [4, 0], [4, 2], [2, 2], [2, 4], [0, 4]]
    expect(walkInsideRoom([1, 3.5], [3.5, 1], L)).toEqual([[1, 3.5], [2, 2], [3.5, 1]])
    // Touching the corner is allowed: (1, 3) → (3, 1) passes exactly through (2, 2) and stays straight.
    expect(walkInsideRoom([1, 3], [3, 1], L)).toEqual([[1, 3], [3, 1]])
  })

  it('lists both routes from the office, the short one through the gas room first (6 m vs ≈ 30.02 m)', () => {
    const g = buildEgressGraph(shortcutFloor())
    const { routes } = candidateRoutes(g, 'A', [2, 2])
    expect(routes[0]!.doorIds).toEqual(['d-as', 'E1'])
    expect(routes[0]!.lengthM).toBeCloseTo(6, 6)
    const viaCorridor = routes.find((r) => r.doorIds.join() === 'd-ac,E2')!
    expect(viaCorridor.lengthM).toBeCloseTo(2 + Math.hypot(28, 1), 6)
  })

  it('chooses the longer route that avoids the gas room above IDLH', () => {
    const r = EgressResult.parse(computeEgress({ runId: 1, plan: shortcutFloor(), summary: shortcutSummary(), field: shortcutField(1000, 2) }))
    const a = fromA(r)
    expect(a.safe).toBe(true)
    expect(a.exitOpeningId).toBe('E2')
    expect(a.viaRoomIds).toEqual(['C'])
    expect(a.crossesCriticalRoom).toBe(false)
    // Start: alarm at 40 s + the stated reaction time.
    expect(a.startS).toBe(40 + REACTION_S)
    expect(a.walkS).toBeCloseTo((2 + Math.hypot(28, 1)) / WALK_SPEED_M_S, 6)
    // Dose: 2 ppm for the 28.02 m walked in the corridor (the first 2 m are in the clean office), ∫C dt by hand.
    expect(a.doseppmS).toBeCloseTo(2 * Math.hypot(28, 1) / WALK_SPEED_M_S, 1)
    expect(a.peakPpm).toBeCloseTo(2, 5)
    expect(a.reason).toMatch(/shorter route via Gas room S crosses IDLH/)
    // The workstation too.
    const ws = r.routes.find((x) => x.fromWorkstationId === 'ws-a')!
    expect(ws.exitOpeningId).toBe('E2')
    expect(ws.safe).toBe(true)
  })

  it('takes the short route through the gas room when the gas room stays clean', () => {
    const r = computeEgress({ runId: 1, plan: shortcutFloor(), summary: shortcutSummary(), field: shortcutField(0) })
    expect(fromA(r).exitOpeningId).toBe('E1')
  })

  it('says plainly that no safe route exists when the only exit is through the gas room', () => {
    const r = EgressResult.parse(computeEgress({ runId: 1, plan: shortcutFloor({ withCorridorExit: false }), summary: shortcutSummary(), field: shortcutField(1000) }))
    const a = fromA(r)
    expect(a.safe).toBe(false)
    expect(a.crossesCriticalRoom).toBe(true)
    expect(a.criticalRoomIds).toContain('S')
    expect(a.reason).toMatch(/^No safe route from Office A under these conditions/)
    expect(a.reason).toMatch(/do not send people this way/)
    // The gas room is above IDLH from the first output: the routes were never open.
    expect(a.closesS).toBe(0)
  })

  it('a route that closes later reports when: gas reaches IDLH only from 300 s', () => {
    const field = shortcutField(1000)
    const n = field.meta.nx * field.meta.ny
    for (let k = 0; k < 30; k++) field.frames.fill(0, k * n, (k + 1) * n)
    const r = computeEgress({ runId: 1, plan: shortcutFloor({ withCorridorExit: false }), summary: shortcutSummary({ firstAlarm: { detectorId: 'd', level: 'low', timeS: 400 } }), field })
    const a = fromA(r)
    expect(a.safe).toBe(false)
    // Leaving at 290 s the walker is in S from about 291.7 s, between the 290 s (0 ppm) and 300 s (1000 ppm) frames: already above 300 ppm.
    expect(a.closesS).toBeGreaterThan(200)
    expect(a.closesS).toBeLessThanOrEqual(300)
    expect(a.reason).toMatch(/closed for people leaving at/)
  })

  it('with no detector alarm the start is the stated discovery time', () => {
    const r = computeEgress({ runId: 1, plan: shortcutFloor(), summary: shortcutSummary({ firstAlarm: null }), field: shortcutField(1000), options: { discoveryS: 200 } })
    expect(r.startS).toBe(200)
    expect(r.startBasis).toMatch(/set by the officer/)
  })

  it('a floor with no marked exit gives no route and says why', () => {
    const plan = shortcutFloor()
    plan.openings = plan.openings.map((o) => ({ ...o, exit: null }))
    const r = computeEgress({ runId: 1, plan, summary: shortcutSummary(), field: shortcutField(0) })
    expect(fromA(r).exitOpeningId).toBeNull()
    expect(fromA(r).safe).toBe(false)
    expect(r.notes.join(' ')).toMatch(/No door of this floor is marked as an exit/)
  })
})
