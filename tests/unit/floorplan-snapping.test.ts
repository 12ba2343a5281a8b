import { describe, expect, it } from 'vitest'
import { placeOnWall, snapPoint, snapToGrid } from '../../shared/floorplan/snapping'
import { rectRoom } from './floorplan-fixtures'

const rooms = [rectRoom('a', 0, 0, 6, 4)]

describe('snapToGrid', () => {
  it('rounds to the nearest grid node without floating-point residue', () => {
    expect(snapToGrid([0.29, 1.26], 0.1)).toEqual([0.3, 1.3])
    expect(snapToGrid([1.24, -0.76], 0.5)).toEqual([1, -1])
  })
  it('leaves the point alone when the grid is off', () => {
    expect(snapToGrid([0.123, 4.56], 0)).toEqual([0.123, 4.56])
  })
})

describe('snapPoint', () => {
  const opts = { gridM: 0.5, toleranceM: 0.2, rooms }
  it('pulls the cursor onto a neighbouring corner first', () => {
    const r = snapPoint([6.1, 4.15], opts)
    expect(r.point).toEqual([6, 4])
    expect(r.guides[0]!.kind).toBe('vertex')
  })
  it('pulls the cursor onto a neighbouring wall and keeps the free coordinate on the grid', () => {
    const r = snapPoint([6.12, 2.3], opts)
    expect(r.point).toEqual([6, 2.5])
    expect(r.guides[0]).toEqual({ kind: 'edge', from: [6, 0], to: [6, 4] })
  })
  it('aligns with a corner on one axis when near neither corner nor wall', () => {
    const r = snapPoint([9.3, 3.9], opts)
    expect(r.point).toEqual([9.5, 4])
    expect(r.guides.map((g) => g.kind)).toEqual(['align-y'])
  })
  it('falls back to the grid', () => {
    expect(snapPoint([9.3, 7.2], opts)).toEqual({ point: [9.5, 7], guides: [{ kind: 'grid', at: [9.5, 7] }] })
  })
  it('ignores the walls of the room being edited', () => {
    const r = snapPoint([6.1, 2.3], { ...opts, excludeRoomId: 'a' })
    expect(r.point).toEqual([6, 2.5])
    expect(r.guides[0]!.kind).toBe('grid')
  })
  it('attracts to corners already placed in the outline being drawn', () => {
    const r = snapPoint([10.05, 10.1], { ...opts, extraVertices: [[10, 10]] })
    expect(r.point).toEqual([10, 10])
  })
})

describe('placeOnWall (doors)', () => {
  it('centres a door on the nearest wall point', () => {
    expect(placeOnWall([6.1, 2], rooms, 1, 0.3)).toEqual({ segment: [[6, 1.5], [6, 2.5]], wall: [[6, 0], [6, 4]] })
  })
  it('keeps the door entirely on the wall near a corner', () => {
    expect(placeOnWall([5.9, 3.9], rooms, 1, 0.3)!.segment).toEqual([[6, 3], [6, 4]])
  })
  it('returns null away from every wall', () => {
    expect(placeOnWall([3, 2], rooms, 1, 0.3)).toBeNull()
  })
  it('shrinks a door to a wall shorter than it', () => {
    const small = [rectRoom('s', 0, 0, 0.6, 0.6)]
    expect(placeOnWall([0.3, -0.05], small, 0.9, 0.2)!.segment).toEqual([[0, 0], [0.6, 0]])
  })
})
