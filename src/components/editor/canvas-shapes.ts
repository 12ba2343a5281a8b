import type { Plan, RoomKind } from '../../../shared/floorplan/plan-schema'
import { placeLabels, type Box, type LabelRequest } from '../../../shared/floorplan/label-placement'
import type { SnapGuide } from '../../../shared/floorplan/snapping'
import type { Draft, Hit } from './use-canvas-tools'
import type { Viewport } from './use-viewport'

/**
 * Plan → Konva shape configs in screen pixels. Pure mapping, no interaction: the canvas components only
 * spread these into <v-line>, <v-circle>, <v-text>…
 */

export const EDITOR_COLOURS = {
  wall: '#14375e',
  selected: '#2a7fa8',
  hover: '#0b6e69',
  error: '#a8201a',
  warning: '#b7791f',
  guide: '#e0457b',
  source: '#a8201a',
  detector: '#1f5f8b',
  exhaust: '#0b6e69',
  workstation: '#1b6e3c',
  label: '#0c1f33',
  doorOpen: '#0b6e69',
  doorClosed: '#14375e',
}

const ROOM_FILL: Record<RoomKind, string> = {
  gas_room: '#e9e4f5',
  lab: '#e3f1ee',
  corridor: '#eef1f4',
  cleanroom_bay: '#e1eefa',
  other: '#f1f0ea',
}

export interface ShapeContext {
  plan: Plan
  vp: Viewport
  selected: ReadonlySet<string>
  hover: Hit | null
  problems: ReadonlyMap<string, 'error' | 'warning'>
}

function strokeFor(ctx: ShapeContext, id: string, base: string): { stroke: string; strokeWidth: number; dash?: number[] } {
  if (ctx.selected.has(id)) return { stroke: EDITOR_COLOURS.selected, strokeWidth: 3 }
  const problem = ctx.problems.get(id)
  if (problem === 'error') return { stroke: EDITOR_COLOURS.error, strokeWidth: 2.5, dash: [8, 4] }
  if (ctx.hover?.kind === 'element' && ctx.hover.id === id) return { stroke: EDITOR_COLOURS.hover, strokeWidth: 3 }
  if (problem === 'warning') return { stroke: EDITOR_COLOURS.warning, strokeWidth: 2.5, dash: [6, 4] }
  return { stroke: base, strokeWidth: 2 }
}

export function roomShapes(ctx: ShapeContext) {
  return ctx.plan.rooms.map((room) => {
    const points = room.polygon.flatMap((p) => ctx.vp.toScreen(p))
    // Labels sit in the room's north-west corner, where placed items rarely are.
    const xs = room.polygon.map((p) => p[0]), ys = room.polygon.map((p) => p[1])
    const [lx, ly] = ctx.vp.toScreen([Math.min(...xs), Math.max(...ys)])
    const widthPx = (Math.max(...xs) - Math.min(...xs)) * ctx.vp.view.scale
    return {
      id: room.id,
      outline: { points, closed: true, fill: ROOM_FILL[room.kind], lineJoin: 'miter' as const, opacity: ctx.plan.underlay ? 0.72 : 1, ...strokeFor(ctx, room.id, EDITOR_COLOURS.wall) },
      label: { x: lx + 6, y: ly + 6, width: Math.max(40, widthPx - 12), wrap: 'none', ellipsis: true, text: room.name, fontSize: 13, fontStyle: 'bold',
        fontFamily: 'Atkinson Hyperlegible, sans-serif', fill: EDITOR_COLOURS.label, listening: false },
    }
  })
}

export function openingShapes(ctx: ShapeContext) {
  return ctx.plan.openings.map((o) => {
    const [a, b] = [ctx.vp.toScreen(o.segment[0]), ctx.vp.toScreen(o.segment[1])]
    const s = strokeFor(ctx, o.id, o.open ? EDITOR_COLOURS.doorOpen : EDITOR_COLOURS.doorClosed)
    const highlighted = s.stroke !== (o.open ? EDITOR_COLOURS.doorOpen : EDITOR_COLOURS.doorClosed)
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1
    const nx = (-(b[1] - a[1]) / len) * 6, ny = ((b[0] - a[0]) / len) * 6
    return {
      id: o.id,
      // The gap in the wall, then the opening itself: solid when open, with end ticks when closed.
      gap: { points: [...a, ...b], stroke: '#ffffff', strokeWidth: 7 },
      body: { points: [...a, ...b], stroke: s.stroke, strokeWidth: highlighted ? 6 : 5, dash: o.kind === 'pass_through' ? [6, 4] : s.dash,
        opacity: o.open ? 1 : 0.85, lineCap: 'butt' as const },
      ticks: o.open ? [] : [a, b].map(([x, y]) => ({ points: [x - nx, y - ny, x + nx, y + ny], stroke: s.stroke, strokeWidth: 2 })),
      swing: o.kind === 'door' ? { points: doorSwing(a, b), stroke: s.stroke, strokeWidth: 1.25, opacity: 0.75, dash: o.open ? undefined : [3, 3],
        lineJoin: 'round' as const, listening: false } : null,
    }
  })
}

