import { solveBlockAcross, type SweepFactor } from './factored-sweep'
import type { Model } from './model'
import { rhsRange } from './operator'

/**
 * The right-hand side and the x and y sweeps of the implicit step in one pass over the grid, layer by
 * layer, so each layer's data is reused from cache:
 *
 *     for each layer k:  r = dt·(−(A + K) c) + inputs   row by row (as applyOperator + addInputs)
 *                        x-solve each row                 (as solveFactored with the x factor)
 *                        y-solve the layer                (solveBlockAcross with the y factor)
 *
 * Every cell sees exactly the same floating-point operations in the same order as the separate
 * kernels (the sparse inputs are added per cell in the same order), so results are bit-identical;
 * the caller finishes with the z sweep (solveFactored with the z factor). Allocates nothing.
 *
 * Inputs are sparse: entry e adds amount[entryAmount[e]] to cell entryCell[e]; entries are grouped by
 * x-row (row = cell / nx) in CSR form rowStart (length ny·nz + 1), in the order addInputs applies them.
 */
export function fusedRhsSolveXY(
  m: Model, c: Float64Array, out: Float64Array, r: Float64Array, dt: number,
  fx: SweepFactor, fy: SweepFactor,
  rowStart: Int32Array, entryCell: Int32Array, entryAmount: Int32Array, amount: Float64Array,
): void {
  const { nx, ny, nz } = m
  const nPlan = nx * ny
  const ax = fx.a, fwx = fx.fwd, ux = fx.u, dtx = fx.dt
  for (let k = 0; k < nz; k++) {
    const interiorLayer = k > 0 && k < nz - 1
    // 1. Right-hand side and x-solve, four rows at a time (their x-lines are independent chains,
    //    eliminated together so the CPU overlaps them; same arithmetic as one at a time).
    let j = 0
    for (; j < ny; ) {
      const rows = j + 4 <= ny ? 4 : 1
      const row = j + ny * k
      const base = row * nx
      rhsRange(m, c, out, r, dt, base, base + rows * nx, interiorLayer)
      for (let e = rowStart[row]!, e1 = rowStart[row + rows]!; e < e1; e++) r[entryCell[e]!] += amount[entryAmount[e]!]!
      if (rows === 4) {
        const b0 = base, b1 = b0 + nx, b2 = b1 + nx, b3 = b2 + nx
        let y0 = r[b0]! * ax[b0]!, y1 = r[b1]! * ax[b1]!, y2 = r[b2]! * ax[b2]!, y3 = r[b3]! * ax[b3]!
        r[b0] = y0; r[b1] = y1; r[b2] = y2; r[b3] = y3
        for (let i = 1; i < nx; i++) {
          const p0 = b0 + i, p1 = b1 + i, p2 = b2 + i, p3 = b3 + i
          y0 = (r[p0]! + dtx * fwx[p0 - 1]! * y0) * ax[p0]!; r[p0] = y0
          y1 = (r[p1]! + dtx * fwx[p1 - 1]! * y1) * ax[p1]!; r[p1] = y1
          y2 = (r[p2]! + dtx * fwx[p2 - 1]! * y2) * ax[p2]!; r[p2] = y2
          y3 = (r[p3]! + dtx * fwx[p3 - 1]! * y3) * ax[p3]!; r[p3] = y3
        }
        for (let i = nx - 2; i >= 0; i--) {
          const p0 = b0 + i, p1 = b1 + i, p2 = b2 + i, p3 = b3 + i
          y0 = r[p0]! + ux[p0]! * y0; r[p0] = y0
          y1 = r[p1]! + ux[p1]! * y1; r[p1] = y1
          y2 = r[p2]! + ux[p2]! * y2; r[p2] = y2
          y3 = r[p3]! + ux[p3]! * y3; r[p3] = y3
        }
      } else {
        const end = base + nx
        let y = r[base]! * ax[base]!
        r[base] = y
        for (let p = base + 1; p < end; p++) {
          y = (r[p]! + dtx * fwx[p - 1]! * y) * ax[p]!
          r[p] = y
        }
        let x = r[end - 1]!
        for (let p = end - 2; p >= base; p--) {
          x = r[p]! + ux[p]! * x
          r[p] = x
        }
      }
      j += rows
    }
    // 2. y-solve of layer k: its lines along y, eight at a time.
    solveBlockAcross(r, fy, k * nPlan)
  }
}
