import type { Model } from './model'

/**
 * Flux-limited (TVD) correction of the cleanroom downflow, applied by deferred correction: the implicit
 * operator keeps first-order upwind on the vertical faces (an M-matrix: stable and non-negative at any
 * step), and this explicit term adds the antidiffusive part of the van Leer limited flux (van Leer 1974,
 * J. Comput. Phys. 14:361; limiter ψ(r) = (r + |r|)/(1 + |r|), Sweby 1984 TVD region, from memory):
 *
 *     face value  C_f = C_U + ½ ψ(r) (C_D − C_U),   r = (C_U − C_UU)/(C_D − C_U)
 *     correction  F_c = a · ½ ψ(r) (C_D − C_U),     a = w/dz (s⁻¹)
 *
 * U the cell above the face (upwind in downflow), D below it, UU above U. The correction moves gas from
 * U to D (mass exact); at the steady state of the delta form the scheme is the limited second-order one.
 * The top face of a column (no UU) and the floor outflow stay first order. `out[p]` += rate (s⁻¹ per cell).
 */
export interface DownflowColumns {
  /** Plan cells with downflow, and the face advection rate a = w/dz of each. */
  plan: Int32Array
  rate: Float64Array
}

export function downflowColumns(m: Model, speedOfRoom: Float64Array): DownflowColumns {
  const plan: number[] = [], rate: number[] = []
  if (m.nz < 2) return { plan: Int32Array.from(plan), rate: Float64Array.from(rate) }
  const nPlan = m.nx * m.ny
  for (let pp = 0; pp < nPlan; pp++) {
    const r = m.roomOfPlan[pp]!
    if (r < 0 || !(speedOfRoom[r]! > 0)) continue
    plan.push(pp)
    rate.push(speedOfRoom[r]! / m.dz)
  }
  return { plan: Int32Array.from(plan), rate: Float64Array.from(rate) }
}

/** out[p] += the TVD correction rate of cell p (only the downflow columns are touched). */
export function addDownflowCorrection(c: Float64Array, cols: DownflowColumns, nPlan: number, nz: number, out: Float64Array, scale: number): void {
  const { plan, rate } = cols
  for (let a = 0; a < plan.length; a++) {
    const pp = plan[a]!, w = rate[a]! * scale
    // Face between layer k (D, below) and k + 1 (U, above), for k + 2 < nz (UU exists).
    for (let k = 0; k + 2 < nz; k++) {
      const pd = pp + nPlan * k, pu = pd + nPlan, puu = pu + nPlan
      const cd = c[pd]!, cu = c[pu]!, cuu = c[puu]!
      const du = cd - cu
      if (du === 0) continue
      const r = (cu - cuu) / du
      if (r <= 0) continue
      const fc = w * 0.5 * ((2 * r) / (1 + r)) * du
      out[pu] -= fc
      out[pd] += fc
    }
  }
}
