import type { z } from 'zod'
import { GasSchema, type Gas } from '../gases/gas-schema'
import { findGas, listGasIds } from '../gases/library'
import {
  findSelfIntersection, pointInPolygon, pointOnPolygonEdge, polygonsOverlap, segmentOnPolygonEdge, type Point,
} from '../geometry/polygon'
import { ScenarioError, formatPath } from './errors'
import { FACTOR_CACHE_LEVELS } from './factored-sweep'
import { ScenarioSchema, type Scenario } from './scenario-schema'

/** Largest grid (cells in the bounding box × layers) the engine accepts. */
export const MAX_CELLS = 8_000_000
/** Largest memory estimate accepted for one run, bytes. */
export const MAX_MEMORY_BYTES = 1.5e9

/** A validated scenario with its gas resolved to plain properties. */
export interface ValidScenario {
  scenario: Scenario
  gas: Gas
}

function zodMessage(err: z.ZodError, input: unknown): ScenarioError {
  const issue = err.issues[0]!
  const field = formatPath(issue.path)
  if (field.startsWith('gas')) {
    const gas = (input as { gas?: unknown }).gas
    if (gas && typeof gas === 'object' && 'name' in gas) {
      const g = GasSchema.safeParse(gas)
      if (!g.success) return new ScenarioError(`gas.${formatPath(g.error.issues[0]!.path)}`, g.error.issues[0]!.message)
    }
    return new ScenarioError('gas', 'expected {"id": "<library gas>"} or full inline gas properties')
  }
  return new ScenarioError(field, issue.message)
}

/** Index of the room whose polygon contains (x, y), or -1 (first match; rooms do not overlap). */
export function roomAt(rooms: Scenario['rooms'], x: number, y: number): number {
  for (let r = 0; r < rooms.length; r++) if (pointInPolygon([x, y], rooms[r]!.polygon_m)) return r
  return -1
}

function checkUnique(list: { id: string }[], field: string): void {
  const seen = new Set<string>()
  list.forEach((item, i) => {
    if (seen.has(item.id)) throw new ScenarioError(`${field}[${i}].id`, `duplicate id "${item.id}"`)
    seen.add(item.id)
  })
}

/**
 * Bytes per grid cell a run holds: seven float64 fields (concentration, sinks, right-hand side,
 * outgoing rates, scaled sinks, dilution rates, return scratch), two float32 increment histories, the
 * room index, the face coefficients and their implicit weights (12 float32), and the cached
 * factorisations (FACTOR_CACHE_LEVELS ladder levels plus one odd step, 48 bytes each).
 */
const BYTES_PER_CELL = 7 * 8 + 2 * 4 + 2 + 12 * 4 + (FACTOR_CACHE_LEVELS + 1) * 48

/** Estimated peak memory of a run, bytes (fields, coefficients, factorisations and stored snapshots). */
export function estimateMemoryBytes(s: Scenario, planCells: number): number {
  const cells = planCells * s.grid.layers
  const outputs = Math.floor(s.duration_s / s.output_interval_s + 1e-9) + 1
  const nThresholds = 12 + s.thresholds_ppm.length
  const ringSlots = Math.ceil(900 / s.output_interval_s) + 2 // rolling 15-min TWA
  return cells * BYTES_PER_CELL + outputs * planCells * 4 * 2 + planCells * 8 * (nThresholds + 6 + ringSlots)
}

/**
 * Parse and check a scenario: schema (zod), then geometry (self-intersection, overlap, openings on
 * walls, points inside rooms), gas lookup and size limits. Throws {@link ScenarioError} naming the field.
 */
