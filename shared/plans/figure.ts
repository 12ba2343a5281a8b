import { contours } from 'd3-contour'
import type { Plan } from '../floorplan/plan-schema'
import type { LimitLine, RunFieldsMeta, RunSummary } from '../schemas/runs'
import { colourScale } from '../runs/display'
import { SYMBOL_COLOURS } from '../ui/map-symbols'
import { formatSeconds } from './format'
import { isCriticalKey, isExposureKey } from './rules'

/**
 * The plan figure: the floor's rooms with the area beyond each limit at a few key times, drawn as SVG
 * (for the PDF through pdfmake, and usable in a page). With the run's stored fronts (first time each cell
 * crosses each limit) the filled areas and their outlines are the real fronts; without them, whole rooms
 * are shaded from the summary's room times. Pure: no DOM.
 */

export interface FigureField {
  meta: Pick<RunFieldsMeta, 'nx' | 'ny' | 'cellM' | 'originM' | 'limits'>
  /** meta.limits.length planes of nx·ny first-crossing times (s); Infinity = never, NaN = not air. */
  fronts: Float32Array
}

export const xmlEscape = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')

/**
 * Areas beyond each limit take their colour from the results map's own perceptual scale (log ppm, viridis), so the
 * PDF and the screen read alike: a limit's area has the colour its concentration has on the map. The scale spans a
 * decade below the mildest shown limit to a decade above the strictest.
 */
export function limitColours(limits: LimitLine[]): string[] {
  if (!limits.length) return []
  const ppm = limits.map((l) => l.ppm)
  const scale = colourScale(Math.min(...ppm) / 10, Math.max(...ppm) * 10)
  return ppm.map((v) => scale.colour(v))
}


/** Up to three limits to show, mildest first: the lowest exposure limit, a short-term one, the critical level. */
export function figureLimits(limits: LimitLine[]): LimitLine[] {
  const exposure = limits.filter((l) => isExposureKey(l.key)).sort((a, b) => a.ppm - b.ppm)
  const critical = limits.filter((l) => isCriticalKey(l.key)).sort((a, b) => a.ppm - b.ppm)
  const picked = [exposure[0], exposure.length > 1 ? exposure[exposure.length - 1] : undefined, critical[0]].filter((l): l is LimitLine => !!l)
  return picked.sort((a, b) => a.ppm - b.ppm)
}

/** Key times: the first alarm, the first critical level in any room, and the end of the run. */
export function keyTimes(summary: RunSummary): { label: string; timeS: number }[] {
  const out: { label: string; timeS: number }[] = []
  if (summary.firstAlarm) out.push({ label: 'First alarm', timeS: summary.firstAlarm.timeS })
  const crit = summary.rooms.flatMap((r) => Object.entries(r.firstExceedS).filter(([k, v]) => isCriticalKey(k) && v !== null).map(([, v]) => v as number))
  if (crit.length) out.push({ label: 'First critical level', timeS: Math.min(...crit) })
  out.push({ label: 'End of run', timeS: summary.durationS })
  const seen = new Set<number>()
  return out.filter((t) => (seen.has(t.timeS) ? false : (seen.add(t.timeS), true))).sort((a, b) => a.timeS - b.timeS)
}

interface Bounds { x0: number; y0: number; x1: number; y1: number }
function planBounds(plan: Plan): Bounds {
  const pts = plan.rooms.flatMap((r) => r.polygon)
  if (!pts.length) return { x0: 0, y0: 0, x1: 10, y1: 10 }
  return { x0: Math.min(...pts.map((p) => p[0])), y0: Math.min(...pts.map((p) => p[1])), x1: Math.max(...pts.map((p) => p[0])), y1: Math.max(...pts.map((p) => p[1])) }
}

