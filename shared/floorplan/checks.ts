import {
  boundingBox,
  findSelfIntersection,
  pointInPolygon,
  pointOnPolygonEdge,
  polygonsOverlap,
  segmentOnPolygonEdge,
  type Point,
} from '../geometry/polygon'
import { mayOverlap } from './overlap-prefilter'
import type { Plan, PlanCollection, Room } from './plan-schema'

/** Geometric tolerance of the checks, metres: walls closer than 5 mm count as touching. */
export const CHECK_TOLERANCE_M = 0.005

/** Overlapping room pairs listed at most; the plan is invalid from the first, and the rest follow once those are fixed. */
export const MAX_OVERLAPS_LISTED = 25

/** Shortest opening the engine resolves meaningfully, metres. */
export const MIN_OPENING_M = 0.05

export type ProblemSeverity = 'error' | 'warning'

export type ProblemCode =
  | 'no_rooms'
  | 'duplicate_id'
  | 'room_degenerate'
  | 'room_self_intersecting'
  | 'room_overlap'
  | 'opening_too_short'
  | 'opening_not_on_wall'
  | 'opening_exterior'
  | 'outside_rooms'
  | 'unknown_gas'
  | 'above_ceiling'
  | 'alarm_order'
  | 'no_sources'
  /** A room holding a gas source has no detector for that gas. */
  | 'source_room_no_detector'
  /** No door is marked as an exit, or a room has no chain of doors to one. */
  | 'no_exit'
  | 'room_no_exit_path'
  /** The engine's scenario schema refused the exported file. */
  | 'engine_input'

/**
 * One finding of the plan checks. `path` is the dot-joined location in the plan document
 * ("rooms.2.polygon"), the same form as the `fields` of API errors; `elementIds` lists what to
 * select when the problem is clicked.
 */
export interface PlanProblem {
  code: ProblemCode
  severity: ProblemSeverity
  message: string
  path: string
  elementIds: string[]
}

export interface CheckContext {
  /** Gas library ids the engine knows ("NH3", "Cl2", …). */
  knownGasIds: ReadonlySet<string>
  /** Ceiling height of the floor, metres. */
  ceilingM: number
}

function label(kind: string, element: { id: string; name: string }): string {
  return element.name ? `${kind} “${element.name}”` : `${kind} ${element.id}`
}

/** The room containing a plan point (on a wall counts as inside), or undefined. */
export function roomAt(plan: Pick<Plan, 'rooms'>, p: Point, tol = CHECK_TOLERANCE_M): Room | undefined {
  return (
    plan.rooms.find((r) => pointInPolygon(p, r.polygon)) ??
    plan.rooms.find((r) => pointOnPolygonEdge(p, r.polygon, tol) >= 0)
  )
}

/** The rooms whose walls carry an opening segment (one for an outside wall, two for a shared wall). */
export function roomsOfOpening(plan: Pick<Plan, 'rooms'>, segment: readonly [Point, Point], tol = CHECK_TOLERANCE_M): Room[] {
  return plan.rooms.filter((r) => segmentOnPolygonEdge(segment[0], segment[1], r.polygon, tol) >= 0)
}

function checkIds(plan: Plan, out: PlanProblem[]): void {
  const seen = new Map<string, string>()
  for (const collection of ['rooms', 'openings', 'sources', 'detectors', 'exhausts', 'workstations'] as PlanCollection[]) {
    plan[collection].forEach((element, i) => {
      const path = `${collection}.${i}.id`
      const first = seen.get(element.id)
      if (first) {
        out.push({ code: 'duplicate_id', severity: 'error', path, elementIds: [element.id],
          message: `Id “${element.id}” is used twice (${first} and ${path})` })
      } else seen.set(element.id, path)
    })
  }
}

