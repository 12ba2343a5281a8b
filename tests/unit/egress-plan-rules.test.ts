import { describe, expect, it } from 'vitest'
import { computeEgress } from '../../shared/egress/compute'
import type { Plan } from '../../shared/floorplan/plan-schema'
import { CRITICAL_KEYS, doorsOfRoom, generatePlan, timeLeftForEgressS, timeLeftText, type PlanRunInput } from '../../shared/plans/rules'
import { PlanContent } from '../../shared/schemas/plans'
import type { RunSummary } from '../../shared/schemas/runs'
import { shortcutField, shortcutFloor, shortcutSummary } from './egress-fixtures'
import { fixtureFloor, fixtureSummary } from './plans-fixtures'

/** Rooms above a critical level in any of the results. */
const criticalRoomIds = (runs: PlanRunInput[]) =>
  new Set(runs.flatMap((r) => r.summary.rooms.filter((room) => CRITICAL_KEYS.some((k) => typeof room.firstExceedS[k] === 'number')).map((room) => room.id)))

/** The safety property: no Evacuation card lists a door that leads into a room above a critical level. */
function expectNoDoorIntoCriticalRoom(plan: Plan, runs: PlanRunInput[]) {
  const content = PlanContent.parse(generatePlan({ name: 'F', siteName: 'S', plan }, runs))
  const critical = criticalRoomIds(runs)
  expect(critical.size).toBeGreaterThan(0)
  for (const card of content.evacuation.rooms) {
    const room = plan.rooms.find((r) => r.id === card.roomId)!
    const leads = new Map(doorsOfRoom(plan, room).map((d) => [d.openingId, d.leadsTo?.id ?? null]))
    for (const door of card.doors) {
      const into = leads.get(door.openingId)
      expect(into === null || into === undefined || !critical.has(into), `${card.roomName}: ${door.name} leads into ${into}`).toBe(true)
      expect(door.note).not.toMatch(/keep moving through it/)
    }
  }
  return content
}

const summaryA = (over: Partial<RunSummary> = {}) => shortcutSummary({
  rooms: [
    { id: 'A', name: 'Office A', kind: 'other', peakPpm: 40, firstExceedS: { idlh: null, rel_twa: 200 }, finalMeanPpm: 20 },
    { id: 'S', name: 'Gas room S', kind: 'gas_room', peakPpm: 1000, firstExceedS: { idlh: 5, rel_twa: 1 }, finalMeanPpm: 1000 },
    { id: 'C', name: 'Corridor C', kind: 'corridor', peakPpm: 2, firstExceedS: { idlh: null, rel_twa: null }, finalMeanPpm: 2 },
  ],
  ...over,
})

describe('plan Evacuation section and drill steps from the computed routes', () => {
  it('never lists a door into the gas room above IDLH; the office leaves by the corridor to the stair', () => {
    const plan = shortcutFloor()
    const summary = summaryA()
    const egress = computeEgress({ runId: 3, plan, summary, field: shortcutField(1000, 2) })
    const runs: PlanRunInput[] = [{ id: 3, label: 'NH3 leak', summary, egress }]
    const c = expectNoDoorIntoCriticalRoom(plan, runs)
    const a = c.evacuation.rooms.find((r) => r.roomId === 'A')!
    expect(a.doors.map((d) => d.openingId)).toEqual(['d-ac'])
    expect(a.route).toMatch(/by A–C door, then Stair door via Corridor C, about 25 s on foot/)
    expect(a.avoid).toMatch(/Do not use: A–S door \(leads into Gas room S, IDLH/)
    expect(c.evacuation.assemblyPoint).toBe('Car park')
    const step = c.checklist.find((s) => s.id === 'ck-evac-A')!
    expect(step.what).toMatch(/^Leave Office A by A–C door/)
    expect(step.what).not.toMatch(/A–S door/)
    // The longest walk from the room: Desk A (3, 1) → door (2, 4) → stair (30, 5) = √10 + √785 = 31.18 m at 1.2 m/s = 26 s.
    expect(step.basis).toMatch(/predicted walk by the computed route: 26 s/)
  })

  it('without computed routes (no stored fields) the doors still avoid the room above IDLH', () => {
    const runs: PlanRunInput[] = [{ id: 7, label: 'fixture', summary: fixtureSummary() }]
    const c = expectNoDoorIntoCriticalRoom(fixtureFloor(), runs)
    expect(c.evacuation.rooms.find((r) => r.roomId === 'C')!.route).toMatch(/Routes not computed/)
  })

  it('says plainly when no safe route exists, in the card and in the drill step', () => {
    const plan = shortcutFloor({ withCorridorExit: false })
    const summary = summaryA()
    const egress = computeEgress({ runId: 3, plan, summary, field: shortcutField(1000, 2) })
    const runs: PlanRunInput[] = [{ id: 3, label: 'NH3 leak', summary, egress }]
    const c = expectNoDoorIntoCriticalRoom(plan, runs)
    const a = c.evacuation.rooms.find((r) => r.roomId === 'A')!
    expect(a.doors).toEqual([])
    expect(a.route).toMatch(/No safe route out of this room is predicted/)
    expect(a.route).toMatch(/No safe route from Office A under these conditions/)
    expect(c.checklist.find((s) => s.id === 'ck-evac-A')!.what).toMatch(/no safe route is predicted under these conditions/)
  })

  it('time left for egress is "not predicted" (null), never 0 s, when no detector alarms', () => {
    expect(timeLeftForEgressS(120, null)).toBeNull()
    expect(timeLeftForEgressS(120, 70)).toBe(50)
    expect(timeLeftForEgressS(60, 70)).toBe(0)
    expect(timeLeftText(null, false)).toBe('not predicted (no detector alarm)')
    const plan = shortcutFloor()
    const summary = summaryA({ firstAlarm: null })
    const c = PlanContent.parse(generatePlan({ name: 'F', siteName: 'S', plan }, [{ id: 3, label: 'NH3', summary, egress: computeEgress({ runId: 3, plan, summary, field: shortcutField(1000) }) }]))
    expect(c.predicted.egressMarginS).toBeNull()
    const gasRoomStep = c.checklist.find((s) => s.id === 'ck-evac-S')!
    expect(gasRoomStep.targetS).toBeNull()
    expect(gasRoomStep.basis).toMatch(/with no detector alarm/)
    for (const row of c.timeline.rows.filter((r) => r.kind === 'egress')) expect(row.event).not.toMatch(/: none,/)
  })
})