export function validateScenario(input: unknown): ValidScenario {
  const parsed = ScenarioSchema.safeParse(input)
  if (!parsed.success) throw zodMessage(parsed.error, input)
  const s = parsed.data
  const rooms = s.rooms
  checkUnique(rooms, 'rooms')
  checkUnique(s.openings, 'openings')
  checkUnique(s.sources, 'sources')
  checkUnique(s.probes, 'probes')
  checkUnique(s.local_exhausts, 'local_exhausts')
  if (s.output_interval_s > s.duration_s) throw new ScenarioError('output_interval_s', `${s.output_interval_s} s exceeds duration_s ${s.duration_s} s`)
  if (s.duration_s / s.output_interval_s > 200000) throw new ScenarioError('output_interval_s', 'more than 200,000 outputs; use a longer interval')

  rooms.forEach((room, i) => {
    const bad = findSelfIntersection(room.polygon_m)
    if (bad) {
      throw new ScenarioError(`rooms[${i}].polygon_m`, bad[0] < 0 ? 'degenerate polygon (zero area)' : `self-intersecting (edges ${bad[0]} and ${bad[1]} meet)`)
    }
    for (let j = 0; j < i; j++) {
      if (polygonsOverlap(room.polygon_m, rooms[j]!.polygon_m)) throw new ScenarioError(`rooms[${i}].polygon_m`, `overlaps room "${rooms[j]!.id}"`)
    }
  })

  s.openings.forEach((o, i) => {
    const [a, b] = o.segment_m
    if (Math.hypot(b[0] - a[0], b[1] - a[1]) < 1e-6) throw new ScenarioError(`openings[${i}].segment_m`, 'zero length')
    const onRooms = rooms.filter((r) => segmentOnPolygonEdge(a, b, r.polygon_m) >= 0).map((r) => r.id)
    if (onRooms.length === 0) throw new ScenarioError(`openings[${i}].segment_m`, 'does not lie on any room wall')
    if (o.transfer) {
      if (!rooms.some((r) => r.id === o.transfer!.into)) throw new ScenarioError(`openings[${i}].transfer.into`, `unknown room "${o.transfer.into}"`)
      if (!onRooms.includes(o.transfer.into)) throw new ScenarioError(`openings[${i}].transfer.into`, `room "${o.transfer.into}" is not on either side of the opening`)
      if (onRooms.length < 2) throw new ScenarioError(`openings[${i}].transfer`, 'opening is on an outside wall; transfer air needs a room on each side')
      if (!o.open && !(o.undercut_m && o.undercut_m > 0) && o.transfer.flow_m3_s > 0) {
        throw new ScenarioError(`openings[${i}].transfer`, 'the door is closed and has no undercut_m, so transfer air has no path; open the door or give the gap under it')
      }
    }
  })

  const checkPoint = (p: readonly [number, number, number], field: string) => {
    const xy: Point = [p[0], p[1]]
    if (p[2] > s.ceiling_m) throw new ScenarioError(field, `z = ${p[2]} m is above ceiling_m ${s.ceiling_m} m`)
    if (roomAt(rooms, p[0], p[1]) < 0 && !rooms.some((r) => pointOnPolygonEdge(xy, r.polygon_m, 1e-9) >= 0)) {
      throw new ScenarioError(field, `(${p[0]}, ${p[1]}) is outside every room`)
    }
  }
  s.sources.forEach((src, i) => {
    checkPoint(src.position_m, `sources[${i}].position_m`)
    const r = src.release
    if (r.kind === 'constant' && r.end_s !== undefined && r.end_s < r.start_s) throw new ScenarioError(`sources[${i}].release.end_s`, `end_s ${r.end_s} is before start_s ${r.start_s}`)
    if (r.kind === 'schedule') {
      for (let k = 1; k < r.points.length; k++) {
        if (r.points[k]![0] <= r.points[k - 1]![0]) throw new ScenarioError(`sources[${i}].release.points[${k}]`, 'times must increase strictly')
      }
    }
    if (r.kind === 'cylinder' && r.liquefied) {
      const pv = r.liquefied.vapour_pressure_pa
      // A liquefied gas sits at its vapour pressure: a cylinder pressure below it is not a state the
      // contents can be in (1 % slack for rounded data-sheet values).
      if (pv > 1.01 * r.pressure_pa) throw new ScenarioError(`sources[${i}].release.liquefied.vapour_pressure_pa`, `${pv} Pa exceeds the cylinder pressure_pa ${r.pressure_pa} Pa; a liquefied gas is at its vapour pressure (pressures are absolute)`)
      if (pv <= r.ambient_pressure_pa) throw new ScenarioError(`sources[${i}].release.liquefied.vapour_pressure_pa`, `${pv} Pa is not above ambient ${r.ambient_pressure_pa} Pa, so nothing would leak (pressures are absolute)`)
    }
    if (r.kind === 'cylinder' && r.pressure_pa <= r.ambient_pressure_pa && !r.liquefied) {
      throw new ScenarioError(`sources[${i}].release.pressure_pa`, `${r.pressure_pa} Pa is not above ambient ${r.ambient_pressure_pa} Pa (pressures are absolute)`)
    }
  })
  s.probes.forEach((p, i) => checkPoint(p.position_m, `probes[${i}].position_m`))
  s.local_exhausts.forEach((e, i) => checkPoint(e.position_m, `local_exhausts[${i}].position_m`))

  let gas: Gas
  if ('name' in s.gas) {
    const g = GasSchema.safeParse(s.gas)
    if (!g.success) throw new ScenarioError(`gas.${formatPath(g.error.issues[0]!.path)}`, g.error.issues[0]!.message)
    gas = g.data
  } else {
    const found = findGas(s.gas.id)
    if (!found) throw new ScenarioError('gas.id', `unknown gas "${s.gas.id}" (library: ${listGasIds().join(', ')})`)
    gas = found
  }

  // Size limits, before any allocation.
  const h = s.grid.cell_m
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity
  for (const r of rooms) for (const [x, y] of r.polygon_m) {
    x0 = Math.min(x0, x); y0 = Math.min(y0, y); x1 = Math.max(x1, x); y1 = Math.max(y1, y)
  }
  const planCells = (Math.ceil(x1 / h - 1e-9) - Math.floor(x0 / h + 1e-9)) * (Math.ceil(y1 / h - 1e-9) - Math.floor(y0 / h + 1e-9))
  const cells = planCells * s.grid.layers
  if (cells > MAX_CELLS) throw new ScenarioError('grid.cell_m', `grid of ${cells.toLocaleString('en-US')} cells exceeds the limit of ${MAX_CELLS.toLocaleString('en-US')}; use larger cells or fewer layers`)
  const mem = estimateMemoryBytes(s, planCells)
  if (mem > MAX_MEMORY_BYTES) throw new ScenarioError('grid.cell_m', `run would need about ${(mem / 1e6).toFixed(0)} MB (limit ${(MAX_MEMORY_BYTES / 1e6).toFixed(0)} MB); use larger cells, fewer layers or a longer output_interval_s`)
  return { scenario: s, gas }
}
