import type { Opening, Plan, Room } from '../floorplan/plan-schema'
import { pointInPolygon, pointOnPolygonEdge, segmentOnPolygonEdge, segmentsCrossProperly, type Point } from '../geometry/polygon'

/**
 * The walking graph of a floor: rooms joined by doors. Pass-throughs are not walked through. A door marked
 * `exit` ends a route; a door between two rooms joins them. Inside a room people walk the shortest path that
 * stays inside its outline (straight when nothing is in the way, around the corners of an L-shaped room).
 */

const TOL = 0.05

export interface EgressDoor {
  id: string
  name: string
  /** Midpoint of the door segment: where a route passes it. */
  at: Point
  exit: Opening['exit']
  /** The one or two rooms whose walls carry the door. */
  roomIds: string[]
}

export interface EgressGraph {
  rooms: Room[]
  doors: EgressDoor[]
  /** Door ids of each room. */
  doorsOfRoom: Map<string, string[]>
}

export function buildEgressGraph(plan: Plan): EgressGraph {
  const doors: EgressDoor[] = []
  const doorsOfRoom = new Map<string, string[]>(plan.rooms.map((r) => [r.id, []]))
  for (const o of plan.openings) {
    if (o.kind !== 'door') continue
    const roomIds = plan.rooms.filter((r) => segmentOnPolygonEdge(o.segment[0], o.segment[1], r.polygon, TOL) >= 0).map((r) => r.id)
    if (!roomIds.length) continue
    const at: Point = [(o.segment[0][0] + o.segment[1][0]) / 2, (o.segment[0][1] + o.segment[1][1]) / 2]
    doors.push({ id: o.id, name: o.name, at, exit: o.exit ?? null, roomIds })
    for (const id of roomIds) doorsOfRoom.get(id)!.push(o.id)
  }
  return { rooms: plan.rooms, doors, doorsOfRoom }
}

const dist = (a: Point, b: Point) => Math.hypot(b[0] - a[0], b[1] - a[1])

/** True when the straight walk a→b stays inside the room (touching walls allowed). */
function visible(a: Point, b: Point, poly: readonly Point[]): boolean {
  const n = poly.length
  for (let i = 0; i < n; i++) if (segmentsCrossProperly(a, b, poly[i]!, poly[(i + 1) % n]!, 1e-6)) return false
  for (const f of [0.25, 0.5, 0.75]) {
    const m: Point = [a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1])]
    if (!pointInPolygon(m, poly) && pointOnPolygonEdge(m, poly, 1e-6) < 0) return false
  }
  return true
}

/**
 * Shortest walk from a to b inside a room's outline: straight when visible, else through the outline's corners
 * (visibility graph + Dijkstra; the shortest path inside a simple polygon bends only at its corners).
 * Returns the polyline a … b; when no inside path is found (a point off the room) the straight line.
 */
export function walkInsideRoom(a: Point, b: Point, poly: readonly Point[]): Point[] {
  if (visible(a, b, poly)) return [a, b]
  const nodes: Point[] = [a, b, ...poly]
  const n = nodes.length
  const best = new Array<number>(n).fill(Infinity)
  const prev = new Array<number>(n).fill(-1)
  const done = new Array<boolean>(n).fill(false)
  best[0] = 0
  for (;;) {
    let u = -1
    for (let i = 0; i < n; i++) if (!done[i] && best[i]! < Infinity && (u < 0 || best[i]! < best[u]!)) u = i
    if (u < 0 || u === 1) break
    done[u] = true
    for (let v = 0; v < n; v++) {
      if (done[v] || v === u) continue
      const d = best[u]! + dist(nodes[u]!, nodes[v]!)
      if (d < best[v]! && visible(nodes[u]!, nodes[v]!, poly)) { best[v] = d; prev[v] = u }
    }
  }
  if (best[1] === Infinity) return [a, b]
  const path: Point[] = []
  for (let v = 1; v >= 0; v = prev[v]!) path.unshift(nodes[v]!)
  return path
}

export const polylineLength = (pts: readonly Point[]) => pts.reduce((s, p, i) => (i ? s + dist(pts[i - 1]!, p) : 0), 0)

/** A representative start point in a room: its area centroid when inside, else the middle of its widest inside run. */
export function roomStartPoint(room: Room): Point {
  const poly = room.polygon
  let a = 0, cx = 0, cy = 0
  for (let i = 0; i < poly.length; i++) {
    const [x0, y0] = poly[i]!, [x1, y1] = poly[(i + 1) % poly.length]!
    const c = x0 * y1 - x1 * y0
    a += c; cx += (x0 + x1) * c; cy += (y0 + y1) * c
  }
  const c: Point = a ? [cx / (3 * a), cy / (3 * a)] : poly[0]!
  if (pointInPolygon(c, poly)) return c
  // Non-convex room whose centroid falls outside: the midpoint of a diagonal that lies inside.
  for (let i = 0; i < poly.length; i++) {
    for (let j = i + 2; j < poly.length; j++) {
      const m: Point = [(poly[i]![0] + poly[j]![0]) / 2, (poly[i]![1] + poly[j]![1]) / 2]
      if (pointInPolygon(m, poly)) return m
    }
  }
  return poly[0]!
}

/** One candidate route: the rooms walked in order, the doors passed (the exit door last), the drawn path. */
export interface CandidateRoute {
  roomIds: string[]
  doorIds: string[]
  /** Polyline per room leg (legs[k] is walked inside roomIds[k]). */
  legs: Point[][]
  lengthM: number
  exitId: string
}

/**
 * Every simple route (no room entered twice) from a point in a room to an exit door, shortest first,
 * up to `maxRoutes`; `truncated` when the search stopped early on a large floor.
 */
export function candidateRoutes(g: EgressGraph, startRoomId: string, start: Point, maxRoutes = 200, maxExpansions = 20000): { routes: CandidateRoute[]; truncated: boolean } {
  const doorById = new Map(g.doors.map((d) => [d.id, d]))
  const roomById = new Map(g.rooms.map((r) => [r.id, r]))
  const routes: CandidateRoute[] = []
  let expansions = 0
  let truncated = false
  const walk = (roomId: string, from: Point, rooms: string[], doors: string[], legs: Point[][], length: number) => {
    if (routes.length >= maxRoutes || ++expansions > maxExpansions) { truncated = true; return }
    const room = roomById.get(roomId)!
    const next = (g.doorsOfRoom.get(roomId) ?? []).map((id) => doorById.get(id)!).filter((d) => !doors.includes(d.id))
      .map((d) => ({ d, leg: walkInsideRoom(from, d.at, room.polygon) }))
      .map((x) => ({ ...x, len: polylineLength(x.leg) }))
      .sort((p, q) => p.len - q.len)
    for (const { d, leg, len } of next) {
      if (d.exit) { routes.push({ roomIds: rooms, doorIds: [...doors, d.id], legs: [...legs, leg], lengthM: length + len, exitId: d.id }); continue }
      const other = d.roomIds.find((id) => id !== roomId)
      if (!other || rooms.includes(other)) continue
      walk(other, d.at, [...rooms, other], [...doors, d.id], [...legs, leg], length + len)
    }
  }
  if (roomById.has(startRoomId)) walk(startRoomId, start, [startRoomId], [], [], 0)
  routes.sort((a, b) => a.lengthM - b.lengthM)
  return { routes, truncated }
}
