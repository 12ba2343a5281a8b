import type { Point } from '../geometry/polygon'
import type { Room } from './plan-schema'

/**
 * Snapping while drawing: to the corners and walls of neighbouring rooms first (so rooms share walls
 * exactly and never leave slivers or overlaps), then to alignment with their corners, then to the grid.
 * Each snap reports the guides the canvas draws so people see why the cursor jumped.
 */

export type SnapGuide =
  | { kind: 'vertex'; at: Point }
  | { kind: 'edge'; from: Point; to: Point }
  | { kind: 'align-x'; x: number; from: Point }
  | { kind: 'align-y'; y: number; from: Point }
  | { kind: 'grid'; at: Point }

export interface SnapResult {
  point: Point
  guides: SnapGuide[]
}

export interface SnapOptions {
  /** Grid spacing, metres; 0 turns grid snapping off. */
  gridM: number
  /** How far the cursor is pulled, metres (the canvas passes a few screen pixels converted to metres). */
  toleranceM: number
  /** Rooms whose walls attract the cursor. */
  rooms: readonly Pick<Room, 'id' | 'polygon'>[]
  /** Room being edited, whose own walls must not attract (it would snap to itself). */
  excludeRoomId?: string
  /** Extra points that attract like corners, e.g. the corners already placed in the outline being drawn. */
  extraVertices?: readonly Point[]
}

/** Round a point to the nearest grid intersection. */
export function snapToGrid(p: Point, gridM: number): Point {
  if (!(gridM > 0)) return p
  return [roundTo(p[0], gridM), roundTo(p[1], gridM)]
}

function roundTo(v: number, step: number): number {
  // Round through the step count to avoid 0.30000000000000004-style residue in stored plans.
  const n = Math.round(v / step)
  return Number((n * step).toFixed(9))
}

/** Closest point to p on segment a–b, with its parameter t ∈ [0, 1]. */
export function closestPointOnSegment(p: Point, a: Point, b: Point): { point: Point; t: number } {
  const dx = b[0] - a[0], dy = b[1] - a[1]
  const len2 = dx * dx + dy * dy
  let t = len2 > 0 ? ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2 : 0
  t = Math.min(1, Math.max(0, t))
  return { point: [a[0] + t * dx, a[1] + t * dy], t }
}

function edgesOf(rooms: SnapOptions['rooms'], exclude?: string): Array<[Point, Point]> {
  const edges: Array<[Point, Point]> = []
  for (const room of rooms) {
    if (room.id === exclude) continue
    const n = room.polygon.length
    for (let i = 0; i < n; i++) edges.push([room.polygon[i]!, room.polygon[(i + 1) % n]!])
  }
  return edges
}

/**
 * Snap a drawing point. Order: a neighbour's corner within tolerance; a neighbour's wall within
 * tolerance (the point slides along it, and along it onto the grid where the wall is axis-aligned);
 * then x and y separately align with a corner or fall on the grid.
 */
export function snapPoint(p: Point, options: SnapOptions): SnapResult {
  const { gridM, toleranceM: tol } = options
  const vertices: Point[] = [
    ...options.rooms.filter((r) => r.id !== options.excludeRoomId).flatMap((r) => r.polygon),
    ...(options.extraVertices ?? []),
  ]

  let best: Point | null = null
  let bestD = tol
  for (const v of vertices) {
    const d = Math.hypot(v[0] - p[0], v[1] - p[1])
    if (d <= bestD) { best = v; bestD = d }
  }
  if (best) return { point: [best[0], best[1]], guides: [{ kind: 'vertex', at: best }] }

  let edge: { point: Point; from: Point; to: Point } | null = null
  bestD = tol
  for (const [a, b] of edgesOf(options.rooms, options.excludeRoomId)) {
    const { point } = closestPointOnSegment(p, a, b)
    const d = Math.hypot(point[0] - p[0], point[1] - p[1])
    if (d <= bestD) { edge = { point, from: a, to: b }; bestD = d }
  }
  if (edge) {
    const { from, to } = edge
    let point = edge.point
    // On an axis-aligned wall, also keep the free coordinate on the grid.
    if (gridM > 0 && Math.abs(from[0] - to[0]) < 1e-9) point = [from[0], clampBetween(roundTo(point[1], gridM), from[1], to[1])]
    else if (gridM > 0 && Math.abs(from[1] - to[1]) < 1e-9) point = [clampBetween(roundTo(point[0], gridM), from[0], to[0]), from[1]]
    return { point, guides: [{ kind: 'edge', from, to }] }
  }

  const guides: SnapGuide[] = []
  let x = gridM > 0 ? roundTo(p[0], gridM) : p[0]
  let y = gridM > 0 ? roundTo(p[1], gridM) : p[1]
  let alignX: Point | null = null, alignY: Point | null = null
  let dX = tol, dY = tol
  for (const v of vertices) {
    const ex = Math.abs(v[0] - p[0]), ey = Math.abs(v[1] - p[1])
    if (ex <= dX) { alignX = v; dX = ex }
    if (ey <= dY) { alignY = v; dY = ey }
  }
  if (alignX) { x = alignX[0]; guides.push({ kind: 'align-x', x, from: alignX }) }
  if (alignY) { y = alignY[1]; guides.push({ kind: 'align-y', y, from: alignY }) }
  if (!alignX && !alignY && gridM > 0) guides.push({ kind: 'grid', at: [x, y] })
  return { point: [x, y], guides }
}

function clampBetween(v: number, a: number, b: number): number {
  return Math.min(Math.max(a, b), Math.max(Math.min(a, b), v))
}

export interface WallPlacement {
  /** The opening's end points, on the wall. */
  segment: [Point, Point]
  /** The wall it sits on. */
  wall: [Point, Point]
}

/**
 * Place an opening of `widthM` centred at the wall point nearest to p (within `toleranceM`), kept
 * entirely on that wall. Returns null when no wall is near enough.
 */
export function placeOnWall(
  p: Point,
  rooms: readonly Pick<Room, 'id' | 'polygon'>[],
  widthM: number,
  toleranceM: number,
  gridM = 0,
): WallPlacement | null {
  let found: { point: Point; from: Point; to: Point; d: number } | null = null
  for (const [a, b] of edgesOf(rooms)) {
    const { point } = closestPointOnSegment(p, a, b)
    const d = Math.hypot(point[0] - p[0], point[1] - p[1])
    if (d <= toleranceM && (!found || d < found.d)) found = { point, from: a, to: b, d }
  }
  if (!found) return null
  const { from, to } = found
  const length = Math.hypot(to[0] - from[0], to[1] - from[1])
  if (length === 0) return null
  const width = Math.min(widthM, length)
  const ux = (to[0] - from[0]) / length, uy = (to[1] - from[1]) / length
  let s = (found.point[0] - from[0]) * ux + (found.point[1] - from[1]) * uy
  if (gridM > 0) s = roundTo(s - width / 2, gridM) + width / 2
  s = Math.min(length - width / 2, Math.max(width / 2, s))
  const at = (u: number): Point => [Number((from[0] + u * ux).toFixed(9)), Number((from[1] + u * uy).toFixed(9))]
  return { segment: [at(s - width / 2), at(s + width / 2)], wall: [from, to] }
}
