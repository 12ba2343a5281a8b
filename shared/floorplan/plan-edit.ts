import type { Point } from '../geometry/polygon'
import { defaultAlarmSetPoints } from '../gases/alarm-setpoints'
import { findGas } from '../gases/library'
import {
  PLAN_COLLECTIONS, type Detector, type Exhaust, type Opening, type Plan, type PlanCollection, type Room, type Source, type Workstation,
} from './plan-schema'

/**
 * Pure editing operations on a plan document, used by the editor store: each returns a new plan (or
 * element) and never mutates its input, so undo can keep the previous document as it was.
 */

export type PlanElement = Room | Opening | Source | Detector | Exhaust | Workstation

/** Where an element lives: its collection and index. */
export function locate(plan: Plan, id: string): { collection: PlanCollection; index: number } | null {
  for (const collection of PLAN_COLLECTIONS) {
    const index = (plan[collection] as PlanElement[]).findIndex((e) => e.id === id)
    if (index >= 0) return { collection, index }
  }
  return null
}

export function findElement(plan: Plan, id: string): { collection: PlanCollection; element: PlanElement } | null {
  const at = locate(plan, id)
  return at ? { collection: at.collection, element: plan[at.collection][at.index]! } : null
}

/** A short id unique in the plan, e.g. "room-3". */
export function nextId(plan: Plan, prefix: string): string {
  const used = new Set(PLAN_COLLECTIONS.flatMap((c) => (plan[c] as PlanElement[]).map((e) => e.id)))
  for (let n = 1; ; n++) if (!used.has(`${prefix}-${n}`)) return `${prefix}-${n}`
}

/** Replace one element (same id) wherever it is. */
export function replaceElement(plan: Plan, element: PlanElement): Plan {
  const at = locate(plan, element.id)
  if (!at) return plan
  const list = [...(plan[at.collection] as PlanElement[])]
  list[at.index] = element
  return { ...plan, [at.collection]: list }
}

export function addElement(plan: Plan, collection: PlanCollection, element: PlanElement): Plan {
  return { ...plan, [collection]: [...(plan[collection] as PlanElement[]), element] }
}

export function removeElements(plan: Plan, ids: ReadonlySet<string>): Plan {
  const out = { ...plan }
  for (const c of PLAN_COLLECTIONS) (out[c] as PlanElement[]) = (plan[c] as PlanElement[]).filter((e) => !ids.has(e.id))
  return out
}

const shift = (p: Point | readonly [number, number], dx: number, dy: number): [number, number] => [round(p[0] + dx), round(p[1] + dy)]
/** Keep stored coordinates free of float noise (0.1 mm resolution is far below anything drawn). */
export const round = (v: number) => Math.round(v * 1e4) / 1e4

/** Move an element by (dx, dy) metres. */
export function translateElement<E extends PlanElement>(element: E, dx: number, dy: number): E {
  if ('polygon' in element) return { ...element, polygon: element.polygon.map((p) => shift(p, dx, dy)) }
  if ('segment' in element) return { ...element, segment: [shift(element.segment[0], dx, dy), shift(element.segment[1], dx, dy)] }
  return { ...element, position: shift(element.position, dx, dy) }
}

export function translateElements(plan: Plan, ids: ReadonlySet<string>, dx: number, dy: number): Plan {
  const out = { ...plan }
  for (const c of PLAN_COLLECTIONS) {
    ;(out[c] as PlanElement[]) = (plan[c] as PlanElement[]).map((e) => (ids.has(e.id) ? translateElement(e, dx, dy) : e))
  }
  return out
}

/** Copies of elements with fresh ids, offset by (dx, dy); returns the new plan and the new ids. */
export function duplicateElements(plan: Plan, elements: readonly PlanElement[], dx: number, dy: number): { plan: Plan; ids: string[] } {
  let out = plan
  const ids: string[] = []
  for (const e of elements) {
    const kind = collectionOf(e)
    const id = nextId(out, ID_PREFIX[kind])
    const copy = { ...translateElement(e, dx, dy), id, name: e.name ? `${e.name} (copy)` : '' } as PlanElement
    out = addElement(out, kind, copy)
    ids.push(id)
  }
  return { plan: out, ids }
}

export const ID_PREFIX: Record<PlanCollection, string> = {
  rooms: 'room', openings: 'door', sources: 'source', detectors: 'detector', exhausts: 'exhaust', workstations: 'ws',
}

export function collectionOf(e: PlanElement): PlanCollection {
  if ('polygon' in e) return 'rooms'
  if ('segment' in e) return 'openings'
  if ('restriction' in e) return 'sources'
  if ('alarmLowPpm' in e) return 'detectors'
  if ('flowM3S' in e) return 'exhausts'
  return 'workstations'
}

/** Move one vertex of a room. */
export function moveVertex(room: Room, index: number, to: Point): Room {
  return { ...room, polygon: room.polygon.map((p, i) => (i === index ? [round(to[0]), round(to[1])] : p)) }
}