function checkRooms(plan: Plan, out: PlanProblem[]): void {
  if (plan.rooms.length === 0) {
    out.push({ code: 'no_rooms', severity: 'error', path: 'rooms', elementIds: [], message: 'Draw at least one room' })
  }
  const simple: boolean[] = plan.rooms.map((room, i) => {
    const hit = findSelfIntersection(room.polygon, CHECK_TOLERANCE_M)
    if (!hit) return true
    const degenerate = hit[0] < 0
    out.push({
      code: degenerate ? 'room_degenerate' : 'room_self_intersecting',
      severity: 'error',
      path: `rooms.${i}.polygon`,
      elementIds: [room.id],
      message: degenerate
        ? `${label('Room', room)} has no area`
        : `The outline of ${label('room', room)} crosses itself (walls ${hit[0] + 1} and ${hit[1] + 1})`,
    })
    return false
  })
  // Room bounding boxes once; the pre-test and a cap on listed overlaps keep adversarial plans cheap (issue 14).
  const boxes = plan.rooms.map((r) => boundingBox(r.polygon))
  let overlaps = 0
  pairs: for (let i = 0; i < plan.rooms.length; i++) {
    for (let j = i + 1; j < plan.rooms.length; j++) {
      if (!simple[i] || !simple[j]) continue
      const [ax0, ay0, ax1, ay1] = boxes[i]!, [bx0, by0, bx1, by1] = boxes[j]!
      if (ax1 <= bx0 + CHECK_TOLERANCE_M || bx1 <= ax0 + CHECK_TOLERANCE_M || ay1 <= by0 + CHECK_TOLERANCE_M || by1 <= ay0 + CHECK_TOLERANCE_M) continue
      const a = plan.rooms[i]!, b = plan.rooms[j]!
      if (mayOverlap(a.polygon, b.polygon, CHECK_TOLERANCE_M) && polygonsOverlap(a.polygon, b.polygon, CHECK_TOLERANCE_M)) {
        out.push({ code: 'room_overlap', severity: 'error', path: `rooms.${j}.polygon`, elementIds: [a.id, b.id],
          message: `${label('Room', a)} and ${label('room', b)} overlap` })
        if (++overlaps >= MAX_OVERLAPS_LISTED) break pairs
      }
    }
  }
}

function checkOpenings(plan: Plan, out: PlanProblem[]): void {
  plan.openings.forEach((opening, i) => {
    const [a, b] = opening.segment
    const what = label(opening.kind === 'door' ? 'Door' : 'Pass-through', opening)
    const path = `openings.${i}.segment`
    if (Math.hypot(b[0] - a[0], b[1] - a[1]) < MIN_OPENING_M) {
      out.push({ code: 'opening_too_short', severity: 'error', path, elementIds: [opening.id],
        message: `${what} is shorter than ${MIN_OPENING_M * 100} cm` })
      return
    }
    const rooms = roomsOfOpening(plan, opening.segment)
    if (rooms.length === 0) {
      out.push({ code: 'opening_not_on_wall', severity: 'error', path, elementIds: [opening.id],
        message: `${what} is not on a wall` })
    } else if (rooms.length === 1 && opening.open) {
      out.push({ code: 'opening_exterior', severity: 'warning', path, elementIds: [opening.id, rooms[0]!.id],
        message: `${what} leads out of the drawn rooms; the simulation treats it as a wall` })
    }
  })
}

function checkPlacement(plan: Plan, ctx: CheckContext, out: PlanProblem[]): void {
  const items = [
    ...plan.sources.map((e, i) => ({ e, i, collection: 'sources', kind: 'Source', height: e.releaseHeightM, heightField: 'releaseHeightM', heightName: 'release height', severity: 'error' as const })),
    ...plan.detectors.map((e, i) => ({ e, i, collection: 'detectors', kind: 'Detector', height: e.mountingHeightM, heightField: 'mountingHeightM', heightName: 'mounting height', severity: 'error' as const })),
    ...plan.exhausts.map((e, i) => ({ e, i, collection: 'exhausts', kind: 'Exhaust', height: e.heightM, heightField: 'heightM', heightName: 'height', severity: 'warning' as const })),
    ...plan.workstations.map((e, i) => ({ e, i, collection: 'workstations', kind: 'Workstation', height: e.breathingHeightM, heightField: 'breathingHeightM', heightName: 'breathing height', severity: 'warning' as const })),
  ]
  for (const { e, i, collection, kind, height, heightField, heightName, severity } of items) {
    if (!roomAt(plan, e.position)) {
      out.push({ code: 'outside_rooms', severity, path: `${collection}.${i}.position`, elementIds: [e.id],
        message: `${label(kind, e)} is outside every room` })
    }
    if (height !== null && height > ctx.ceilingM + 1e-9) {
      out.push({ code: 'above_ceiling', severity, path: `${collection}.${i}.${heightField}`, elementIds: [e.id],
        message: `The ${heightName} of ${label(kind.toLowerCase(), e)} is above the ceiling (${ctx.ceilingM} m)` })
    }
  }
}

