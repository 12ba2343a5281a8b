import { pointInPolygon, type Point } from '../geometry/polygon'

/**
 * A cheap, exact pre-test before the full overlap test of two rooms (issue 14: hundreds of thin rooms whose bounding
 * boxes all overlap made the pairwise test quadratic in corners and froze the server). When no edge of `a` comes
 * within `tol` of an edge of `b`, the two outlines are disjoint, so the interiors overlap only if one room lies inside
 * the other, which one vertex each tells. True when the full test is needed, false when the rooms cannot overlap.
 */
export function mayOverlap(a: readonly Point[], b: readonly Point[], tol: number): boolean {
  if (edgesNear(outline(a, tol), outline(b, tol), tol)) return true
  return pointInPolygon(a[0]!, b as Point[]) || pointInPolygon(b[0]!, a as Point[])
}

type Edge = { x0: number; x1: number; y0: number; y1: number; p: Point; q: Point }
type Outline = { edges: Edge[]; widest: number }

// Edges sorted by their left end, computed once per polygon array (the plan is not changed while it is checked).
const cache = new WeakMap<readonly Point[], Outline>()
function outline(poly: readonly Point[], tol: number): Outline {
  const hit = cache.get(poly)
  if (hit) return hit
  const edges: Edge[] = []
  let widest = 0
  for (let i = 0; i < poly.length; i++) {
    const p = poly[i]!, q = poly[(i + 1) % poly.length]!
    const e = { x0: Math.min(p[0], q[0]) - tol, x1: Math.max(p[0], q[0]) + tol, y0: Math.min(p[1], q[1]) - tol, y1: Math.max(p[1], q[1]) + tol, p, q }
    widest = Math.max(widest, e.x1 - e.x0)
    edges.push(e)
  }
  edges.sort((u, v) => u.x0 - v.x0)
  const o = { edges, widest }
  cache.set(poly, o)
  return o
}

/** Whether any edge of `a` comes within `tol` of an edge of `b`: a sweep over x, then the exact distance. */
function edgesNear(a: Outline, b: Outline, tol: number): boolean {
  let j0 = 0
  for (const e of a.edges) {
    // Edges of b starting more than b's widest edge before e starts cannot reach e or any later edge of a.
    while (j0 < b.edges.length && b.edges[j0]!.x0 + b.widest < e.x0) j0++
    for (let j = j0; j < b.edges.length && b.edges[j]!.x0 <= e.x1; j++) {
      const f = b.edges[j]!
      if (f.x1 >= e.x0 && f.y1 >= e.y0 && f.y0 <= e.y1 && segmentDistanceAtMost(e.p, e.q, f.p, f.q, tol)) return true
    }
  }
  return false
}

const orient = (a: Point, b: Point, c: Point) => (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])

function pointSegmentDistance(p: Point, a: Point, b: Point): number {
  const dx = b[0] - a[0], dy = b[1] - a[1]
  const len2 = dx * dx + dy * dy
  const t = len2 > 0 ? Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2)) : 0
  return Math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy)
}

function segmentDistanceAtMost(p1: Point, p2: Point, q1: Point, q2: Point, tol: number): boolean {
  const d1 = orient(q1, q2, p1), d2 = orient(q1, q2, p2), d3 = orient(p1, p2, q1), d4 = orient(p1, p2, q2)
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) return true
  // Slightly generous (2 × tol) so rounding never lets a touching pair skip the full test.
  const lim = 2 * tol
  return pointSegmentDistance(p1, q1, q2) <= lim || pointSegmentDistance(p2, q1, q2) <= lim ||
    pointSegmentDistance(q1, p1, p2) <= lim || pointSegmentDistance(q2, p1, p2) <= lim
}
