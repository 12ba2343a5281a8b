import { chooseDiffusivity } from '../engine/eddy-diffusivity'
import { ScenarioSchema, type ScenarioInput } from '../engine/scenario-schema'
import type { Plan } from '../floorplan/plan-schema'
import { findGas } from '../gases/library'
import { distancePointSegment, pointInPolygon, type Point } from '../geometry/polygon'
import { VENTILATION_STATE_LABELS, type RunSummary, type ScenarioConfig } from '../schemas/runs'
import { buildRunScenario } from './build-scenario'

/**
 * Sensitivity bundles (issue 17, items 1–4). A run of a scenario with `sensitivity.enabled` is the nominal case plus
 * ordinary runs whose inputs differ in one way each: the effective diffusivity ×0.3 and ×3 (the engine README's
 * advice for the largest unknown), the ventilation failure the scenario names, and the leak moved 1 m each way
 * inside its room. Each is its own job, so any worker on any machine takes it. The band of a time to a limit is
 * the earliest and latest over the cases, and the case giving the earliest is named. Pure: no DB, no DOM.
 */

export const D_FACTORS = [0.3, 3] as const
/** How far the position cases move the leak, m, and how close to a wall a moved leak may come. */
export const POSITION_STEP_M = 1
const WALL_CLEARANCE_M = 0.3

export interface BundleCase {
  key: string
  label: string
  config: ScenarioConfig
}

/** The diffusivity the nominal run will use (the scenario's override, else the engine's documented estimate). */
export function nominalDiffusivity(plan: Plan, ceilingM: number, config: ScenarioConfig): number | null {
  if (config.diffusivityM2S !== undefined) return config.diffusivityM2S
  const built = buildRunScenario(plan, ceilingM, config)
  if (!built.ok) return null
  const gas = findGas(built.gasId)
  if (!gas) return null
  return chooseDiffusivity(ScenarioSchema.parse(built.scenario), gas).value
}

/** True when every leaking source moved by (dx, dy) stays in its own room, clear of the walls. */
function offsetFits(plan: Plan, config: ScenarioConfig, dx: number, dy: number): boolean {
  return config.sourceIds.every((id) => {
    const s = plan.sources.find((x) => x.id === id)
    if (!s) return false
    const room = plan.rooms.find((r) => pointInPolygon(s.position, r.polygon))
    const p: Point = [s.position[0] + dx, s.position[1] + dy]
    if (!room || !pointInPolygon(p, room.polygon)) return false
    const poly = room.polygon
    return poly.every((a, i) => distancePointSegment(p, a, poly[(i + 1) % poly.length]!) >= WALL_CLEARANCE_M)
  })
}

/** The extra cases of a bundle (the nominal run is the scenario itself); empty when the scenario has them off. */
export function bundleCases(plan: Plan, ceilingM: number, config: ScenarioConfig): { cases: BundleCase[]; notes: string[] } {
  const sens = config.sensitivity
  if (!sens?.enabled) return { cases: [], notes: [] }
  const base: ScenarioConfig = { ...config, sensitivity: undefined }
  const cases: BundleCase[] = []
  const notes: string[] = []
  const d = nominalDiffusivity(plan, ceilingM, config)
  if (d !== null) {
    for (const f of D_FACTORS) {
      cases.push({ key: `d_x${f}`, label: `Diffusivity ×${f} (${(d * f).toPrecision(3)} m²/s)`, config: { ...base, diffusivityM2S: Math.min(1, d * f) } })
    }
  }
  if (sens.ventilationFailure && sens.ventilationFailure !== config.ventilationState) {
    // For a propped door the scenario's chosen doors are used; none chosen means every door (as for the scenario itself).
    cases.push({ key: `vent_${sens.ventilationFailure}`, label: VENTILATION_STATE_LABELS[sens.ventilationFailure], config: { ...base, ventilationState: sens.ventilationFailure } })
  }
  if (sens.positions) {
    const moves: [string, number, number][] = [['east', 1, 0], ['west', -1, 0], ['north', 0, 1], ['south', 0, -1]]
    for (const [dir, ux, uy] of moves) {
      const dx = ux * POSITION_STEP_M, dy = uy * POSITION_STEP_M
      if (!offsetFits(plan, config, dx, dy)) { notes.push(`The leak moved ${POSITION_STEP_M} m ${dir} would leave its room or touch a wall: that position is left out.`); continue }
      cases.push({ key: `pos_${dir}`, label: `Leak ${POSITION_STEP_M} m ${dir}`, config: { ...base, sourceOffsetM: [dx, dy] } })
    }
  }
  return { cases, notes }
}

/** Applied by the worker to the engine input of a position case: the leaking sources moved by the offset. */
export function applySourceOffset(s: ScenarioInput, config: ScenarioConfig): ScenarioInput {
  const off = config.sourceOffsetM
  if (!off) return s
  return { ...s, sources: s.sources.map((src) => ({ ...src, position_m: [src.position_m[0] + off[0], src.position_m[1] + off[1], src.position_m[2]] as [number, number, number] })) }
}

export interface BandRow {
  kind: 'receptor' | 'room' | 'first_alarm'
  id: string
  name: string
  limitKey: string
  limitLabel: string
  nominalS: number | null
  /** Earliest over the cases (null: no case reaches it within the run). */
  earliestS: number | null
  /** Latest over the cases; null when some case does not reach it within the run. */
  latestS: number | null
  /** The case giving the earliest time (the nominal's key is "nominal"). */
  earliestCase: string | null
}

