import { computed, ref, shallowRef, type Ref } from 'vue'
import { distancePointSegment, pointInPolygon, type Point } from '../../../shared/geometry/polygon'
import {
  centroid, defaultGas, findElement, insertVertex, makeElement, moveVertex, rectangle, removeVertex, replaceElement, translateElements,
  type PlanElement,
} from '../../../shared/floorplan/plan-edit'
import type { Plan, Room } from '../../../shared/floorplan/plan-schema'
import { closestPointOnSegment, placeOnWall, snapPoint, type SnapGuide } from '../../../shared/floorplan/snapping'
import type { useFloorEditorStore } from '../../stores/floor-editor'
import type { Viewport } from './use-viewport'

type Store = ReturnType<typeof useFloorEditorStore>

/** Sizes of on-screen targets, CSS pixels: they stay the same at any zoom. */
export const HIT = { vertex: 9, item: 12, opening: 7, snap: 10, wall: 16, close: 12 }
export const DOOR_WIDTH_M = 0.9
export const PASS_THROUGH_WIDTH_M = 0.6

export type Draft =
  | { kind: 'rect'; a: Point; b: Point }
  | { kind: 'polygon'; points: Point[] }
  | { kind: 'opening'; segment: [Point, Point] }
  | { kind: 'calibrate'; a: Point; b: Point | null }

type Drag =
  | { kind: 'pan'; lastX: number; lastY: number }
  | { kind: 'vertex'; roomId: string; index: number; base: Plan }
  | { kind: 'move'; ids: Set<string>; start: Point; base: Plan; moved: boolean }
  | { kind: 'marquee'; a: Point; b: Point; additive: boolean }

export type Hit = { kind: 'vertex'; roomId: string; index: number } | { kind: 'element'; id: string }

/** A representative point of an element: where snapping anchors a move and what a marquee tests. */
function anchorOf(e: PlanElement): Point {
  if ('polygon' in e) return e.polygon[0]!
  if ('segment' in e) return e.segment[0]
  return e.position
}

/**
 * What the mouse does on the canvas for each tool: drawing, placing, selecting, moving, vertex editing,
 * panning. Changes go to the store as single undoable commits; during a drag the canvas shows `preview`.
 */
