import { contours } from 'd3-contour'
import { interpolateCividis, interpolateViridis } from 'd3-scale-chromatic'
import { OXYGEN_IN_AIR_PCT } from '../gases/units'
import type { LimitLine, ReceptorSummary, RunFieldsMeta, RunSummary } from '../schemas/runs'

/** Pure display logic of the results page: units, colour scale, isolines, table rows. Components only render. */

export type DisplayUnit = 'ppm' | 'pct_lel' | 'o2_pct'
export const UNIT_LABELS: Record<DisplayUnit, string> = { ppm: 'ppm', pct_lel: '% LEL', o2_pct: 'O₂ %' }

/** Units that make sense for the gas: ppm always; % LEL for flammables; oxygen % for asphyxiants. */
export function unitsFor(gas: Pick<RunSummary['gas'], 'flammable' | 'asphyxiant'>): DisplayUnit[] {
  return ['ppm', ...(gas.flammable ? ['pct_lel' as const] : []), ...(gas.asphyxiant ? ['o2_pct' as const] : [])]
}

/** The unit shown first: oxygen for asphyxiants, ppm otherwise. */
export function defaultUnit(gas: Pick<RunSummary['gas'], 'flammable' | 'asphyxiant'>): DisplayUnit {
  return gas.asphyxiant ? 'o2_pct' : 'ppm'
}

/** ppm of the released gas → the display unit. lelPct: the gas's LEL in vol %. */
export function convertPpm(ppm: number, unit: DisplayUnit, lelPct: number | null): number {
  if (unit === 'ppm') return ppm
  if (unit === 'pct_lel') return lelPct ? ppm / (lelPct * 100) : NaN
  return OXYGEN_IN_AIR_PCT * (1 - Math.min(Math.max(ppm, 0), 1e6) / 1e6)
}

export function formatValue(v: number, unit: DisplayUnit): string {
  if (!Number.isFinite(v)) return '—'
  if (unit === 'o2_pct') return `${v.toFixed(2)} %`
  if (unit === 'pct_lel') return `${v < 1 ? v.toPrecision(2) : v.toFixed(1)} % LEL`
  return `${v >= 100 ? Math.round(v).toLocaleString('en-US') : v >= 1 ? v.toFixed(1) : v.toPrecision(2)} ppm`
}

export function formatTime(s: number | null): string {
  if (s === null || !Number.isFinite(s)) return 'not reached'
  // Round once, then split: 119.6 s is "2 min", not "1 min 60 s".
  const t = Math.round(s)
  if (t < 60) return `${t} s`
  const m = Math.floor(t / 60), r = t % 60
  return r ? `${m} min ${r} s` : `${m} min`
}

export type ColourMap = 'viridis' | 'cividis'

/**
 * Colour scale for concentrations: log-scaled from `min` to `max` (ppm span decades), perceptually uniform and
 * colour-blind safe (viridis or cividis). Returns the colour and RGB for a value; below `min` is transparent.
 */
export function colourScale(min: number, max: number, map: ColourMap = 'viridis') {
  const interp = map === 'cividis' ? interpolateCividis : interpolateViridis
  const lo = Math.log10(Math.max(min, 1e-9)), hi = Math.log10(Math.max(max, min * 10))
  const t = (v: number) => Math.min(1, Math.max(0, (Math.log10(Math.max(v, 1e-12)) - lo) / (hi - lo)))
  // 256-entry lookup table so a frame of thousands of cells is coloured without string parsing.
  const lut = new Uint8ClampedArray(256 * 3)
  for (let k = 0; k < 256; k++) {
    const rgb = parseRgb(interp(k / 255))
    lut[3 * k] = rgb[0]; lut[3 * k + 1] = rgb[1]; lut[3 * k + 2] = rgb[2]
  }
  return {
    min, max, map,
    t,
    colour: (v: number) => interp(t(v)),
    rgb(v: number): [number, number, number] | null {
      if (!(v >= min)) return null
      const k = Math.round(t(v) * 255) * 3
      return [lut[k]!, lut[k + 1]!, lut[k + 2]!]
    },
    /** Legend ticks: each decade between min and max. */
    ticks(): number[] {
      const out: number[] = []
      for (let e = Math.ceil(lo); e <= Math.floor(hi); e++) out.push(10 ** e)
      return out
    },
    /** CSS gradient for the legend bar, low to high. */
    gradient(): string {
      return `linear-gradient(to right, ${Array.from({ length: 11 }, (_, k) => interp(k / 10)).join(', ')})`
    },
  }
}

function parseRgb(c: string): [number, number, number] {
  if (c.startsWith('#')) return [parseInt(c.slice(1, 3), 16), parseInt(c.slice(3, 5), 16), parseInt(c.slice(5, 7), 16)]
  const m = c.match(/(\d+(?:\.\d+)?)/g)!.map(Number)
  return [m[0]!, m[1]!, m[2]!]
}

