import { solveBlockAcross, solveLinesAlong, type SweepFactor } from './factored-sweep'
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
 * `extra` (s⁻¹ per cell, optional) is added as dt·extra: explicit deferred corrections.
 */
export function fusedRhsSolveXY(
  m: Model, c: Float64Array, out: Float64Array, r: Float64Array, dt: number,
  fx: SweepFactor, fy: SweepFactor,
  rowStart: Int32Array, entryCell: Int32Array, entryAmount: Int32Array, amount: Float64Array,
  extra: Float64Array | null = null,
): void {
  const { nx, ny, nz } = m
  const nPlan = nx * ny
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
      // Deferred-correction terms (rate per cell, e.g. the TVD downflow correction), explicit.
      if (extra !== null) for (let p = base, pe = base + rows * nx; p < pe; p++) r[p] += dt * extra[p]!
      solveLinesAlong(r, fx, base, rows)
      j += rows
    }
    // 2. y-solve of layer k: its lines along y, eight at a time.
    solveBlockAcross(r, fy, k * nPlan)
  }
}
