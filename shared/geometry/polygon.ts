/**
 * Pure planar polygon primitives shared by the dispersion engine and the floor-plan editor.
 *
 * Conventions: coordinates in metres (any consistent unit works), a polygon is a list of vertices
 * without the closing repeat, either orientation. `tol` is an absolute distance in the same unit.
 * Nothing here allocates per call beyond small tuples; no DOM, no I/O.
 */

/** A point [x, y] in metres. */
export type Point = readonly [number, number]
/** A simple polygon as its vertices (no closing repeat), clockwise or counter-clockwise. */
export type Polygon = readonly Point[]

/** Default geometric tolerance: 1 mm. */
export const DEFAULT_TOLERANCE_M = 1e-3

/** Signed area (m²): positive for counter-clockwise vertex order (shoelace formula). */
export function signedArea(poly: Polygon): number {
  let s = 0
  const n = poly.length
  for (let i = 0; i < n; i++) {
    const a = poly[i]!
    const b = poly[(i + 1) % n]!
    s += a[0] * b[1] - b[0] * a[1]
  }
  return s / 2
}

/** Area (m²) of a simple polygon, independent of orientation. */
export function polygonArea(poly: Polygon): number {
  return Math.abs(signedArea(poly))
}

/** Axis-aligned bounding box [minX, minY, maxX, maxY]. */
export function boundingBox(poly: Polygon): [number, number, number, number] {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity
  for (const [x, y] of poly) {
    if (x < x0) x0 = x
    if (y < y0) y0 = y
    if (x > x1) x1 = x
    if (y > y1) y1 = y
  }
  return [x0, y0, x1, y1]
}

/**
 * Even-odd point-in-polygon test. Points exactly on an edge may return either answer;
 * use {@link pointOnPolygonEdge} when the boundary matters.
 */
export function pointInPolygon(p: Point, poly: Polygon): boolean {
  const [px, py] = p
  let inside = false
  const n = poly.length
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const [xi, yi] = poly[i]!
    const [xj, yj] = poly[j]!
    if (yi > py !== yj > py && px < ((xj - xi) * (py - yi)) / (yj - yi) + xi) inside = !inside
  }
  return inside
}

/** Distance (m) from point p to segment a–b. */
export function distancePointSegment(p: Point, a: Point, b: Point): number {
  const dx = b[0] - a[0], dy = b[1] - a[1]
  const len2 = dx * dx + dy * dy
  let t = len2 > 0 ? ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2 : 0
  t = t < 0 ? 0 : t > 1 ? 1 : t
  const ex = a[0] + t * dx - p[0], ey = a[1] + t * dy - p[1]
  return Math.sqrt(ex * ex + ey * ey)
}

/** True when p lies within `tol` of segment a–b. */
export function pointOnSegment(p: Point, a: Point, b: Point, tol = DEFAULT_TOLERANCE_M): boolean {
  return distancePointSegment(p, a, b) <= tol
}

/** Index of the first polygon edge (edge i runs from vertex i to i+1) within `tol` of p, or -1. */
export function pointOnPolygonEdge(p: Point, poly: Polygon, tol = DEFAULT_TOLERANCE_M): number {
  const n = poly.length
  for (let i = 0; i < n; i++) if (pointOnSegment(p, poly[i]!, poly[(i + 1) % n]!, tol)) return i
  return -1
}

/**
 * Index of the polygon edge that contains the whole segment a–b (both end points within `tol`
 * of that edge), or -1. Used to check that a door lies on a wall.
 */
export function segmentOnPolygonEdge(a: Point, b: Point, poly: Polygon, tol = DEFAULT_TOLERANCE_M): number {
  const n = poly.length
  for (let i = 0; i < n; i++) {
    const e0 = poly[i]!, e1 = poly[(i + 1) % n]!
    if (pointOnSegment(a, e0, e1, tol) && pointOnSegment(b, e0, e1, tol)) return i
  }
  return -1
}

function cross(o: Point, a: Point, b: Point): number {
  return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])
}

/**
 * Intersection point of segments a1–a2 and b1–b2, or null when they do not meet or are parallel
 * (collinear overlaps return null: test them with {@link pointOnSegment}).
 */
export function segmentIntersection(a1: Point, a2: Point, b1: Point, b2: Point): Point | null {
  const rx = a2[0] - a1[0], ry = a2[1] - a1[1]
  const sx = b2[0] - b1[0], sy = b2[1] - b1[1]
  const den = rx * sy - ry * sx
  if (den === 0) return null
  const qx = b1[0] - a1[0], qy = b1[1] - a1[1]
  const t = (qx * sy - qy * sx) / den
  const u = (qx * ry - qy * rx) / den
  if (t < 0 || t > 1 || u < 0 || u > 1) return null
  return [a1[0] + t * rx, a1[1] + t * ry]
}

/**
 * True when the segments cross at a point interior to both (a "proper" crossing). Touching at an
 * end point, within `tol`, or running collinear does not count: rooms may share walls and corners.
 */
