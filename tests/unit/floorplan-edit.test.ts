import { describe, expect, it } from 'vitest'
import {
  duplicateElements, findElement, insertVertex, makeElement, moveVertex, nextId, rectangle, removeElements, removeVertex, translateElements,
} from '../../shared/floorplan/plan-edit'
import { Plan } from '../../shared/floorplan/plan-schema'
import { twoRoomPlan } from './floorplan-fixtures'

describe('plan editing operations', () => {
  it('never mutate their input (undo keeps the old document)', () => {
    const plan = twoRoomPlan()
    const frozen = JSON.stringify(plan)
    translateElements(plan, new Set(['gas-room', 'leak-1']), 1, 1)
    removeElements(plan, new Set(['door-1']))
    duplicateElements(plan, [plan.rooms[0]!], 1, 0)
    expect(JSON.stringify(plan)).toBe(frozen)
  })
  it('moves rooms, openings and items by whole offsets without float noise', () => {
    const moved = translateElements(twoRoomPlan(), new Set(['gas-room', 'door-1', 'leak-1']), 0.1, 0.2)
    expect(moved.rooms[0]!.polygon[2]).toEqual([6.1, 4.2])
    expect(moved.openings[0]!.segment).toEqual([[6.1, 0.6], [6.1, 1.8]])
    expect(moved.sources[0]!.position).toEqual([1.2, 1.3])
    expect(moved.rooms[1]).toEqual(twoRoomPlan().rooms[1])
  })
  it('duplicates with fresh ids and names marked as copies', () => {
    const plan = twoRoomPlan()
    const { plan: out, ids } = duplicateElements(plan, [plan.sources[0]!, plan.rooms[0]!], 0.5, -0.5)
    expect(ids).toEqual(['source-1', 'room-1'])
    expect(findElement(out, 'source-1')!.element).toMatchObject({ name: 'leak-1 (copy)', position: [1.6, 0.6] })
    expect(Plan.safeParse(out).success).toBe(true)
  })
  it('removes elements from every collection by id', () => {
    const out = removeElements(twoRoomPlan(), new Set(['corridor', 'door-1']))
    expect(out.rooms.map((r) => r.id)).toEqual(['gas-room'])
    expect(out.openings).toEqual([])
  })
  it('edits vertices and keeps at least a triangle', () => {
    const room = twoRoomPlan().rooms[0]!
    expect(moveVertex(room, 2, [7, 5]).polygon[2]).toEqual([7, 5])
    const five = insertVertex(room, 1, [6, 2])
    expect(five.polygon).toEqual([[0, 0], [6, 0], [6, 2], [6, 4], [0, 4]])
    const tri = removeVertex(removeVertex(five, 2), 0)
    expect(tri.polygon).toHaveLength(3)
    expect(removeVertex(tri, 0).polygon).toHaveLength(3)
  })
  it('makes a rectangle from any two opposite corners, counter-clockwise', () => {
    expect(rectangle([4, 3], [1, 1])).toEqual([[1, 1], [4, 1], [4, 3], [1, 3]])
  })
  it('gives new elements unique ids and valid defaults (detectors take the gas’s default set points)', () => {
    let plan = twoRoomPlan()
    expect(nextId(plan, 'door')).toBe('door-2')
    const det = makeElement.detector(plan, [2, 2], 'NH3')
    expect(det).toMatchObject({ alarmLowPpm: 12.5, alarmHighPpm: 35, mountingHeightM: 1.5 })
    expect(makeElement.detector(plan, [2, 2], 'Cl2').mountingHeightM).toBe(0.45)
    plan = { ...plan, detectors: [det], sources: [...plan.sources, makeElement.source(plan, [2, 3], 'NH3')],
      exhausts: [makeElement.exhaust(plan, [1, 1])], workstations: [makeElement.workstation(plan, [3, 3])] }
    expect(Plan.safeParse(plan).success).toBe(true)
  })
})
