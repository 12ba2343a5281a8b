/**
 * Pre-factorised tridiagonal solves for the implicit sweeps. For a given dt the Thomas elimination
 * coefficients of (I + dt A_d) are computed once (`factorSweep`) and reused by every step with that dt
 * (`solveFactored`): the forward pass becomes y_p = r_p·a_p + b_p·y_{p−s}, the backward pass
 * x_p = y_p + u_p·x_{p+s}. Same layout as implicitSweep: [outer][n][inner].
 */
export interface SweepFactor {
  a: Float64Array
  b: Float64Array
  u: Float64Array
  outer: number
  n: number
  inner: number
}

/**
 * Elimination coefficients of (I + dt·A + extraDt·diag(diagExtra)) for one direction. Row p reads
 * (1 + dt(fwd[p] + bwd[p−s]) + extraDt·diagExtra[p]) x_p − dt·fwd[p−s] x_{p−s} − dt·bwd[p] x_{p+s}: an
 * M-matrix whose columns sum to 1 + extraDt·diagExtra, so solves are stable and conserve mass.
 */
export function factorSweep(fwd: Float64Array, bwd: Float64Array, dt: number, outer: number, n: number, inner: number, diagExtra: Float64Array | null, into?: SweepFactor, extraDt = dt): SweepFactor {
  const size = outer * n * inner
  const f = into ?? { a: new Float64Array(size), b: new Float64Array(size), u: new Float64Array(size), outer, n, inner }
  const { a, b, u } = f
  const block = n * inner
  for (let o = 0; o < outer; o++) {
    const base = o * block
    for (let q = 0; q < inner; q++) {
      const p = base + q
      const inv = 1 / (1 + dt * fwd[p]! + (diagExtra !== null ? extraDt * diagExtra[p]! : 0))
      a[p] = inv
      b[p] = 0
      u[p] = dt * bwd[p]! * inv
    }
    for (let m = 1; m < n; m++) {
      const row = base + m * inner
      for (let q = 0; q < inner; q++) {
        const p = row + q, pm = p - inner
        const lo = dt * fwd[pm]!
        const diag = 1 + dt * (fwd[p]! + bwd[pm]!) + (diagExtra !== null ? extraDt * diagExtra[p]! : 0)
        const inv = 1 / (diag - lo * u[pm]!)
        a[p] = inv
        b[p] = lo * inv
        u[p] = dt * bwd[p]! * inv
      }
    }
  }
  return f
}

/** Solve (I + dt·A) x = r in place with a factor from factorSweep. */
export function solveFactored(r: Float64Array, f: SweepFactor): void {
  const { a, b, u, outer, n, inner } = f
  const block = n * inner
  if (inner === 1) {
    for (let o = 0; o < outer; o++) {
      const base = o * block, end = base + n
      let y = r[base]! * a[base]!
      r[base] = y
      for (let p = base + 1; p < end; p++) {
        y = r[p]! * a[p]! + b[p]! * y
        r[p] = y
      }
      let x = r[end - 1]!
      for (let p = end - 2; p >= base; p--) {
        x = r[p]! + u[p]! * x
        r[p] = x
      }
    }
    return
  }
  for (let o = 0; o < outer; o++) {
    const base = o * block
    for (let q = 0; q < inner; q++) r[base + q] = r[base + q]! * a[base + q]!
    for (let m = 1; m < n; m++) {
      const row = base + m * inner
      for (let q = 0; q < inner; q++) {
        const p = row + q
        r[p] = r[p]! * a[p]! + b[p]! * r[p - inner]!
      }
    }
    for (let m = n - 2; m >= 0; m--) {
      const row = base + m * inner
      for (let q = 0; q < inner; q++) {
        const p = row + q
        r[p] = r[p]! + u[p]! * r[p + inner]!
      }
    }
  }
}