export function useCanvasTools(store: Store, vp: Viewport, opts: { snapEnabled: Ref<boolean>; gridM: Ref<number>; onCalibrate: (a: Point, b: Point) => void }) {
  const cursor = ref<Point | null>(null)
  const guides = shallowRef<SnapGuide[]>([])
  const hover = ref<Hit | null>(null)
  const draft = shallowRef<Draft | null>(null)
  const preview = shallowRef<Plan | null>(null)
  const spaceHeld = ref(false)
  let drag: Drag | null = null
  const marquee = ref<[Point, Point] | null>(null)

  const displayPlan = computed(() => preview.value ?? store.plan)

  function snap(p: Point, extra: { excludeRoomId?: string; extraVertices?: Point[]; plan?: Plan } = {}) {
    if (!opts.snapEnabled.value) return { point: p, guides: [] as SnapGuide[] }
    return snapPoint(p, { gridM: opts.gridM.value, toleranceM: vp.pxToM(HIT.snap), rooms: (extra.plan ?? displayPlan.value).rooms,
      excludeRoomId: extra.excludeRoomId, extraVertices: extra.extraVertices })
  }

  function hitTest(sx: number, sy: number): Hit | null {
    const plan = displayPlan.value
    const w = vp.toWorld(sx, sy)
    const near = (p: readonly [number, number], px: number) => {
      const [x, y] = vp.toScreen(p)
      return Math.hypot(x - sx, y - sy) <= px
    }
    for (const id of store.selection) {
      const found = findElement(plan, id)
      if (found?.collection !== 'rooms') continue
      const room = found.element as Room
      const index = room.polygon.findIndex((p) => near(p, HIT.vertex))
      if (index >= 0) return { kind: 'vertex', roomId: room.id, index }
    }
    for (const list of [plan.workstations, plan.exhausts, plan.detectors, plan.sources]) {
      for (let i = list.length - 1; i >= 0; i--) if (near(list[i]!.position, HIT.item)) return { kind: 'element', id: list[i]!.id }
    }
    for (const o of plan.openings) if (distancePointSegment(w, o.segment[0], o.segment[1]) <= vp.pxToM(HIT.opening)) return { kind: 'element', id: o.id }
    for (let i = plan.rooms.length - 1; i >= 0; i--) if (pointInPolygon(w, plan.rooms[i]!.polygon)) return { kind: 'element', id: plan.rooms[i]!.id }
    return null
  }

  function openingPlacement(p: Point, kind: 'door' | 'pass-through') {
    return placeOnWall(p, displayPlan.value.rooms, kind === 'door' ? DOOR_WIDTH_M : PASS_THROUGH_WIDTH_M, vp.pxToM(HIT.wall),
      opts.snapEnabled.value ? Math.min(opts.gridM.value, 0.1) : 0)
  }

  function finishPolygon(): void {
    if (draft.value?.kind !== 'polygon') return
    const points = draft.value.points.map((p) => [p[0], p[1]] as [number, number])
    draft.value = null
    if (points.length < 3) return
    const room = makeElement.room(store.plan, points)
    store.commit({ ...store.plan, rooms: [...store.plan.rooms, room] })
    store.select([room.id])
  }

  function cancel(): void {
    draft.value = null
    preview.value = null
    marquee.value = null
    drag = null
  }

  /** Undo the last corner of a polygon being drawn; false when there is none (so Backspace may delete instead). */
  function removeLastDraftPoint(): boolean {
    if (draft.value?.kind !== 'polygon') return false
    const points = draft.value.points.slice(0, -1)
    draft.value = points.length ? { kind: 'polygon', points } : null
    return true
  }

  function pointerDown(e: { button: number; shiftKey: boolean; altKey: boolean }, sx: number, sy: number): void {
    const raw = vp.toWorld(sx, sy)
    if (e.button === 1 || e.button === 2 || spaceHeld.value) {
      drag = { kind: 'pan', lastX: sx, lastY: sy }
      return
    }
    if (e.button !== 0) return
    const tool = store.canEdit ? store.tool : 'select'
    switch (tool) {
      case 'select': {
        const hit = hitTest(sx, sy)
        if (hit?.kind === 'vertex' && store.canEdit) {
          drag = { kind: 'vertex', roomId: hit.roomId, index: hit.index, base: store.plan }
        } else if (hit?.kind === 'element') {
          if (e.shiftKey) store.toggleSelected(hit.id)
          else if (!store.selection.includes(hit.id)) store.select([hit.id])
          if (store.canEdit && store.selection.includes(hit.id)) {
            drag = { kind: 'move', ids: new Set(store.selection), start: raw, base: store.plan, moved: false }
          }
        } else {
          if (!e.shiftKey) store.select([])
          drag = { kind: 'marquee', a: raw, b: raw, additive: e.shiftKey }
        }
        return
      }
      case 'room-rect': {
        const p = snap(raw).point
        draft.value = { kind: 'rect', a: p, b: p }
        return
      }
      case 'room-polygon': {
        const points = draft.value?.kind === 'polygon' ? draft.value.points : []
        const first = points[0]
        if (first && points.length >= 3) {
          const [fx, fy] = vp.toScreen(first)
          if (Math.hypot(fx - sx, fy - sy) <= HIT.close) return finishPolygon()
        }
        const p = snap(raw, { extraVertices: points }).point
        const last = points.at(-1)
        if (last && last[0] === p[0] && last[1] === p[1]) return
        draft.value = { kind: 'polygon', points: [...points, p] }
        return
      }
      case 'door':
      case 'pass-through': {
        const placed = openingPlacement(raw, tool)
        if (!placed) return
        const opening = makeElement.opening(store.plan, tool === 'door' ? 'door' : 'pass_through', placed.segment)
        store.commit({ ...store.plan, openings: [...store.plan.openings, opening] })
        store.select([opening.id])
        return
      }
      case 'source':
      case 'detector':
      case 'exhaust':
      case 'workstation': {
        const p = snap(raw).point
        const gas = defaultGas(store.plan)
        const lastGas = gas.gasId
        const element =
          tool === 'source' ? makeElement.source(store.plan, p, lastGas)
            : tool === 'detector' ? makeElement.detector(store.plan, p, lastGas)
              : tool === 'exhaust' ? makeElement.exhaust(store.plan, p)
                : makeElement.workstation(store.plan, p)
        const collection = tool === 'source' ? 'sources' : tool === 'detector' ? 'detectors' : tool === 'exhaust' ? 'exhausts' : 'workstations'
        store.commit({ ...store.plan, [collection]: [...store.plan[collection], element] })
        store.select([element.id])
        if (tool === 'source' || tool === 'detector') store.notePlaced({ id: element.id, gasId: gas.gasId, basis: gas.basis })
        store.setTool('select')
        return
      }
      case 'calibrate': {
        const d = draft.value
        if (d?.kind === 'calibrate' && d.b === null) {
          draft.value = null
          if (Math.hypot(raw[0] - d.a[0], raw[1] - d.a[1]) > 1e-6) opts.onCalibrate(d.a, raw)
        } else draft.value = { kind: 'calibrate', a: raw, b: null }
        return
      }
    }
  }

  function pointerMove(sx: number, sy: number): void {
    const raw = vp.toWorld(sx, sy)
    const d = drag
    if (d?.kind === 'pan') {
      vp.panBy(sx - d.lastX, sy - d.lastY)
      d.lastX = sx
      d.lastY = sy
      return
    }
    if (d?.kind === 'vertex') {
      const found = findElement(d.base, d.roomId)
      if (!found) return
      const s = snap(raw, { excludeRoomId: d.roomId, plan: d.base })
      cursor.value = s.point
      guides.value = s.guides
      preview.value = replaceElement(d.base, moveVertex(found.element as Room, d.index, s.point))
      return
    }
    if (d?.kind === 'move') {
      const firstId = [...d.ids][0]!
      const first = findElement(d.base, firstId)?.element
      if (!first) return
      let dx = raw[0] - d.start[0]
      let dy = raw[1] - d.start[1]
      if (!d.moved && Math.hypot(dx, dy) < vp.pxToM(3)) return
      d.moved = true
      if (d.ids.size === 1 && 'segment' in first) {
        // A door slides along the walls instead of floating free.
        const mid: Point = [(first.segment[0][0] + first.segment[1][0]) / 2 + dx, (first.segment[0][1] + first.segment[1][1]) / 2 + dy]
        const width = Math.hypot(first.segment[1][0] - first.segment[0][0], first.segment[1][1] - first.segment[0][1])
        const placed = placeOnWall(mid, d.base.rooms, width, vp.pxToM(HIT.wall * 2), opts.snapEnabled.value ? 0.05 : 0)
        preview.value = placed ? replaceElement(d.base, { ...first, segment: [[placed.segment[0][0], placed.segment[0][1]], [placed.segment[1][0], placed.segment[1][1]]] }) : translateElements(d.base, d.ids, dx, dy)
        guides.value = placed ? [{ kind: 'edge', from: placed.wall[0], to: placed.wall[1] }] : []
        return
      }
      const anchor = anchorOf(first)
      const moving = [...d.ids].filter((id) => findElement(d.base, id)?.collection === 'rooms')
      const others = { ...d.base, rooms: d.base.rooms.filter((r) => !moving.includes(r.id)) }
      const s = snap([anchor[0] + dx, anchor[1] + dy], { plan: others })
      dx = s.point[0] - anchor[0]
      dy = s.point[1] - anchor[1]
      guides.value = s.guides
      preview.value = translateElements(d.base, d.ids, dx, dy)
      return
    }
    if (d?.kind === 'marquee') {
      d.b = raw
      marquee.value = [d.a, raw]
      return
    }
    const tool = store.canEdit ? store.tool : 'select'
    if (tool === 'door' || tool === 'pass-through') {
      const placed = openingPlacement(raw, tool)
      draft.value = placed ? { kind: 'opening', segment: placed.segment } : null
      guides.value = placed ? [{ kind: 'edge', from: placed.wall[0], to: placed.wall[1] }] : []
      cursor.value = raw
      return
    }
    if (tool === 'calibrate') {
      cursor.value = raw
      guides.value = []
      if (draft.value?.kind === 'calibrate') draft.value = { kind: 'calibrate', a: draft.value.a, b: null }
      return
    }
    const s = tool === 'select'
      ? { point: raw, guides: [] as SnapGuide[] }
      : snap(raw, { extraVertices: draft.value?.kind === 'polygon' ? draft.value.points : [] })
    cursor.value = s.point
    guides.value = s.guides
    if (draft.value?.kind === 'rect') draft.value = { ...draft.value, b: s.point }
    hover.value = tool === 'select' ? hitTest(sx, sy) : null
  }

  function pointerUp(): void {
    const d = drag
    drag = null
    if (d?.kind === 'vertex' || d?.kind === 'move') {
      if (preview.value && preview.value !== store.plan) store.commit(preview.value)
      preview.value = null
      guides.value = []
      return
    }
    if (d?.kind === 'marquee') {
      marquee.value = null
      const [x0, x1] = [Math.min(d.a[0], d.b[0]), Math.max(d.a[0], d.b[0])]
      const [y0, y1] = [Math.min(d.a[1], d.b[1]), Math.max(d.a[1], d.b[1])]
      if (x1 - x0 < vp.pxToM(4) && y1 - y0 < vp.pxToM(4)) return
      const inside = (p: readonly [number, number]) => p[0] >= x0 && p[0] <= x1 && p[1] >= y0 && p[1] <= y1
      const plan = store.plan
      const ids = [
        ...plan.rooms.filter((r) => r.polygon.every(inside)).map((r) => r.id),
        ...plan.openings.filter((o) => o.segment.every(inside)).map((o) => o.id),
        ...[...plan.sources, ...plan.detectors, ...plan.exhausts, ...plan.workstations].filter((e) => inside(e.position)).map((e) => e.id),
      ]
      store.select(ids, d.additive)
      return
    }
    if (draft.value?.kind === 'rect') {
      const { a, b } = draft.value
      draft.value = null
      if (Math.abs(a[0] - b[0]) < 0.1 || Math.abs(a[1] - b[1]) < 0.1) return
      const room = makeElement.room(store.plan, rectangle(a, b))
      store.commit({ ...store.plan, rooms: [...store.plan.rooms, room] })
      store.select([room.id])
    }
  }

  /** Double-click: close a polygon; on a selected room's corner remove it, on its wall add one. */
  function doubleClick(sx: number, sy: number): void {
    if (store.tool === 'room-polygon') {
      // The double-click's own clicks added the last corner twice at most; drop the duplicate.
      return finishPolygon()
    }
    if (store.tool !== 'select' || !store.canEdit) return
    const hit = hitTest(sx, sy)
    if (hit?.kind === 'vertex') {
      const room = findElement(store.plan, hit.roomId)!.element as Room
      store.commit(replaceElement(store.plan, removeVertex(room, hit.index)))
      return
    }
    const w = vp.toWorld(sx, sy)
    for (const id of store.selection) {
      const room = findElement(store.plan, id)
      if (room?.collection !== 'rooms') continue
      const poly = (room.element as Room).polygon
      for (let i = 0; i < poly.length; i++) {
        const a = poly[i]!, b = poly[(i + 1) % poly.length]!
        if (distancePointSegment(w, a, b) <= vp.pxToM(HIT.opening)) {
          const at = snap(closestPointOnSegment(w, a, b).point, { excludeRoomId: id }).point
          store.commit(replaceElement(store.plan, insertVertex(room.element as Room, i, at)))
          return
        }
      }
    }
  }

  function leave(): void {
    cursor.value = null
    hover.value = null
    if (draft.value?.kind === 'opening') draft.value = null
  }

  return {
    cursor, guides, hover, draft, preview, marquee, spaceHeld, displayPlan,
    pointerDown, pointerMove, pointerUp, doubleClick, leave, cancel, finishPolygon, removeLastDraftPoint, centroid,
  }
}
