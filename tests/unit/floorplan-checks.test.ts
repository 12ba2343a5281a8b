import { describe, expect, it } from 'vitest'
import { checkPlan, isPlanValid, type CheckContext } from '../../shared/floorplan/checks'
import { Plan } from '../../shared/floorplan/plan-schema'
import { rectRoom, source, twoRoomPlan } from './floorplan-fixtures'

const ctx: CheckContext = { knownGasIds: new Set(['NH3', 'Cl2', 'N2']), ceilingM: 3 }
const codes = (plan: Plan) => checkPlan(plan, ctx).map((p) => p.code)

describe('plan schema', () => {
  it('accepts the two-room fixture and names the field of a bad value', () => {
    expect(Plan.safeParse(twoRoomPlan()).success).toBe(true)
    const bad = twoRoomPlan()
    bad.rooms[1]!.ventilation = { mode: 'ach', airChangesPerHour: -1 }
    const result = Plan.safeParse(bad)
    expect(result.success).toBe(false)
    expect(result.error!.issues[0]!.path.join('.')).toBe('rooms.1.ventilation.airChangesPerHour')
  })
})

describe('checkPlan', () => {
  it('finds nothing wrong with rooms that share a wall and a door on that wall', () => {
    const plan = twoRoomPlan()
    // Without a detector in the source room or a marked exit, only the two egress warnings are raised.
    expect(checkPlan(plan, ctx).map((p) => [p.code, p.severity])).toEqual([['source_room_no_detector', 'warning'], ['no_exit', 'warning']])
    plan.detectors = [{ id: 'det-1', name: 'NH3 detector', gasId: 'NH3', position: [2, 2], mountingHeightM: 2.5, alarmLowPpm: 12.5, alarmHighPpm: 35 }]
    plan.openings.push({ id: 'exit-1', name: 'Stair', kind: 'door', segment: [[20, 0.4], [20, 1.6]], open: false, exit: 'stair' })
    const problems = checkPlan(plan, ctx)
    expect(problems).toEqual([])
    expect(isPlanValid(problems)).toBe(true)
  })

  it('a source room without a detector for its gas is a problem that points to the detector advisor', () => {
    const p = checkPlan(twoRoomPlan(), ctx).find((x) => x.code === 'source_room_no_detector')!
    expect(p.elementIds).toEqual(['leak-1', 'gas-room'])
    expect(p.message).toMatch(/detector advisor/)
    // A detector for another gas does not count.
    const plan = twoRoomPlan()
    plan.detectors = [{ id: 'det-1', name: 'Cl2 detector', gasId: 'Cl2', position: [2, 2], mountingHeightM: 0.5, alarmLowPpm: 0.25, alarmHighPpm: 0.5 }]
    expect(checkPlan(plan, ctx).some((x) => x.code === 'source_room_no_detector')).toBe(true)
  })

  it('warns about a room with no door path to a marked exit', () => {
    const plan = twoRoomPlan()
    plan.rooms.push(rectRoom('store', 0, 4, 6, 8))
    plan.openings.push({ id: 'exit-1', name: 'Stair', kind: 'door', segment: [[20, 0.4], [20, 1.6]], open: false, exit: 'stair' })
    const p = checkPlan(plan, ctx).filter((x) => x.code === 'room_no_exit_path')
    expect(p.map((x) => x.elementIds)).toEqual([['store']])
  })

  describe('overlap', () => {
    it('flags two rooms whose interiors overlap, naming both', () => {
      const plan = twoRoomPlan()
      plan.rooms[1] = rectRoom('corridor', 5, 0, 20, 2)
      const problem = checkPlan(plan, ctx).find((p) => p.code === 'room_overlap')!
      expect(problem.severity).toBe('error')
      expect(problem.elementIds).toEqual(['gas-room', 'corridor'])
      expect(problem.path).toBe('rooms.1.polygon')
    })
    it('flags a room drawn entirely inside another', () => {
      const plan = twoRoomPlan()
      plan.rooms.push(rectRoom('closet', 1, 1, 2, 2))
      expect(codes(plan)).toContain('room_overlap')
    })
    it('allows rooms that only touch at a corner', () => {
      const plan = twoRoomPlan()
      plan.rooms.push(rectRoom('store', 20, 2, 22, 4))
      expect(codes(plan)).not.toContain('room_overlap')
    })
  })

  it('flags a self-intersecting (bow-tie) outline and skips its overlap test', () => {
    const plan = twoRoomPlan()
    plan.rooms.push({ ...rectRoom('bowtie', 30, 0, 34, 4), polygon: [[30, 0], [36, 4], [36, 0], [30, 2]] })
    const problem = checkPlan(plan, ctx).find((p) => p.code === 'room_self_intersecting')!
    expect(problem.elementIds).toEqual(['bowtie'])
    expect(problem.path).toBe('rooms.2.polygon')
  })

  it('flags a degenerate room with no area', () => {
    const plan = twoRoomPlan()
    plan.rooms.push({ ...rectRoom('flat', 30, 0, 34, 0) })
    expect(codes(plan)).toContain('room_degenerate')
  })

  describe('containment', () => {
    it('flags a source and a detector outside every room', () => {
      const plan = twoRoomPlan()
      plan.sources.push(source('stray', 10, 10))
      plan.detectors.push({ id: 'det-1', name: '', gasId: 'NH3', position: [-1, 1], mountingHeightM: 0.3, alarmLowPpm: 12.5, alarmHighPpm: 25 })
      const problems = checkPlan(plan, ctx).filter((p) => p.code === 'outside_rooms')
      expect(problems.map((p) => p.path)).toEqual(['sources.1.position', 'detectors.0.position'])
      expect(problems.every((p) => p.severity === 'error')).toBe(true)
    })
    it('counts an item exactly on a wall as inside', () => {
      const plan = twoRoomPlan()
      plan.sources.push(source('on-wall', 0, 2))
      expect(codes(plan)).not.toContain('outside_rooms')
    })
    it('only warns about a workstation outside the rooms', () => {
      const plan = twoRoomPlan()
      plan.workstations.push({ id: 'ws', name: 'Bench', position: [50, 50], breathingHeightM: 1.5 })
      expect(checkPlan(plan, ctx).find((p) => p.code === 'outside_rooms')!.severity).toBe('warning')
    })
  })

  describe('doors on walls', () => {
    it('flags a door in the middle of a room', () => {
      const plan = twoRoomPlan()
      plan.openings[0]!.segment = [[3, 1], [3, 2]]
      const problem = checkPlan(plan, ctx).find((p) => p.code === 'opening_not_on_wall')!
      expect(problem.path).toBe('openings.0.segment')
      expect(problem.elementIds).toEqual(['door-1'])
    })
    it('flags a door that runs past the end of its wall', () => {
      const plan = twoRoomPlan()
      plan.openings[0]!.segment = [[6, -0.5], [6, 0.5]]
      expect(codes(plan)).toContain('opening_not_on_wall')
    })
    it('accepts a door within tolerance (2 mm off the wall)', () => {
      const plan = twoRoomPlan()
      plan.openings[0]!.segment = [[6.002, 0.4], [6.002, 1.6]]
      expect(codes(plan)).not.toContain('opening_not_on_wall')
    })
    it('warns that an open door on an outside wall leads nowhere', () => {
      const plan = twoRoomPlan()
      plan.openings[0]!.segment = [[0, 1], [0, 2]]
      expect(checkPlan(plan, ctx).find((p) => p.code === 'opening_exterior')!.severity).toBe('warning')
    })
    it('flags a door too short to matter', () => {
      const plan = twoRoomPlan()
      plan.openings[0]!.segment = [[6, 1], [6, 1.01]]
      expect(codes(plan)).toContain('opening_too_short')
    })
  })

  it('flags a gas unknown to the library on sources and detectors', () => {
    const plan = twoRoomPlan()
    plan.sources[0]!.gasId = 'XYZ'
    const problem = checkPlan(plan, ctx).find((p) => p.code === 'unknown_gas')!
    expect(problem.path).toBe('sources.0.gasId')
    expect(problem.message).toContain('XYZ')
  })

  it('flags duplicate ids across collections', () => {
    const plan = twoRoomPlan()
    plan.sources[0]!.id = 'door-1'
    expect(codes(plan)).toContain('duplicate_id')
  })

  it('flags a release height above the ceiling', () => {
    const plan = twoRoomPlan()
    plan.sources[0]!.releaseHeightM = 3.5
    expect(checkPlan(plan, ctx).find((p) => p.code === 'above_ceiling')!.path).toBe('sources.0.releaseHeightM')
  })

  it('calls an empty plan, and a plan without sources, invalid engine input', () => {
    const problems = checkPlan(Plan.parse({ rooms: [], openings: [], sources: [], detectors: [], exhausts: [], workstations: [] }), ctx)
    expect(problems.map((p) => p.code)).toEqual(['no_rooms', 'no_sources'])
    expect(isPlanValid(problems)).toBe(false)
    const noSources = twoRoomPlan()
    noSources.sources = []
    expect(checkPlan(noSources, ctx).map((p) => [p.code, p.severity])).toEqual([['no_sources', 'error'], ['no_exit', 'warning']])
    expect(isPlanValid(checkPlan(noSources, ctx))).toBe(false)
  })
})