export interface PeakRow { id: string; name: string; nominalPpm: number; lowPpm: number; highPpm: number; highCase: string }

/**
 * The band over the cases: each time to a limit at each detector/workstation and room, and the first alarm, with
 * nominal, earliest and latest and the case driving the earliest; each receptor's peak with its range.
 */
export function bundleBand(cases: { key: string; summary: RunSummary }[]): { rows: BandRow[]; peaks: PeakRow[] } {
  const nominal = cases.find((c) => c.key === 'nominal') ?? cases[0]
  if (!nominal) return { rows: [], peaks: [] }
  const label = new Map(nominal.summary.limits.map((l) => [l.key, l.label]))
  const rows: BandRow[] = []
  const band = (base: Omit<BandRow, 'earliestS' | 'latestS' | 'earliestCase' | 'nominalS'>, pick: (s: RunSummary) => number | null | undefined) => {
    const vals = cases.map((c) => ({ key: c.key, t: pick(c.summary) ?? null }))
    const reached = vals.filter((v): v is { key: string; t: number } => v.t !== null)
    const first = reached.reduce<{ key: string; t: number } | null>((a, v) => (a === null || v.t < a.t ? v : a), null)
    rows.push({ ...base, nominalS: pick(nominal.summary) ?? null, earliestS: first?.t ?? null, earliestCase: first?.key ?? null,
      latestS: reached.length === vals.length && reached.length ? Math.max(...reached.map((v) => v.t)) : null })
  }
  band({ kind: 'first_alarm', id: 'first_alarm', name: 'First detector alarm', limitKey: 'alarm', limitLabel: 'alarm set point' }, (s) => s.firstAlarm?.timeS ?? null)
  for (const r of nominal.summary.receptors) {
    for (const key of Object.keys(r.firstExceedS)) {
      band({ kind: 'receptor', id: r.id, name: r.name, limitKey: key, limitLabel: label.get(key) ?? key }, (s) => s.receptors.find((x) => x.id === r.id)?.firstExceedS[key])
    }
  }
  for (const r of nominal.summary.rooms) {
    for (const key of Object.keys(r.firstExceedS)) {
      band({ kind: 'room', id: r.id, name: r.name, limitKey: key, limitLabel: label.get(key) ?? key }, (s) => s.rooms.find((x) => x.id === r.id)?.firstExceedS[key])
    }
  }
  const peaks = nominal.summary.receptors.map((r) => {
    const vals = cases.map((c) => ({ key: c.key, p: c.summary.receptors.find((x) => x.id === r.id)?.peakPpm ?? 0 }))
    const hi = vals.reduce((a, v) => (v.p > a.p ? v : a), vals[0]!)
    return { id: r.id, name: r.name, nominalPpm: r.peakPpm, lowPpm: Math.min(...vals.map((v) => v.p)), highPpm: hi.p, highCase: hi.key }
  })
  return { rows, peaks }
}

const CRITICAL = ['idlh', 'lel_25', 'o2_19_5']
const isExposure = (k: string) => /^(rel_|pel_|ceiling)/.test(k)

/**
 * The conservative end of a bundle, as plans, drill targets and the advisor use it: the case in which a critical
 * level (IDLH, 25 % LEL, O2 19.5 %) is reached first in any room or at any workstation; ties (or no critical level
 * at all) go to the earliest exposure limit at a workstation, then to the nominal. One real computed case, so its
 * times, alarms and routes stay consistent with one another.
 */
export function conservativeCase<T extends { key: string; summary: RunSummary }>(cases: T[]): T | null {
  if (!cases.length) return null
  const first = (s: RunSummary, keys: (k: string) => boolean, rooms: boolean) => {
    const ts = [...s.receptors.filter((r) => r.kind === 'workstation'), ...(rooms ? s.rooms : [])]
      .flatMap((r) => Object.entries(r.firstExceedS).filter(([k, v]) => keys(k) && v !== null).map(([, v]) => v as number))
    return ts.length ? Math.min(...ts) : Infinity
  }
  const score = (c: T) => [first(c.summary, (k) => CRITICAL.includes(k), true), first(c.summary, isExposure, false), c.key === 'nominal' ? 0 : 1] as const
  return [...cases].sort((a, b) => {
    const x = score(a), y = score(b)
    return x[0] - y[0] || x[1] - y[1] || x[2] - y[2]
  })[0]!
}

/**
 * The fronts map over a bundle: per cell, the earliest and the latest first-crossing time over the cases' planes
 * (Infinity = never within the run, so "latest" is Infinity when some case never reaches the cell; NaN = not air).
 */
export function frontsBand(planes: Float32Array[]): { earliest: Float32Array; latest: Float32Array } {
  const n = planes[0]?.length ?? 0
  const earliest = new Float32Array(n).fill(Infinity), latest = new Float32Array(n).fill(-Infinity)
  for (const p of planes) {
    for (let i = 0; i < n; i++) {
      const v = p[i]!
      if (Number.isNaN(v)) { earliest[i] = NaN; latest[i] = NaN; continue }
      if (v < earliest[i]!) earliest[i] = v
      if (v > latest[i]!) latest[i] = v
    }
  }
  return { earliest, latest }
}