/** Range for the colour scale: from the lowest limit / 10 to the peak of the run (ppm). */
export function scaleRange(limits: readonly LimitLine[], peak: Float32Array | ArrayLike<number>): { min: number; max: number } {
  let mx = 0
  for (let i = 0; i < peak.length; i++) { const v = peak[i]!; if (v > mx) mx = v }
  const lowest = limits.length ? Math.min(...limits.map((l) => l.ppm)) : 1
  const min = Math.max(lowest / 10, mx / 1e4, 1e-6)
  return { min, max: Math.max(mx, min * 10) }
}

export interface IsolineRing { points: [number, number][] }
export interface Isoline {
  key: string; label: string; ppm: number; rings: IsolineRing[]
  /** Preferred label anchor (northernmost ring point), then other spots along the longest ring to avoid overlaps. */
  labelAt: [number, number] | null
  labelCandidates: [number, number][]
}

/**
 * Isolines (d3-contour) of one plane at each limit, in plan metres. Non-air cells (NaN) count as zero.
 * Each line carries its limit's name and a label anchor (the ring point farthest north, i.e. readable).
 */
export function isolines(meta: Pick<RunFieldsMeta, 'nx' | 'ny' | 'cellM' | 'originM'>, plane: ArrayLike<number>, limits: readonly LimitLine[]): Isoline[] {
  const { nx, ny, cellM, originM } = meta
  const values = new Float64Array(nx * ny)
  for (let p = 0; p < nx * ny; p++) { const v = plane[p]!; values[p] = Number.isFinite(v) ? v : 0 }
  const gen = contours().size([nx, ny]).smooth(true)
  return limits.map((l) => {
    const mp = gen.contour(Array.from(values), l.ppm)
    const rings: IsolineRing[] = []
    for (const poly of mp.coordinates) for (const ring of poly) {
      rings.push({ points: ring.map(([gx, gy]) => [originM[0] + gx * cellM, originM[1] + gy * cellM] as [number, number]) })
    }
    let labelAt: [number, number] | null = null
    for (const r of rings) for (const p of r.points) if (!labelAt || p[1] > labelAt[1]) labelAt = p
    const longest = rings.reduce<IsolineRing | null>((a, r) => (!a || r.points.length > a.points.length ? r : a), null)
    const n = longest?.points.length ?? 0
    const labelCandidates = [...(labelAt ? [labelAt] : []), ...Array.from({ length: Math.min(12, n) }, (_, k) => longest!.points[Math.floor((k * n) / Math.min(12, n))]!)]
    return { key: l.key, label: l.label, ppm: l.ppm, rings, labelAt, labelCandidates }
  }).filter((i) => i.rings.length > 0)
}

/** Colour scale for arrival times (front view): early = bright, late = dark; never = no colour. */
export function frontScale(durationS: number, map: ColourMap = 'cividis') {
  const interp = map === 'cividis' ? interpolateCividis : interpolateViridis
  return {
    rgb(t: number): [number, number, number] | null {
      if (!Number.isFinite(t)) return null
      return parseRgb(interp(1 - Math.min(1, Math.max(0, t / durationS))))
    },
    gradient: () => `linear-gradient(to right, ${Array.from({ length: 11 }, (_, k) => interp(1 - k / 10)).join(', ')})`,
  }
}

export interface LimitTableRow {
  id: string
  kind: 'detector' | 'workstation'
  name: string
  room: string
  peak: string
  /** Per limit key: formatted time to first exceed. */
  times: Record<string, string>
  /** Detectors: their own alarms. */
  alarms: string
  /** Sort key: the earliest time any limit is reached. */
  earliestS: number
}

/** Rows of "time to each limit at each detector and workstation", detectors first, earliest first. */
export function limitTableRows(summary: Pick<RunSummary, 'receptors' | 'limits'>, unit: DisplayUnit, lelPct: number | null): LimitTableRow[] {
  return summary.receptors.map((r: ReceptorSummary) => {
    const times = Object.fromEntries(summary.limits.map((l) => [l.key, formatTime(r.firstExceedS[l.key] ?? null)]))
    const finite = Object.values(r.firstExceedS).filter((t): t is number => t !== null)
    return {
      id: r.id, kind: r.kind, name: r.name, room: r.roomName ?? '—',
      peak: formatValue(convertPpm(r.peakPpm, unit, lelPct), unit),
      times,
      alarms: r.kind === 'detector' ? `low ${formatTime(r.alarmLowS)} · high ${formatTime(r.alarmHighS)}` : '',
      earliestS: finite.length ? Math.min(...finite) : Infinity,
    }
  }).sort((a, b) => (a.kind === b.kind ? a.earliestS - b.earliestS : a.kind === 'detector' ? -1 : 1))
}

/** The frame index at a time (nearest output at or before it). */
export function frameAt(timesS: readonly number[], t: number): number {
  let k = 0
  while (k + 1 < timesS.length && timesS[k + 1]! <= t + 1e-9) k++
  return k
}

/** Limit lines in the display unit for a chart (oxygen: lines at the O2 % each limit brings the air to). */
export function limitLinesIn(limits: readonly LimitLine[], unit: DisplayUnit, lelPct: number | null) {
  return limits.map((l) => ({ key: l.key, label: l.label, value: convertPpm(l.ppm, unit, lelPct) })).filter((l) => Number.isFinite(l.value))
}