/** Insert a vertex after `index` (on edge index → index+1). */
export function insertVertex(room: Room, index: number, at: Point): Room {
  const polygon = [...room.polygon]
  polygon.splice(index + 1, 0, [round(at[0]), round(at[1])])
  return { ...room, polygon }
}

/** Remove a vertex, keeping at least a triangle. */
export function removeVertex(room: Room, index: number): Room {
  if (room.polygon.length <= 3) return room
  return { ...room, polygon: room.polygon.filter((_, i) => i !== index) }
}

/** Axis-aligned rectangle from two corners, counter-clockwise from the south-west corner. */
export function rectangle(a: Point, b: Point): [number, number][] {
  const x0 = Math.min(a[0], b[0]), x1 = Math.max(a[0], b[0])
  const y0 = Math.min(a[1], b[1]), y1 = Math.max(a[1], b[1])
  return [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]
}

/** Room centroid (area-weighted), for labels. */
export function centroid(polygon: readonly Point[]): [number, number] {
  let a = 0, cx = 0, cy = 0
  for (let i = 0; i < polygon.length; i++) {
    const [x0, y0] = polygon[i]!, [x1, y1] = polygon[(i + 1) % polygon.length]!
    const f = x0 * y1 - x1 * y0
    a += f; cx += (x0 + x1) * f; cy += (y0 + y1) * f
  }
  if (Math.abs(a) < 1e-12) {
    const n = polygon.length || 1
    return [polygon.reduce((s, p) => s + p[0], 0) / n, polygon.reduce((s, p) => s + p[1], 0) / n]
  }
  return [cx / (3 * a), cy / (3 * a)]
}

/** Gas given to a new source or detector when none is chosen: N2, an inert gas nobody mistakes for a hazard. */
export const FIRST_GAS_DEFAULT = 'N2'

export type GasDefaultBasis = 'last-source' | 'last-detector' | 'first'

/** The gas a new source or detector starts with: the last source's, else the last detector's, else N2. */
export function defaultGas(plan: Plan): { gasId: string; basis: GasDefaultBasis } {
  const s = plan.sources.at(-1)?.gasId
  if (s) return { gasId: s, basis: 'last-source' }
  const d = plan.detectors.at(-1)?.gasId
  if (d) return { gasId: d, basis: 'last-detector' }
  return { gasId: FIRST_GAS_DEFAULT, basis: 'first' }
}

/** What the property panel says about a default gas, so that nobody keeps it without noticing. */
export function gasDefaultNote(gasId: string, basis: GasDefaultBasis, what: 'source' | 'detector'): string {
  const why = basis === 'last-source' ? 'the same as the last source'
    : basis === 'last-detector' ? 'the same as the last detector'
      : 'the default for a first ' + what
  return `Gas: ${gasId} (${why}). Choose another if this ${what} ${what === 'source' ? 'holds' : 'detects'} a different gas.`
}

/** New elements with sensible, clearly generic defaults; people adjust them in the property panel. */
export const makeElement = {
  room(plan: Plan, polygon: [number, number][]): Room {
    const id = nextId(plan, 'room')
    return { id, name: `Room ${id.split('-')[1]}`, kind: 'lab', polygon, ventilation: { mode: 'ach', airChangesPerHour: 6 } }
  },
  opening(plan: Plan, kind: Opening['kind'], segment: [Point, Point]): Opening {
    return { id: nextId(plan, kind === 'door' ? 'door' : 'pass'), name: '', kind, open: kind === 'door',
      segment: [[segment[0][0], segment[0][1]], [segment[1][0], segment[1][1]]] }
  },
  source(plan: Plan, at: Point, gasId = FIRST_GAS_DEFAULT): Source {
    return { id: nextId(plan, 'source'), name: '', kind: 'cylinder', gasId, position: [at[0], at[1]], releaseHeightM: 1,
      liquefied: false, inventoryKg: null, pressurePa: 1.5e7, waterVolumeM3: 0.05, restriction: { kind: 'orifice', diameterM: 0.001 },
      dischargeCoefficient: 0.62 }
  },
  detector(plan: Plan, at: Point, gasId = FIRST_GAS_DEFAULT): Detector {
    const gas = findGas(gasId)
    const [low, high] = gas ? defaultAlarmSetPoints(gas).map((a) => a.ppm) : []
    const heavy = (gas?.relative_density ?? 1) > 1.1
    return { id: nextId(plan, 'detector'), name: '', gasId, position: [at[0], at[1]], mountingHeightM: heavy ? 0.45 : 1.5,
      alarmLowPpm: round(low ?? 10), alarmHighPpm: round(high ?? low ?? 20) }
  },
  exhaust(plan: Plan, at: Point): Exhaust {
    return { id: nextId(plan, 'exhaust'), name: '', kind: 'hood', position: [at[0], at[1]], heightM: 1, flowM3S: 0.47 }
  },
  workstation(plan: Plan, at: Point): Workstation {
    return { id: nextId(plan, 'ws'), name: '', position: [at[0], at[1]], breathingHeightM: 1.5 }
  },
}