function checkGases(plan: Plan, ctx: CheckContext, out: PlanProblem[]): void {
  const gasHolders = [
    ...plan.sources.map((e, i) => ({ e, path: `sources.${i}.gasId`, kind: 'Source' })),
    ...plan.detectors.map((e, i) => ({ e, path: `detectors.${i}.gasId`, kind: 'Detector' })),
  ]
  for (const { e, path, kind } of gasHolders) {
    if (!ctx.knownGasIds.has(e.gasId)) {
      out.push({ code: 'unknown_gas', severity: 'error', path, elementIds: [e.id],
        message: `${label(kind, e)} names gas “${e.gasId}”, which is not in the gas library` })
    }
  }
  plan.detectors.forEach((d, i) => {
    if (d.alarmLowPpm > d.alarmHighPpm) {
      out.push({ code: 'alarm_order', severity: 'warning', path: `detectors.${i}.alarmHighPpm`, elementIds: [d.id],
        message: `${label('Detector', d)}: the high alarm is below the low alarm` })
    }
  })
  if (plan.sources.length === 0) {
    out.push({ code: 'no_sources', severity: 'error', path: 'sources', elementIds: [],
      message: 'Place at least one gas source: there is nothing to simulate yet' })
  }
}

/**
 * Check a plan as you draw. Errors make the plan unusable as engine input (no room or no source,
 * overlapping rooms, crossing outlines, doors off the walls, items outside every room, unknown gases); warnings are
 * shown but do not block. The server runs the same function, so both sides agree.
 */
export function checkPlan(plan: Plan, ctx: CheckContext): PlanProblem[] {
  const out: PlanProblem[] = []
  checkIds(plan, out)
  checkRooms(plan, out)
  checkOpenings(plan, out)
  checkPlacement(plan, ctx, out)
  checkGases(plan, ctx, out)
  checkDetectionAndExits(plan, out)
  return out
}

/**
 * Warnings that matter for the response plan: a source room with no detector for its gas (nobody is warned, so no
 * egress time can be predicted), and rooms with no way to a marked exit (no route can be computed).
 */
function checkDetectionAndExits(plan: Plan, out: PlanProblem[]): void {
  plan.sources.forEach((src, i) => {
    const room = roomAt(plan, src.position)
    if (!room) return
    const covered = plan.detectors.some((d) => d.gasId === src.gasId && roomAt(plan, d.position)?.id === room.id)
    if (!covered) {
      out.push({ code: 'source_room_no_detector', severity: 'warning', path: `sources.${i}.position`, elementIds: [src.id, room.id],
        message: `${label('Room', room)} holds ${label('source', src)} but no ${src.gasId} detector: without one no alarm is predicted and nobody is warned. Place one, or let the detector advisor propose positions from a run.` })
    }
  })
  if (!plan.rooms.length) return
  const doors = plan.openings.filter((o) => o.kind === 'door')
  const exits = doors.filter((o) => o.exit)
  if (!exits.length) {
    out.push({ code: 'no_exit', severity: 'warning', path: 'openings', elementIds: [],
      message: 'No door is marked as an exit (to outdoors, a stair or a protected corridor): egress routes cannot be computed' })
    return
  }
  // Rooms reaching an exit: start from the rooms carrying an exit door and spread through the doors.
  const roomsOf = new Map(doors.map((d) => [d.id, roomsOfOpening(plan, d.segment).map((r) => r.id)]))
  const reach = new Set(exits.flatMap((e) => roomsOf.get(e.id) ?? []))
  for (let changed = true; changed;) {
    changed = false
    for (const ids of roomsOf.values()) {
      if (ids.some((id) => reach.has(id)) && ids.some((id) => !reach.has(id))) { ids.forEach((id) => reach.add(id)); changed = true }
    }
  }
  plan.rooms.forEach((room, i) => {
    if (!reach.has(room.id)) {
      out.push({ code: 'room_no_exit_path', severity: 'warning', path: `rooms.${i}`, elementIds: [room.id],
        message: `${label('Room', room)} has no path through doors to a marked exit` })
    }
  })
}

/** True when no problem is an error. */
export function isPlanValid(problems: readonly PlanProblem[]): boolean {
  return problems.every((p) => p.severity !== 'error')
}
