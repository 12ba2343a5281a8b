import { EXIT_KIND_LABELS, type Plan } from '../floorplan/plan-schema'
import { pointInPolygon, type Point } from '../geometry/polygon'
import type { EgressResult, EgressRoute } from '../schemas/egress'

/**
 * The egress picture (issue 13, item 6): the floor with each computed way out drawn as a line of chevrons from the
 * start to the exit door, exits as a labelled green tab on the wall, assembly points as a ringed "A", rooms that
 * reach the critical limit tinted brick red, and rooms with no safe route outlined in red dashes with the words
 * "No safe route". One SVG string for the results page, the plan page and the PDF (pdfmake), so all three read the
 * same. Pure: no DOM.
 */

export const EGRESS_COLOURS = {
  room: '#f3f5f8', wall: '#1b2a3a', door: '#7d8da1', route: '#14375e', routeHalo: '#ffffff', exit: '#0a7d55',
  assembly: '#0a7d55', critical: '#e9b8ae', noRoute: '#b03a2e', text: '#1b2a3a', muted: '#5b6b7b',
} as const

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')

export interface EgressFigureInput {
  plan: Plan
  egress: EgressResult
  width: number
  /** Draw only these routes (e.g. the one the reader picked); default: every room's route and every workstation's. */
  routes?: EgressRoute[]
  /** Font family: "Atkinson" in the PDF, the page's font in the browser. */
  font?: string
  title?: string
}

function bounds(plan: Plan) {
  const pts: Point[] = [...plan.rooms.flatMap((r) => r.polygon), ...(plan.assemblyPoints ?? []).map((a) => a.position)]
  if (!pts.length) return { x0: 0, y0: 0, x1: 10, y1: 10 }
  const xs = pts.map((p) => p[0]), ys = pts.map((p) => p[1])
  return { x0: Math.min(...xs) - 1, y0: Math.min(...ys) - 1, x1: Math.max(...xs) + 1, y1: Math.max(...ys) + 1 }
}

/** Chevron positions along a polyline every `step` px (and one just before the end), with their headings. */
function chevrons(pts: [number, number][], step: number): { x: number; y: number; a: number }[] {
  const out: { x: number; y: number; a: number }[] = []
  let carry = step / 2
  for (let i = 1; i < pts.length; i++) {
    const [x0, y0] = pts[i - 1]!, [x1, y1] = pts[i]!
    const len = Math.hypot(x1 - x0, y1 - y0)
    if (len < 1e-6) continue
    const a = Math.atan2(y1 - y0, x1 - x0)
    let d = carry
    for (; d < len; d += step) out.push({ x: x0 + ((x1 - x0) * d) / len, y: y0 + ((y1 - y0) * d) / len, a })
    carry = d - len
  }
  const n = pts.length
  if (n >= 2) {
    const [x0, y0] = pts[n - 2]!, [x1, y1] = pts[n - 1]!
    out.push({ x: x1, y: y1, a: Math.atan2(y1 - y0, x1 - x0) })
  }
  return out
}

