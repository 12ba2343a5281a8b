import type { Model } from './model'

/**
 * r = dt · (−A c − sink ⊙ c): the transport operator A (diffusion + upwind advection, the same face
 * coefficients as the implicit sweeps) plus first-order sinks, applied explicitly. `out` is the
 * cell's total outgoing rate from {@link outgoingRates}. Each face's coefficients appear once as an
 * outflow and once as the neighbour's inflow, so Σr = −dt Σ sink·c to round-off. It is the right-hand
 * side of the delta-form implicit step and the whole update of the FTCS baseline. Allocates nothing.
 */
export function applyOperator(m: Model, c: Float64Array, out: Float64Array, r: Float64Array, dt: number): void {
  const nPlan = m.nx * m.ny, n = nPlan * m.nz
  const lo = Math.min(nPlan, n), hi = Math.max(n - nPlan, lo)
  // Bottom and top layers (and single-layer grids) need bounds checks; interior layers do not.
  rhsRange(m, c, out, r, dt, 0, lo, false)
  rhsRange(m, c, out, r, dt, lo, hi, true)
  rhsRange(m, c, out, r, dt, hi, n, false)
}

/**
 * r[p] = dt·(inflow − out·c) on cells [p0, p1). `interior`: every neighbour index is in range (boundary faces
 * have zero coefficients), so the gather skips the bounds checks. Shared by applyOperator and the fused step.
 */
export function rhsRange(m: Model, c: Float64Array, out: Float64Array, r: Float64Array, dt: number, p0: number, p1: number, interior: boolean): void {
  const { nx, ny, nz, fwdX, bwdX, fwdY, bwdY, fwdZ, bwdZ } = m
  const nPlan = nx * ny, n = nPlan * nz
  if (interior) {
    for (let p = p0; p < p1; p++) {
      const inflow = bwdX[p]! * c[p + 1]! + fwdX[p - 1]! * c[p - 1]! + bwdY[p]! * c[p + nx]! + fwdY[p - nx]! * c[p - nx]! +
        bwdZ[p]! * c[p + nPlan]! + fwdZ[p - nPlan]! * c[p - nPlan]!
      r[p] = dt * (inflow - out[p]! * c[p]!)
    }
    return
  }
  for (let p = p0; p < p1; p++) {
    let inflow = 0
    if (p + 1 < n) inflow += bwdX[p]! * c[p + 1]!
    if (p >= 1) inflow += fwdX[p - 1]! * c[p - 1]!
    if (p + nx < n) inflow += bwdY[p]! * c[p + nx]!
    if (p >= nx) inflow += fwdY[p - nx]! * c[p - nx]!
    if (p + nPlan < n) inflow += bwdZ[p]! * c[p + nPlan]!
    if (p >= nPlan) inflow += fwdZ[p - nPlan]! * c[p - nPlan]!
    r[p] = dt * (inflow - out[p]! * c[p]!)
  }
}

/** Total outgoing rate of each cell (s⁻¹): the diagonal of A + sink. Computed once per run. */
export function outgoingRates(m: Model, sink: Float64Array): Float64Array {
  const { nx, ny, nz, fwdX, bwdX, fwdY, bwdY, fwdZ, bwdZ } = m
  const nPlan = nx * ny, n = nPlan * nz
  const out = new Float64Array(n)
  for (let p = 0; p < n; p++) {
    let o = fwdX[p]! + fwdY[p]! + fwdZ[p]! + sink[p]!
    if (p >= 1) o += bwdX[p - 1]!
    if (p >= nx) o += bwdY[p - nx]!
    if (p >= nPlan) o += bwdZ[p - nPlan]!
    out[p] = o
  }
  return out
}

/** Largest forward-Euler step that keeps every update a convex combination (stable, non-negative), s. */
export function explicitStableStep(m: Model, sink: Float64Array): number {
  const { nx, ny, nz, fwdX, bwdX, fwdY, bwdY, fwdZ, bwdZ } = m
  const nPlan = nx * ny
  let maxOut = 0
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const p = i + nx * j + nPlan * k
    let out = fwdX[p]! + fwdY[p]! + fwdZ[p]! + sink[p]!
    if (i > 0) out += bwdX[p - 1]!
    if (j > 0) out += bwdY[p - nx]!
    if (k > 0) out += bwdZ[p - nPlan]!
    if (out > maxOut) maxOut = out
  }
  return maxOut > 0 ? 1 / maxOut : Infinity
}
