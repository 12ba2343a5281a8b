import type { Model } from './model'

/**
 * BASELINE ONLY: forward-Euler, centred-in-space (FTCS) transport step with explicit upwind advection,
 * on exactly the same face coefficients as the implicit solver. Kept to measure the implicit solver
 * against (tests/bench). Stable and non-negative only for dt ≤ {@link explicitStableStep}.
 * Writes the new field into `next`; `c` is left unchanged.
 */
export function explicitTransportStep(m: Model, c: Float64Array, next: Float64Array, dt: number): void {
  const { nx, ny, nz, fwdX, bwdX, fwdY, bwdY, fwdZ, bwdZ, floorOut } = m
  const nPlan = nx * ny
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) {
    const row = nx * j + nPlan * k
    for (let i = 0; i < nx; i++) {
      const p = row + i
      const cp = c[p]!
      let out = fwdX[p]! + fwdY[p]! + fwdZ[p]!
      let inflow = bwdX[p]! * (i + 1 < nx ? c[p + 1]! : 0) + bwdY[p]! * (j + 1 < ny ? c[p + nx]! : 0) + bwdZ[p]! * (k + 1 < nz ? c[p + nPlan]! : 0)
      if (i > 0) { out += bwdX[p - 1]!; inflow += fwdX[p - 1]! * c[p - 1]! }
      if (j > 0) { out += bwdY[p - nx]!; inflow += fwdY[p - nx]! * c[p - nx]! }
      if (k > 0) { out += bwdZ[p - nPlan]!; inflow += fwdZ[p - nPlan]! * c[p - nPlan]! } else out += floorOut[p]!
      next[p] = cp + dt * (inflow - out * cp)
    }
  }
}

/** Largest explicit time step that keeps every update a convex combination (stable, non-negative), s. */
export function explicitStableStep(m: Model): number {
  const { nx, ny, nz, fwdX, bwdX, fwdY, bwdY, fwdZ, bwdZ, floorOut } = m
  const nPlan = nx * ny
  let maxOut = 0
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const p = i + nx * j + nPlan * k
    let out = fwdX[p]! + fwdY[p]! + fwdZ[p]!
    if (i > 0) out += bwdX[p - 1]!
    if (j > 0) out += bwdY[p - nx]!
    out += k > 0 ? bwdZ[p - nPlan]! : floorOut[i + nx * j]!
    if (out > maxOut) maxOut = out
  }
  return maxOut > 0 ? 1 / maxOut : Infinity
}