/**
 * A door's leaf and swing, as drawn on architectural plans: the leaf at right angles to the wall from the
 * hinge (the first end point), then a quarter circle back to the other end. Screen pixels.
 */
export function doorSwing(a: readonly [number, number], b: readonly [number, number], steps = 12): number[] {
  const ux = b[0] - a[0], uy = b[1] - a[1]
  const r = Math.hypot(ux, uy)
  if (r < 1e-9) return []
  // Perpendicular to the wall, to the left of a → b on screen.
  const vx = uy, vy = -ux
  const pts: number[] = [a[0], a[1]]
  for (let i = steps; i >= 0; i--) {
    const t = (i / steps) * (Math.PI / 2)
    pts.push(a[0] + ux * Math.cos(t) + vx * Math.sin(t), a[1] + uy * Math.cos(t) + vy * Math.sin(t))
  }
  return pts
}

export type ItemGlyph = 'source' | 'detector' | 'exhaust' | 'workstation'

const ITEM_LABEL_FONT = 12
const ITEM_LABEL_H = 16
const LABEL_MAX_CHARS = 26

/** Rough width of bold 12 px Atkinson Hyperlegible text; enough to keep labels apart. */
export function labelWidth(text: string, fontSize = ITEM_LABEL_FONT): number {
  return Math.ceil(text.length * fontSize * 0.58) + 4
}
function clip(text: string): string {
  return text.length > LABEL_MAX_CHARS ? `${text.slice(0, LABEL_MAX_CHARS - 1).trimEnd()}…` : text
}

/** Bounding box of flat [x, y, x, y…] points, grown by `pad`. */
function boxOf(points: readonly number[], pad: number): Box {
  const xs = points.filter((_, i) => i % 2 === 0), ys = points.filter((_, i) => i % 2 === 1)
  const x = Math.min(...xs) - pad, y = Math.min(...ys) - pad
  return { x, y, w: Math.max(...xs) + pad - x, h: Math.max(...ys) + pad - y }
}

export interface ItemShape {
  id: string
  glyph: ItemGlyph
  x: number
  y: number
  /** The label's text and its top-left corner relative to the glyph; null when there is no room for it. */
  label: { text: string; dx: number; dy: number } | null
  ring: ReturnType<typeof strokeFor>
}

/**
 * Placed items with their labels: the element's name (a source or detector without one shows its gas; a
 * workstation without one says so). Labels are placed greedily so that they do not overlap each other, the
 * glyphs or the room names: the selection first, then sources, detectors, workstations and exhausts, whose
 * labels are left out when there is no free place.
 */
