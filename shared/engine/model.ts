import { boundingBox, pointInPolygon, type Point } from '../geometry/polygon'
import type { Gas } from '../gases/gas-schema'
import { chooseDiffusivity } from './eddy-diffusivity'
import { releaseHistory, type ReleaseHistory } from './releases'
import type { Scenario } from './scenario-schema'
import { ScenarioError } from './errors'

/**
 * The discretised problem: a cell-centred Cartesian grid over the rooms' bounding box, index
 * p = i + nx·(j + ny·k), cell edges at whole multiples of cell_m from the origin. Face coefficients
 * are rates (s⁻¹) per unit concentration difference, already divided by the (uniform) cell volume:
 * for the face between p and its +axis neighbour q, `fwd*[p]` multiplies C_p in the flux p→q and
 * `bwd*[p]` multiplies C_q in the flux q→p (diffusive conductance plus upwind advection).
 */
export interface Model {
  nx: number; ny: number; nz: number
  /** Plan cell size and layer height, m. */
  h: number; dz: number
  /** Grid origin (x, y of the lower-left cell corner), m. */
  x0: number; y0: number
  /** Cell volume, m³. */
  cellVolume: number
  /** Per plan cell: room index, -1 for non-air. */
  roomOfPlan: Int16Array
  airCells: number
  /** Face coefficients, s⁻¹, stored in single precision (each value is used identically on both sides
   * of its face, so the scheme stays exactly conservative). */
  fwdX: Float32Array; bwdX: Float32Array
  fwdY: Float32Array; bwdY: Float32Array
  fwdZ: Float32Array; bwdZ: Float32Array
  /** Per plan cell: outflow rate through the floor (downflow), s⁻¹ on the bottom layer. */
  floorOut: Float64Array
  /** Dilution removal rate per room, s⁻¹. */
  roomDecay: Float64Array
  /** Local exhaust cells and their removal rates, s⁻¹. */
  exhaustCells: Int32Array; exhaustRates: Float64Array
  /** Cleanroom returns (one per downflow room): floor outflow rate w/dz (s⁻¹), exhausted fraction, and
   * the room's top-layer and bottom-layer cells (same column order). */
  returns: { room: number; rate: number; exhaustFraction: number; topCells: Int32Array; bottomCells: Int32Array }[]
  /** Point sources spread trilinearly over the (up to 8) nearest cell centres of their room, weights summing to 1. */
  sources: { id: string; cells: Int32Array; weights: Float64Array; history: ReleaseHistory }[]
  probes: { id: string; cells: Int32Array; weights: Float64Array }[]
  /** Breathing-height interpolation: lower layer, upper layer, weight of the upper layer. */
  bhK0: number; bhK1: number; bhW: number
  diffusivity: number
  diffusivityBasis: string
  roomIds: string[]
}

const EPS = 1e-9
/**
 * Diffusion length through a door undercut, m: the gap's conductance is D·(gap area)/UNDERCUT_LENGTH_M
 * whatever the cell size (it was D·area/h, so the exchange scaled as 1/h). 0.2 m: the engine's usual
 * cell size, so 0.2 m grids keep their numbers; a door leaf plus the approach on either side (modelling
 * choice, not a measured value).
 */
export const UNDERCUT_LENGTH_M = 0.2
/** Default capture radius of a local exhaust, m (at least 0.75 × the larger cell dimension), so the
 * captured volume, and with it the removal, does not change with the grid (modelling choice). */
export const DEFAULT_CAPTURE_RADIUS_M = 0.3

/** Fraction of the face covered by segment a–b. The face is normal to `axis` (0: x, 1: y) at coordinate `f`,
 * spans [s0, s0 + h] along the other axis; the segment must lie within the slab between the two cell centres. */