export function segmentsCrossProperly(a1: Point, a2: Point, b1: Point, b2: Point, tol = DEFAULT_TOLERANCE_M): boolean {
  const d1 = cross(b1, b2, a1), d2 = cross(b1, b2, a2)
  const d3 = cross(a1, a2, b1), d4 = cross(a1, a2, b2)
  if (!(((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0)))) return false
  // Reject crossings that are really end-point contacts within tolerance.
  return !(pointOnSegment(a1, b1, b2, tol) || pointOnSegment(a2, b1, b2, tol) ||
    pointOnSegment(b1, a1, a2, tol) || pointOnSegment(b2, a1, a2, tol))
}

/** True when any two segments a1–a2, b1–b2 intersect, touching included. */
export function segmentsIntersect(a1: Point, a2: Point, b1: Point, b2: Point, tol = DEFAULT_TOLERANCE_M): boolean {
  return segmentIntersection(a1, a2, b1, b2) !== null || pointOnSegment(a1, b1, b2, tol) ||
    pointOnSegment(a2, b1, b2, tol) || pointOnSegment(b1, a1, a2, tol) || pointOnSegment(b2, a1, a2, tol)
}

/**
 * First pair of non-adjacent edges [i, j] of the polygon that intersect (including touching),
 * or null when the polygon is simple. Also reports fewer than 3 vertices or zero area as [-1, -1].
 */
export function findSelfIntersection(poly: Polygon, tol = DEFAULT_TOLERANCE_M): [number, number] | null {
  const n = poly.length
  if (n < 3 || polygonArea(poly) <= tol * tol) return [-1, -1]
  for (let i = 0; i < n; i++) {
    const a1 = poly[i]!, a2 = poly[(i + 1) % n]!
    for (let j = i + 1; j < n; j++) {
      const adjacent = j === i + 1 || (i === 0 && j === n - 1)
      const b1 = poly[j]!, b2 = poly[(j + 1) % n]!
      if (adjacent) {
        // Adjacent edges share one vertex; they only fail when they fold back onto each other.
        const shared = j === i + 1 ? a2 : a1
        const other = j === i + 1 ? b2 : b1
        const mine = j === i + 1 ? a1 : a2
        if (Math.abs(cross(shared, mine, other)) <= tol * 1e-3 &&
          (other[0] - shared[0]) * (mine[0] - shared[0]) + (other[1] - shared[1]) * (mine[1] - shared[1]) > 0) return [i, j]
        continue
      }
      if (segmentsIntersect(a1, a2, b1, b2, tol)) return [i, j]
    }
  }
  return null
}

/** True when the polygon's edges cross or touch each other (or it is degenerate). */
export function isSelfIntersecting(poly: Polygon, tol = DEFAULT_TOLERANCE_M): boolean {
  return findSelfIntersection(poly, tol) !== null
}

/** True when p is inside the polygon and farther than `tol` from every edge. */
export function pointStrictlyInside(p: Point, poly: Polygon, tol = DEFAULT_TOLERANCE_M): boolean {
  return pointOnPolygonEdge(p, poly, tol) < 0 && pointInPolygon(p, poly)
}

/** Sample points of `poly` used to detect overlap: vertices, edge midpoints and points just inside each edge. */
function probePoints(poly: Polygon, tol: number): Point[] {
  const out: Point[] = []
  const n = poly.length
  const ccw = signedArea(poly) > 0 ? 1 : -1
  const inset = Math.max(10 * tol, 1e-6)
  for (let i = 0; i < n; i++) {
    const a = poly[i]!, b = poly[(i + 1) % n]!
    const mx = (a[0] + b[0]) / 2, my = (a[1] + b[1]) / 2
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1
    // Left normal is inward for a counter-clockwise polygon.
    const nx = (-(b[1] - a[1]) / len) * ccw, ny = ((b[0] - a[0]) / len) * ccw
    out.push(a, [mx, my], [mx + nx * inset, my + ny * inset])
  }
  return out
}

/**
 * True when the interiors of two simple polygons overlap. Sharing an edge (or part of one) or a
 * corner is allowed and returns false. Detects proper edge crossings, containment, and identical
 * polygons (via points inset just inside each edge).
 */
export function polygonsOverlap(a: Polygon, b: Polygon, tol = DEFAULT_TOLERANCE_M): boolean {
  const [ax0, ay0, ax1, ay1] = boundingBox(a)
  const [bx0, by0, bx1, by1] = boundingBox(b)
  if (ax1 <= bx0 + tol || bx1 <= ax0 + tol || ay1 <= by0 + tol || by1 <= ay0 + tol) return false
  const na = a.length, nb = b.length
  for (let i = 0; i < na; i++) {
    for (let j = 0; j < nb; j++) {
      if (segmentsCrossProperly(a[i]!, a[(i + 1) % na]!, b[j]!, b[(j + 1) % nb]!, tol)) return true
    }
  }
  for (const p of probePoints(a, tol)) if (pointStrictlyInside(p, b, tol)) return true
  for (const p of probePoints(b, tol)) if (pointStrictlyInside(p, a, tol)) return true
  return false
}