export function itemShapes(ctx: ShapeContext): ItemShape[] {
  const items: (ItemShape & { request: Omit<LabelRequest, 'id' | 'x' | 'y' | 'h' | 'w'> | null; rank: number })[] = []
  const add = (glyph: ItemGlyph, rank: number, list: readonly { id: string; name: string; position: readonly [number, number]; gasId?: string }[],
    fallback: (e: { gasId?: string }) => string, optional = false) =>
    list.forEach((e) => {
      const [x, y] = ctx.vp.toScreen(e.position)
      const name = e.name.trim()
      const text = clip(name || fallback(e))
      const alt = name && e.gasId && e.gasId !== text ? { text: e.gasId, w: labelWidth(e.gasId) } : undefined
      items.push({ id: e.id, glyph, x, y, label: null, ring: strokeFor(ctx, e.id, '#ffffff'), rank: ctx.selected.has(e.id) ? -1 : rank,
        request: text ? { text, alt, optional } : null })
    })
  add('exhaust', 3, ctx.plan.exhausts, () => '', true)
  add('workstation', 2, ctx.plan.workstations, () => 'Workstation')
  add('detector', 1, ctx.plan.detectors, (e) => e.gasId ?? '')
  add('source', 0, ctx.plan.sources, (e) => e.gasId ?? '')

  const glyphs: Box[] = items.map((i) => ({ x: i.x - 10, y: i.y - 10, w: 20, h: 20 }))
  const roomLabels: Box[] = roomShapes(ctx).map((r) => ({ x: r.label.x, y: r.label.y, w: Math.min(r.label.width, labelWidth(r.label.text, 13)), h: 17 }))
  // Doors and their swings too, so that a name never hides a door.
  const doors: Box[] = openingShapes(ctx).map((o) => boxOf([...o.body.points, ...(o.swing?.points ?? [])], 3))
  const requests: LabelRequest[] = items
    .filter((i) => i.request)
    .sort((a, b) => a.rank - b.rank)
    .map((i) => ({ id: i.id, x: i.x, y: i.y, h: ITEM_LABEL_H, w: labelWidth(i.request!.text), ...i.request! }))
  const placed = new Map(placeLabels(requests, { gap: 12, obstacles: [...glyphs, ...roomLabels, ...doors],
    bounds: { x: 0, y: 0, w: ctx.vp.view.width, h: ctx.vp.view.height } }).map((p) => [p.id, p]))
  // Drawn in this order: the selection last, so an item placed right on another stays visible while selected.
  const shapes = items.map(({ request: _r, rank: _k, ...item }) => {
    const p = placed.get(item.id)
    return { ...item, label: p ? { text: p.text, dx: p.x - item.x, dy: p.y - item.y } : null }
  })
  return [...shapes.filter((i) => !ctx.selected.has(i.id)), ...shapes.filter((i) => ctx.selected.has(i.id))]
}

export function handleShapes(ctx: ShapeContext) {
  const out: { key: string; x: number; y: number; active: boolean }[] = []
  for (const room of ctx.plan.rooms) {
    if (!ctx.selected.has(room.id)) continue
    room.polygon.forEach((p, i) => {
      const [x, y] = ctx.vp.toScreen(p)
      const active = ctx.hover?.kind === 'vertex' && ctx.hover.roomId === room.id && ctx.hover.index === i
      out.push({ key: `${room.id}:${i}`, x, y, active })
    })
  }
  return out
}

export function guideShapes(guides: readonly SnapGuide[], vp: Viewport) {
  const { width, height } = vp.view
  return guides.map((g, i) => {
    const base = { key: `${g.kind}-${i}`, stroke: EDITOR_COLOURS.guide, strokeWidth: 1.5, listening: false }
    switch (g.kind) {
      case 'vertex': {
        const [x, y] = vp.toScreen(g.at)
        return { ...base, kind: 'ring' as const, x, y }
      }
      case 'edge':
        return { ...base, kind: 'line' as const, points: [...vp.toScreen(g.from), ...vp.toScreen(g.to)], strokeWidth: 4, opacity: 0.6 }
      case 'align-x': {
        const [x] = vp.toScreen([g.x, 0])
        return { ...base, kind: 'line' as const, points: [x, 0, x, height], dash: [4, 4] }
      }
      case 'align-y': {
        const [, y] = vp.toScreen([0, g.y])
        return { ...base, kind: 'line' as const, points: [0, y, width, y], dash: [4, 4] }
      }
      case 'grid': {
        const [x, y] = vp.toScreen(g.at)
        return { ...base, kind: 'cross' as const, x, y, stroke: '#5b7a99' }
      }
    }
  })
}

export function draftShapes(draft: Draft | null, cursor: readonly [number, number] | null, vp: Viewport) {
  if (!draft) return []
  const style = { stroke: EDITOR_COLOURS.selected, strokeWidth: 2, dash: [6, 4], listening: false }
  switch (draft.kind) {
    case 'rect': {
      const [ax, ay] = vp.toScreen(draft.a), [bx, by] = vp.toScreen(draft.b)
      return [{ ...style, points: [ax, ay, bx, ay, bx, by, ax, by], closed: true, fill: 'rgba(42,127,168,0.12)' }]
    }
    case 'polygon': {
      const pts = [...draft.points, ...(cursor ? [cursor] : [])].flatMap((p) => vp.toScreen(p))
      return [{ ...style, points: pts, closed: false, fill: undefined }]
    }
    case 'opening':
      return [{ ...style, points: draft.segment.flatMap((p) => vp.toScreen(p)), strokeWidth: 6, dash: undefined, stroke: EDITOR_COLOURS.hover, opacity: 0.7 }]
    case 'calibrate': {
      const b = draft.b ?? cursor
      if (!b) return []
      return [{ ...style, points: [...vp.toScreen(draft.a), ...vp.toScreen(b)], stroke: EDITOR_COLOURS.guide, dash: [2, 3], strokeWidth: 2.5 }]
    }
  }
}