export function egressFigureSvg(input: EgressFigureInput): string {
  const { plan, egress, width } = input
  const font = input.font ?? 'Atkinson'
  const C = EGRESS_COLOURS
  const b = bounds(plan)
  const pad = 8, top = input.title ? 18 : 4
  const fs = Math.max(6, Math.min(11, width / 70))
  // Room on the right for assembly-point names (usually outside the building, often at its edge).
  const padR = Math.max(0, ...(plan.assemblyPoints ?? []).map((a) => (a.name || 'Assembly point').length * fs * 0.5 + 2 * fs))
  const scale = (width - 2 * pad - padR) / Math.max(1e-6, b.x1 - b.x0)
  const mapH = (b.y1 - b.y0) * scale
  const legendH = 40
  const height = Math.ceil(top + mapH + 2 * pad + legendH)
  const X = (x: number) => pad + (x - b.x0) * scale
  const Y = (y: number) => top + pad + (b.y1 - y) * scale
  const f = (v: number) => v.toFixed(1)
  const pts = (poly: readonly Point[]) => poly.map((p) => `${f(X(p[0]))},${f(Y(p[1]))}`).join(' ')
  const text = (x: number, y: number, s: string, o: { size?: number; bold?: boolean; fill?: string; anchor?: string; halo?: boolean } = {}) => {
    const attrs = `x="${f(x)}" y="${f(y)}" font-family="${font}" font-size="${(o.size ?? fs).toFixed(1)}"${o.bold ? ' font-weight="bold"' : ''} text-anchor="${o.anchor ?? 'start'}"`
    return `${o.halo ? `<text ${attrs} fill="none" stroke="#ffffff" stroke-width="2.5">${esc(s)}</text>` : ''}<text ${attrs} fill="${o.fill ?? C.text}">${esc(s)}</text>`
  }
  const routes = input.routes ?? egress.routes
  const critical = new Set(egress.roomsReachingCriticalIds ?? [])
  const unsafeRooms = new Set(egress.routes.filter((r) => !r.safe && r.fromWorkstationId === null).map((r) => r.fromRoomId))
  const parts: string[] = [`<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`]
  if (input.title) parts.push(text(pad, 12, input.title, { bold: true, fill: C.route, size: fs + 1 }))

  for (const r of plan.rooms) parts.push(`<polygon points="${pts(r.polygon)}" fill="${critical.has(r.id) ? C.critical : C.room}" stroke="${C.wall}" stroke-width="1.2"/>`)
  for (const r of plan.rooms) {
    if (!unsafeRooms.has(r.id)) continue
    parts.push(`<polygon points="${pts(r.polygon)}" fill="none" stroke="${C.noRoute}" stroke-width="2.4" stroke-dasharray="6 3"/>`)
  }
  for (const o of plan.openings) {
    const [a, c] = o.segment
    const isExit = o.kind === 'door' && !!o.exit
    parts.push(`<line x1="${f(X(a[0]))}" y1="${f(Y(a[1]))}" x2="${f(X(c[0]))}" y2="${f(Y(c[1]))}" stroke="${isExit ? C.exit : o.kind === 'door' ? C.door : '#b5bcc6'}" stroke-width="${isExit ? 5 : 3}" stroke-linecap="butt"/>`)
  }

  // Routes: a white halo under a navy line, chevrons every ~28 px pointing the way out, an open ring at the start.
  for (const r of routes) {
    if (!r.safe || r.path.length < 2) continue
    const p = r.path.map(([x, y]) => [X(x), Y(y)] as [number, number])
    const d = p.map(([x, y], i) => `${i ? 'L' : 'M'}${f(x)},${f(y)}`).join('')
    const w = r.fromWorkstationId ? 1.4 : 2.2
    parts.push(`<path d="${d}" fill="none" stroke="${C.routeHalo}" stroke-width="${w + 2.5}" stroke-linejoin="round"/>`)
    parts.push(`<path d="${d}" fill="none" stroke="${C.route}" stroke-width="${w}" stroke-linejoin="round"${r.fromWorkstationId ? ' stroke-dasharray="4 2"' : ''}/>`)
    const s = r.fromWorkstationId ? 3.2 : 4.5
    for (const c of chevrons(p, 28)) {
      const ca = Math.cos(c.a), sa = Math.sin(c.a)
      const tip = [c.x + ca * s, c.y + sa * s], l = [c.x - ca * s - sa * s, c.y - sa * s + ca * s], rr = [c.x - ca * s + sa * s, c.y - sa * s - ca * s]
      parts.push(`<polygon points="${f(tip[0]!)},${f(tip[1]!)} ${f(l[0]!)},${f(l[1]!)} ${f(rr[0]!)},${f(rr[1]!)}" fill="${C.route}"/>`)
    }
    parts.push(`<circle cx="${f(p[0]![0])}" cy="${f(p[0]![1])}" r="${r.fromWorkstationId ? 2.2 : 3}" fill="#ffffff" stroke="${C.route}" stroke-width="1.4"/>`)
  }

  // Exit tabs: the kind of exit beside the door, outside the drawn rooms when there is room for it.
  for (const o of plan.openings) {
    if (o.kind !== 'door' || !o.exit) continue
    // On the outer side of the wall, level with the door's upper end, so it does not sit on the room or the assembly point.
    const [a, c] = o.segment
    const len = Math.hypot(c[0] - a[0], c[1] - a[1]) || 1
    let n: [number, number] = [-(c[1] - a[1]) / len, (c[0] - a[0]) / len]
    const m: Point = [(a[0] + c[0]) / 2, (a[1] + c[1]) / 2]
    if (plan.rooms.some((r) => pointInPolygon([m[0] + n[0] * 0.3, m[1] + n[1] * 0.3], r.polygon))) n = [-n[0], -n[1]]
    const upper = a[1] >= c[1] ? a : c
    const tx = X(Math.abs(n[0]) > 0.5 ? m[0] : upper[0]) + n[0] * 5, ty = Y(Math.abs(n[0]) > 0.5 ? upper[1] : m[1]) - (n[1] > 0.5 ? 6 : n[1] < -0.5 ? -fs : 3)
    const label = `EXIT · ${EXIT_KIND_LABELS[o.exit].replace(/^Exit to (a |the )?/, '')}`
    parts.push(text(tx, ty, label, { bold: true, fill: C.exit, size: fs * 0.85, halo: true, anchor: n[0] < -0.5 ? 'end' : Math.abs(n[0]) <= 0.5 ? 'middle' : 'start' }))
  }
  for (const a of plan.assemblyPoints ?? []) {
    const x = X(a.position[0]), y = Y(a.position[1])
    parts.push(`<circle cx="${f(x)}" cy="${f(y)}" r="${f(fs * 0.9)}" fill="#ffffff" stroke="${C.assembly}" stroke-width="2"/>`)
    parts.push(text(x, y + fs * 0.35, 'A', { bold: true, fill: C.assembly, anchor: 'middle', size: fs }))
    parts.push(text(x + fs * 1.2, y + fs * 0.35, a.name || 'Assembly point', { fill: C.assembly, size: fs * 0.85, halo: true }))
  }
  for (const r of plan.rooms) {
    const cx = r.polygon.reduce((s, p) => s + p[0], 0) / r.polygon.length
    const cy = r.polygon.reduce((s, p) => s + p[1], 0) / r.polygon.length
    parts.push(text(X(cx), Y(cy) - 2, r.name || r.id, { anchor: 'middle', size: fs * 0.9, halo: true }))
    if (unsafeRooms.has(r.id)) parts.push(text(X(cx), Y(cy) + fs, 'No safe route', { anchor: 'middle', bold: true, fill: C.noRoute, size: fs * 0.9, halo: true }))
  }

  // Legend.
  const ly = top + mapH + 2 * pad + 8
  const crit = egress.criticalLimit?.label ?? 'the critical limit'
  let lx = pad
  const item = (swatch: string, label: string) => { parts.push(swatch.replace(/@X/g, f(lx)).replace(/@Y/g, f(ly))); parts.push(text(lx + 16, ly + 3, label, { size: fs * 0.8 })); lx += 26 + label.length * fs * 0.48 }
  item(`<line x1="@X" y1="@Y" x2="${f(lx + 12)}" y2="@Y" stroke="${C.route}" stroke-width="2.2"/>`, `way out, never crossing ${crit}`)
  item(`<line x1="@X" y1="@Y" x2="${f(lx + 12)}" y2="@Y" stroke="${C.exit}" stroke-width="5"/>`, 'exit door')
  item(`<rect x="@X" y="${f(ly - 4)}" width="12" height="8" fill="${C.critical}" stroke="${C.wall}" stroke-width="0.6"/>`, `room reaching ${crit}`)
  item(`<rect x="@X" y="${f(ly - 4)}" width="12" height="8" fill="none" stroke="${C.noRoute}" stroke-width="1.6" stroke-dasharray="3 2"/>`, 'no safe route')
  parts.push(text(pad, ly + 18, `Dashed thin lines: from workstations. A: assembly point. Walking ${egress.speedMS} m/s from ${Math.round(egress.startS)} s after the release starts.`, { size: fs * 0.75, fill: C.muted }))
  parts.push(text(pad, ly + 28, 'Planning advice for drills, not live guidance during an incident; a screening estimate (local codes and the AHJ govern).', { size: fs * 0.75, fill: C.muted }))
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img">${parts.join('')}</svg>`
}