function coveredFraction(a: Point, b: Point, axis: 0 | 1, f: number, s0: number, h: number): number {
  const o = 1 - axis
  const sa = a[o], sb = b[o], na = a[axis], nb = b[axis]
  const ds = sb - sa
  if (Math.abs(ds) < EPS) return 0
  // Clip the segment parameter to the strip along the face.
  let t0 = (s0 - sa) / ds, t1 = (s0 + h - sa) / ds
  if (t0 > t1) [t0, t1] = [t1, t0]
  t0 = Math.max(t0, 0); t1 = Math.min(t1, 1)
  if (t1 <= t0) return 0
  // Keep the part within the slab between the two cell centres (f ± h/2).
  const dn = nb - na
  if (Math.abs(dn) > EPS) {
    let u0 = (f - h / 2 - na) / dn, u1 = (f + h / 2 - na) / dn
    if (u0 > u1) [u0, u1] = [u1, u0]
    t0 = Math.max(t0, u0); t1 = Math.min(t1, u1)
    if (t1 <= t0) return 0
  } else if (Math.abs(na - f) > h / 2 + EPS) return 0
  return (Math.abs(ds) * (t1 - t0)) / h
}

/** Build the grid, the face coefficients and the source/probe/exhaust maps of a validated scenario. */
export function buildModel(s: Scenario, gas: Gas): Model {
  const h = s.grid.cell_m, nz = s.grid.layers, dz = s.ceiling_m / nz
  let bx0 = Infinity, by0 = Infinity, bx1 = -Infinity, by1 = -Infinity
  for (const r of s.rooms) for (const [x, y] of r.polygon_m) {
    bx0 = Math.min(bx0, x); by0 = Math.min(by0, y); bx1 = Math.max(bx1, x); by1 = Math.max(by1, y)
  }
  const i0 = Math.floor(bx0 / h + EPS), j0 = Math.floor(by0 / h + EPS)
  const nx = Math.ceil(bx1 / h - EPS) - i0, ny = Math.ceil(by1 / h - EPS) - j0
  const x0 = i0 * h, y0 = j0 * h
  const nPlan = nx * ny, n = nPlan * nz
  const cellVolume = h * h * dz

  const roomOfPlan = new Int16Array(nPlan).fill(-1)
  let airPlan = 0
  // A centre outside a room's bounding box is outside the room: test the polygon only inside it.
  const boxes = s.rooms.map((r) => boundingBox(r.polygon_m))
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const cx = x0 + (i + 0.5) * h, cy = y0 + (j + 0.5) * h
    for (let r = 0; r < s.rooms.length; r++) {
      const b = boxes[r]!
      if (cx < b[0] || cy < b[1] || cx > b[2] || cy > b[3]) continue
      if (pointInPolygon([cx, cy], s.rooms[r]!.polygon_m)) { roomOfPlan[i + nx * j] = r; airPlan++; break }
    }
  }
  const perRoom = new Int32Array(s.rooms.length)
  for (let pp = 0; pp < nPlan; pp++) if (roomOfPlan[pp]! >= 0) perRoom[roomOfPlan[pp]!]++
  perRoom.forEach((count, r) => {
    if (count === 0) throw new ScenarioError(`rooms[${r}].polygon_m`, `no cell centre lies inside room "${s.rooms[r]!.id}"; use a smaller grid.cell_m`)
  })
  const { value: D, basis } = chooseDiffusivity(s, gas)
  const roomIndex = new Map(s.rooms.map((r, k) => [r.id, k]))

  // Plan-face open fractions (full height) and bottom-layer-only leak fractions (door undercuts).
  const openX = new Float64Array(nPlan), openY = new Float64Array(nPlan)
  const leakX = new Float64Array(nPlan), leakY = new Float64Array(nPlan)
  const flowX = new Float64Array(nPlan), flowY = new Float64Array(nPlan) // m³/s per face summed over its layers
  const flowBottomX = new Uint8Array(nPlan), flowBottomY = new Uint8Array(nPlan)
  const faceIter = (fn: (axis: 0 | 1, p: number, q: number, f: number, s0: number) => void) => {
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const p = i + nx * j
      if (i + 1 < nx) fn(0, p, p + 1, x0 + (i + 1) * h, y0 + j * h)
      if (j + 1 < ny) fn(1, p, p + nx, y0 + (j + 1) * h, x0 + i * h)
    }
  }
  faceIter((axis, p, q, f, s0) => {
    const rp = roomOfPlan[p]!, rq = roomOfPlan[q]!
    if (rp < 0 || rq < 0) return
    const open = axis === 0 ? openX : openY, leak = axis === 0 ? leakX : leakY
    if (rp === rq) { open[p] = 1; return }
    for (const o of s.openings) {
      const frac = coveredFraction(o.segment_m[0], o.segment_m[1], axis, f, s0, h)
      if (frac <= 0) continue
      if (o.open) open[p] = Math.min(1, open[p]! + frac)
      else if (o.undercut_m) leak[p] = Math.min(1, leak[p]! + frac * Math.min(1, (o.undercut_m / dz) * (h / UNDERCUT_LENGTH_M)))
    }
  })
  // Transfer air: each opening's flow is shared among its faces in proportion to covered length.
  for (const o of s.openings) {
    if (!o.transfer || o.transfer.flow_m3_s === 0 || (!o.open && !o.undercut_m)) continue
    const into = roomIndex.get(o.transfer.into)!
    const faces: { axis: 0 | 1; p: number; frac: number; sign: number }[] = []
    faceIter((axis, p, q, f, s0) => {
      const rp = roomOfPlan[p]!, rq = roomOfPlan[q]!
      if (rp < 0 || rq < 0 || rp === rq || (rp !== into && rq !== into)) return
      const frac = coveredFraction(o.segment_m[0], o.segment_m[1], axis, f, s0, h)
      if (frac > 0) faces.push({ axis, p, frac, sign: rq === into ? 1 : -1 })
    })
    const total = faces.reduce((a, x) => a + x.frac, 0)
    for (const fc of faces) {
      const share = (o.transfer.flow_m3_s * fc.frac) / total
      if (fc.axis === 0) { flowX[fc.p] += fc.sign * share; if (!o.open) flowBottomX[fc.p] = 1 }
      else { flowY[fc.p] += fc.sign * share; if (!o.open) flowBottomY[fc.p] = 1 }
    }
  }

  const fwdX = new Float32Array(n), bwdX = new Float32Array(n)
  const fwdY = new Float32Array(n), bwdY = new Float32Array(n)
  const fwdZ = new Float32Array(n), bwdZ = new Float32Array(n)
  const gh = D / (h * h), gz = D / (dz * dz)
  // Plan faces are the same on every layer except the bottom one (door undercuts, transfer air that
  // only passes under a closed door): build the bottom layer and one upper layer, then copy.
  const planFaces = (bottom: boolean, open: Float64Array, leak: Float64Array, flow: Float64Array, bottomOnly: Uint8Array, fwd: Float32Array, bwd: Float32Array, at: number) => {
    for (let pp = 0; pp < nPlan; pp++) {
      const frac = open[pp]! + (bottom ? leak[pp]! : 0)
      const g = gh * Math.min(frac, 1)
      let u = 0
      if (flow[pp] !== 0) u = bottomOnly[pp] ? (bottom ? flow[pp]! / cellVolume : 0) : flow[pp]! / nz / cellVolume
      fwd[at + pp] = g + (u > 0 ? u : 0)
      bwd[at + pp] = g + (u < 0 ? -u : 0)
    }
  }
  const fillPlanFaces = (open: Float64Array, leak: Float64Array, flow: Float64Array, bottomOnly: Uint8Array, fwd: Float32Array, bwd: Float32Array) => {
    planFaces(true, open, leak, flow, bottomOnly, fwd, bwd, 0)
    if (nz === 1) return
    planFaces(false, open, leak, flow, bottomOnly, fwd, bwd, nPlan)
    for (let k = 2; k < nz; k++) {
      fwd.copyWithin(k * nPlan, nPlan, 2 * nPlan)
      bwd.copyWithin(k * nPlan, nPlan, 2 * nPlan)
    }
  }
  fillPlanFaces(openX, leakX, flowX, flowBottomX, fwdX, bwdX)
  fillPlanFaces(openY, leakY, flowY, flowBottomY, fwdY, bwdY)
  // Vertical faces (every layer but the top), with cleanroom downflow carried upwind (downward: C of
  // the upper cell); identical on every layer, so built once and copied.
  const floorOut = new Float64Array(nPlan)
  const returns: Model['returns'] = []
  const topCellsOf: number[][] = s.rooms.map(() => [])
  for (let pp = 0; pp < nPlan; pp++) {
    const r = roomOfPlan[pp]!
    if (r < 0) continue
    const w = s.rooms[r]!.ventilation.downflow?.speed_m_s ?? 0
    if (nz > 1) {
      fwdZ[pp] = gz
      bwdZ[pp] = gz + w / dz
    }
    if (w > 0) { floorOut[pp] = w / dz; topCellsOf[r]!.push(pp + nPlan * (nz - 1)) }
  }
  for (let k = 1; k + 1 < nz; k++) {
    fwdZ.copyWithin(k * nPlan, 0, nPlan)
    bwdZ.copyWithin(k * nPlan, 0, nPlan)
  }
  s.rooms.forEach((room, r) => {
    const df = room.ventilation.downflow
    if (!df) return
    const cells = topCellsOf[r]!
    returns.push({ room: r, rate: df.speed_m_s / dz, exhaustFraction: df.exhaust_fraction, topCells: Int32Array.from(cells), bottomCells: Int32Array.from(cells, (p) => p - nPlan * (nz - 1)) })
  })
  const roomDecay = Float64Array.from(s.rooms, (r) => r.ventilation.air_changes_per_hour / 3600)

  const cellOf = (pos: readonly [number, number, number], field: string): number => nearestAirCell(pos, field)
  const nearestAirCell = (pos: readonly [number, number, number], field: string): number => {
    const room = s.rooms.findIndex((r) => pointInPolygon([pos[0], pos[1]], r.polygon_m))
    const ci = Math.min(nx - 1, Math.max(0, Math.floor((pos[0] - x0) / h)))
    const cj = Math.min(ny - 1, Math.max(0, Math.floor((pos[1] - y0) / h)))
    const ck = Math.min(nz - 1, Math.max(0, Math.floor(pos[2] / dz)))
    const pc = ci + nx * cj
    if (roomOfPlan[pc]! >= 0 && (room < 0 || roomOfPlan[pc] === room)) return pc + nPlan * ck
    // The point's own cell centre lies outside its room (near a wall): take the nearest cell of that room.
    let best = -1, bd = Infinity
    for (let j = Math.max(0, cj - 3); j <= Math.min(ny - 1, cj + 3); j++) for (let i = Math.max(0, ci - 3); i <= Math.min(nx - 1, ci + 3); i++) {
      const rr = roomOfPlan[i + nx * j]!
      if (rr < 0 || (room >= 0 && rr !== room)) continue
      const d = (x0 + (i + 0.5) * h - pos[0]) ** 2 + (y0 + (j + 0.5) * h - pos[1]) ** 2
      if (d < bd) { bd = d; best = i + nx * j }
    }
    if (best < 0) throw new ScenarioError(field, `no air cell of its room near (${pos[0]}, ${pos[1]}); the room is too narrow for grid.cell_m`)
    return best + nPlan * ck
  }

  const horizon = s.duration_s
  const orifice = { molarMass: gas.molar_mass_g_mol / 1000, gamma: gas.gamma }
  // Trilinear weights over the 8 surrounding cell centres, restricted to air cells of the point's room
  // and renormalised; outside the outermost centres the nearest centre's weight is kept. Probes read
  // with them; sources are spread with them (the transpose: mass-conserving, and the field no longer
  // depends on where the leak sits inside its cell by a jump at each cell edge).
  const trilinear = (pos: readonly [number, number, number], field: string) => {
    const home = cellOf(pos, field)
    const room = roomOfPlan[home % nPlan]!
    const axis = (v: number, n0: number, step: number) => {
      const f = Math.min(Math.max(v / step - 0.5, 0), n0 - 1)
      const a = Math.min(Math.floor(f), Math.max(n0 - 2, 0))
      return [a, f - a] as const
    }
    const [ia, tx] = axis(pos[0] - x0, nx, h)
    const [ja, ty] = axis(pos[1] - y0, ny, h)
    const [ka, tz] = axis(pos[2], nz, dz)
    const cells: number[] = [], weights: number[] = []
    for (let c = 0; c < 8; c++) {
      const di = c & 1, dj = (c >> 1) & 1, dk = (c >> 2) & 1
      const i = Math.min(ia + di, nx - 1), j = Math.min(ja + dj, ny - 1), k = Math.min(ka + dk, nz - 1)
      const wgt = (di ? tx : 1 - tx) * (dj ? ty : 1 - ty) * (dk ? tz : 1 - tz)
      if (wgt <= 0 || roomOfPlan[i + nx * j] !== room) continue
      cells.push(i + nx * j + nPlan * k); weights.push(wgt)
    }
    const wsum = weights.reduce((a, b) => a + b, 0)
    if (cells.length === 0 || wsum < 1e-12) return { cells: Int32Array.of(home), weights: Float64Array.of(1) }
    return { cells: Int32Array.from(cells), weights: Float64Array.from(weights, (w) => w / wsum) }
  }
  const sources = s.sources.map((src, i) => ({ id: src.id, ...trilinear(src.position_m, `sources[${i}].position_m`), history: releaseHistory(src.release, orifice, horizon) }))
  const probes = s.probes.map((pr, pi) => ({ id: pr.id, ...trilinear(pr.position_m, `probes[${pi}].position_m`) }))

  // Local exhausts: the flow is shared by the air cells of the exhaust's room in proportion to the part
  // of each cell inside the capture sphere (4×4×4 sample points per cell), so the removal converges
  // under refinement instead of jumping with the number of cells whose centre falls inside.
  const exCells: number[] = [], exRates: number[] = []
  for (const [ei, ex] of s.local_exhausts.entries()) {
    const home = cellOf(ex.position_m, `local_exhausts[${ei}].position_m`)
    const room = roomOfPlan[home % nPlan]!
    const rad = ex.capture_radius_m ?? Math.max(DEFAULT_CAPTURE_RADIUS_M, 0.75 * Math.max(h, dz))
    const list: number[] = [], share: number[] = []
    // Only the cells within the capture sphere's bounding box can qualify.
    const ia = Math.max(0, Math.floor((ex.position_m[0] - rad - x0) / h)), ib = Math.min(nx - 1, Math.ceil((ex.position_m[0] + rad - x0) / h))
    const ja = Math.max(0, Math.floor((ex.position_m[1] - rad - y0) / h)), jb = Math.min(ny - 1, Math.ceil((ex.position_m[1] + rad - y0) / h))
    const ka = Math.max(0, Math.floor((ex.position_m[2] - rad) / dz)), kb = Math.min(nz - 1, Math.ceil((ex.position_m[2] + rad) / dz))
    for (let k = ka; k <= kb; k++) for (let j = ja; j <= jb; j++) for (let i = ia; i <= ib; i++) {
      if (roomOfPlan[i + nx * j] !== room) continue
      let inside = 0
      for (let a = 0; a < 64; a++) {
        const sx = x0 + (i + ((a & 3) + 0.5) / 4) * h - ex.position_m[0]
        const sy = y0 + (j + (((a >> 2) & 3) + 0.5) / 4) * h - ex.position_m[1]
        const sz = (k + ((a >> 4) + 0.5) / 4) * dz - ex.position_m[2]
        if (sx * sx + sy * sy + sz * sz <= rad * rad) inside++
      }
      if (inside > 0) { list.push(i + nx * j + nPlan * k); share.push(inside) }
    }
    if (list.length === 0) { list.push(home); share.push(1) }
    const total = share.reduce((a, b) => a + b, 0)
    list.forEach((c, a) => { exCells.push(c); exRates.push((ex.flow_m3_s * share[a]!) / (total * cellVolume)) })
  }

  const kf = Math.min(Math.max(s.breathing_height_m / dz - 0.5, 0), nz - 1)
  const bhK0 = Math.min(Math.floor(kf), Math.max(nz - 2, 0))
  const bhK1 = Math.min(bhK0 + 1, nz - 1)
  return {
    nx, ny, nz, h, dz, x0, y0, cellVolume, roomOfPlan, airCells: airPlan * nz,
    fwdX, bwdX, fwdY, bwdY, fwdZ, bwdZ, floorOut, roomDecay,
    exhaustCells: Int32Array.from(exCells), exhaustRates: Float64Array.from(exRates), returns,
    sources, probes, bhK0, bhK1, bhW: bhK1 === bhK0 ? 0 : kf - bhK0,
    diffusivity: D, diffusivityBasis: basis, roomIds: s.rooms.map((r) => r.id),
  }
}