/** One panel of the figure as an SVG string `width` points wide. */
export function floorPanelSvg(input: { plan: Plan; summary: RunSummary; field: FigureField | null; timeS: number; title: string; width: number }): string {
  const { plan, summary, field, timeS, width } = input
  const b = planBounds(plan)
  const pad = 6
  const scale = (width - 2 * pad) / Math.max(1e-6, b.x1 - b.x0)
  const mapH = (b.y1 - b.y0) * scale
  const legendH = 38
  const height = Math.ceil(mapH + 2 * pad + 16 + legendH)
  const X = (x: number) => (pad + (x - b.x0) * scale).toFixed(1)
  const Y = (y: number) => (16 + pad + (b.y1 - y) * scale).toFixed(1)
  const limits = figureLimits(field?.meta.limits ?? summary.limits)
  const colours = limitColours(limits)
  const parts: string[] = []
  const roomPoints = (poly: [number, number][]) => poly.map((p) => `${X(p[0])},${Y(p[1])}`).join(' ')
  // Areas stop at the walls: the fronts are cell-based and would otherwise spill past the outer walls.
  const clipId = `rooms-${Math.round(timeS * 10)}`
  parts.push(`<defs><clipPath id="${clipId}">${plan.rooms.map((r) => `<polygon points="${roomPoints(r.polygon)}"/>`).join('')}</clipPath></defs>`)
  const labelSpots: { x: number; y: number; text: string; colour: string }[] = []
  parts.push(`<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`)
  parts.push(`<text x="${pad}" y="12" font-family="Atkinson" font-size="9" font-weight="bold" fill="#14375e">${xmlEscape(input.title)} – t = ${xmlEscape(formatSeconds(timeS))}</text>`)
  for (const r of plan.rooms) {
    parts.push(`<polygon points="${r.polygon.map((p) => `${X(p[0])},${Y(p[1])}`).join(' ')}" fill="#f4f6f8" stroke="none"/>`)
  }
  if (field) {
    const { nx, ny, cellM, originM } = field.meta
    limits.forEach((l, li) => {
      const k = field.meta.limits.findIndex((m) => m.key === l.key)
      if (k < 0) return
      const plane = field.fronts.subarray(k * nx * ny, (k + 1) * nx * ny)
      // Cells crossed by time t: value 1 where the front time ≤ t; the 0.5 contour is the front line.
      const values = Array.from(plane, (v) => (Number.isFinite(v) && v <= timeS ? 1 : 0))
      const [shape] = contours().size([nx, ny]).thresholds([0.5])(values)
      if (!shape) return
      const d = shape.coordinates.map((poly) => poly.map((ring) =>
        `M${ring.map(([gx, gy]) => `${X(originM[0] + gx! * cellM)},${Y(originM[1] + gy! * cellM)}`).join('L')}Z`).join('')).join('')
      if (!d) return
      parts.push(`<g clip-path="url(#${clipId})"><path d="${d}" fill="${colours[li]}" fill-opacity="0.55" stroke="#1b2a3a" stroke-width="0.8" fill-rule="evenodd"/></g>`)
      // A direct label at the front's northernmost point (the isoline names its limit, no colour look-up needed).
      let top: [number, number] | null = null
      for (const poly of shape.coordinates) for (const [gx, gy] of poly[0] ?? []) if (!top || gy! > top[1]) top = [gx!, gy!]
      if (top) labelSpots.push({ x: Number(X(originM[0] + top[0] * cellM)), y: Number(Y(originM[1] + top[1] * cellM)), text: l.label, colour: colours[li]! })
    })
  } else {
    for (const room of plan.rooms) {
      const s = summary.rooms.find((r) => r.id === room.id)
      let li = -1
      limits.forEach((l, i) => { const t = s?.firstExceedS[l.key]; if (typeof t === 'number' && t <= timeS) li = i })
      if (li >= 0) parts.push(`<polygon points="${roomPoints(room.polygon)}" fill="${colours[li]}" fill-opacity="0.55" stroke="none"/>`)
    }
  }
  for (const r of plan.rooms) {
    parts.push(`<polygon points="${r.polygon.map((p) => `${X(p[0])},${Y(p[1])}`).join(' ')}" fill="none" stroke="#1b2a3a" stroke-width="1"/>`)
  }
  for (const o of plan.openings) {
    parts.push(`<line x1="${X(o.segment[0][0])}" y1="${Y(o.segment[0][1])}" x2="${X(o.segment[1][0])}" y2="${Y(o.segment[1][1])}" stroke="${o.kind === 'door' ? SYMBOL_COLOURS.door : '#8a8a8a'}" stroke-width="3"/>`)
  }
  const c = SYMBOL_COLOURS
  for (const src of plan.sources) {
    parts.push(`<circle cx="${X(src.position[0])}" cy="${Y(src.position[1])}" r="3.4" fill="${c.leakingSource}" stroke="#ffffff" stroke-width="0.8"/>`)
  }
  for (const d of plan.detectors) {
    const x = Number(X(d.position[0])), y = Number(Y(d.position[1]))
    parts.push(`<polygon points="${x},${y - 3.8} ${x + 3.8},${y} ${x},${y + 3.8} ${x - 3.8},${y}" fill="${c.detector}" stroke="#ffffff" stroke-width="0.8"/>`)
  }
  for (const w of plan.workstations) {
    const x = Number(X(w.position[0])), y = Number(Y(w.position[1]))
    parts.push(`<polygon points="${x},${y - 3.8} ${x + 3.3},${y + 2.7} ${x - 3.3},${y + 2.7}" fill="${c.workstation}" stroke="#ffffff" stroke-width="0.8"/>`)
  }
  // Fronts that meet at one place share one label ("NIOSH REL (TWA) · IDLH") instead of printing over each other.
  const merged: typeof labelSpots = []
  for (const spot of labelSpots) {
    const near = merged.find((m) => Math.abs(m.x - spot.x) < 30 && Math.abs(m.y - spot.y) < 7)
    if (near) near.text = `${near.text} · ${spot.text}`
    else merged.push({ ...spot })
  }
  for (const spot of merged) {
    const w = spot.text.length * 2.75 + 3
    const x = Math.min(spot.x + 2, width - pad - w)
    parts.push(`<rect x="${x - 1.5}" y="${spot.y - 7.5}" width="${w}" height="7.5" fill="#ffffff" fill-opacity="0.85"/>`)
    parts.push(`<text x="${x}" y="${spot.y - 2}" font-family="Atkinson" font-size="5.5" fill="#1b2a3a">${xmlEscape(spot.text)}</text>`)
  }
  for (const r of plan.rooms) {
    const cx = r.polygon.reduce((a, p) => a + p[0], 0) / r.polygon.length
    const cy = r.polygon.reduce((a, p) => a + p[1], 0) / r.polygon.length
    parts.push(`<text x="${X(cx)}" y="${Y(cy)}" font-family="Atkinson" font-size="6.5" text-anchor="middle" fill="#1b2a3a">${xmlEscape(r.name)}</text>`)
  }
  // Legend
  const ly = Number((16 + pad + mapH + 10).toFixed(1))
  let lx = pad
  limits.forEach((l, i) => {
    parts.push(`<rect x="${lx}" y="${ly}" width="9" height="7" fill="${colours[i]}" fill-opacity="0.55" stroke="#1b2a3a" stroke-width="0.6"/>`)
    const label = `beyond ${l.label}`
    parts.push(`<text x="${lx + 12}" y="${ly + 6.5}" font-family="Atkinson" font-size="6.5" fill="#1b2a3a">${xmlEscape(label)}</text>`)
    lx += 22 + label.length * 3.7
  })
  parts.push(`<text x="${pad}" y="${ly + 18}" font-family="Atkinson" font-size="6" fill="#555555">${xmlEscape(field ? 'Areas from the stored fronts at breathing height; outlines are the fronts.' : 'Whole rooms shaded from the room times (stored fronts unavailable).')} Colours as on the results map.</text>`)
  parts.push(`<text x="${pad}" y="${ly + 26}" font-family="Atkinson" font-size="6" fill="#555555">Circles: sources; diamonds: detectors; triangles: workstations; blue: doors.</text>`)
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">${parts.join('')}</svg>`
}
