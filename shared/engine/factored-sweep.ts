/**
 * Pre-factorised tridiagonal solves for the implicit sweeps. For a given dt the Thomas elimination
 * pivots of (I + dt·A_d + diag) are computed once (`factorSweep`) and reused by every step with that dt
 * (`solveFactored`). Only the inverse pivots `a` are stored; the off-diagonal multipliers are rebuilt
 * from the (single-precision) face coefficients, which halves the memory traffic of a solve.
 * Layout [outer][n][inner]: line position m of line (o, q) is cell o·n·inner + m·inner + q.
 */
/**
 * Ladder levels whose factorisations a run keeps (three sweeps × inverse pivots and multipliers =
 * 48 bytes per cell each). A run climbs from its smallest to its largest step over about 8 levels
 * (the benchmark floor uses 8), so revisits hit the cache.
 */
export const FACTOR_CACHE_LEVELS = 8

export interface SweepFactor {
  /** Inverse pivots. */
  a: Float64Array
  /** Back-substitution multipliers dt·bwd[p]·a[p] (evaluated in that order, so using them is
   * bit-identical to forming the product in the solve, two multiplications fewer per cell). */
  u: Float64Array
  fwd: Float32Array
  bwd: Float32Array
  dt: number
  outer: number
  n: number
  inner: number
}

/**
 * Factorise (I + dt·A + diag(diagExtra)) for one direction. Row p reads
 * (1 + dt(fwd[p] + bwd[p−s]) + diagExtra[p]) x_p − dt·fwd[p−s] x_{p−s} − dt·bwd[p] x_{p+s}: an M-matrix
 * whose columns sum to 1 + diagExtra, so solves are stable, keep non-negative data non-negative and
 * conserve mass (apart from the sink in diagExtra) to round-off.
 */
export function factorSweep(fwd: Float32Array, bwd: Float32Array, dt: number, outer: number, n: number, inner: number, diagExtra: Float64Array | null, into?: SweepFactor): SweepFactor {
  const size = outer * n * inner
  const f = into ?? { a: new Float64Array(size), u: new Float64Array(size), fwd, bwd, dt, outer, n, inner }
  f.fwd = fwd; f.bwd = bwd; f.dt = dt; f.outer = outer; f.n = n; f.inner = inner
  const a = f.a, u = f.u
  const block = n * inner
  if (inner === 1) {
    // Lines along x: the pivot recurrence (a division per cell) is a serial chain along each line, so
    // advance all lines one position at a time instead (independent work; the same operations per cell).
    for (let o = 0; o < outer; o++) {
      const p = o * n
      a[p] = 1 / (1 + dt * fwd[p]! + (diagExtra !== null ? diagExtra[p]! : 0))
    }
    for (let m = 1; m < n; m++) {
      for (let p = m; p < size; p += n) {
        const pm = p - 1
        const lo = dt * fwd[pm]!
        const uPrev = dt * bwd[pm]! * a[pm]!
        u[pm] = uPrev
        const diag = 1 + dt * (fwd[p]! + bwd[pm]!) + (diagExtra !== null ? diagExtra[p]! : 0)
        a[p] = 1 / (diag - lo * uPrev)
      }
    }
    for (let p = n - 1; p < size; p += n) u[p] = dt * bwd[p]! * a[p]!
    return f
  }
  for (let o = 0; o < outer; o++) {
    const base = o * block
    for (let q = 0; q < inner; q++) {
      const p = base + q
      a[p] = 1 / (1 + dt * fwd[p]! + (diagExtra !== null ? diagExtra[p]! : 0))
    }
    for (let m = 1; m < n; m++) {
      const row = base + m * inner
      for (let q = 0; q < inner; q++) {
        const p = row + q, pm = p - inner
        const lo = dt * fwd[pm]!
        const uPrev = dt * bwd[pm]! * a[pm]!
        u[pm] = uPrev
        const diag = 1 + dt * (fwd[p]! + bwd[pm]!) + (diagExtra !== null ? diagExtra[p]! : 0)
        a[p] = 1 / (diag - lo * uPrev)
      }
    }
    // Last position of each line (its multiplier is never used by the solve; kept for completeness).
    const last = base + (n - 1) * inner
    for (let q = 0; q < inner; q++) u[last + q] = dt * bwd[last + q]! * a[last + q]!
  }
  return f
}

/** Solve (I + dt·A + diag) x = r in place with a factor from factorSweep. */
export function solveFactored(r: Float64Array, f: SweepFactor): void {
  const { outer, n, inner } = f
  const block = n * inner
  if (inner === 1) {
    solveLinesAlong(r, f, 0, outer)
    return
  }
  for (let o = 0; o < outer; o++) solveBlockAcross(r, f, o * block)
}

/**
 * Solve the lines of one block of a factor with inner > 1 in place: line q (0 ≤ q < inner) holds the
 * cells base + m·inner + q, m = 0 … n − 1 (the y lines of one layer, or every z column). Eight lines
 * are eliminated together, each carrying its running value in a register instead of reloading the
 * previous position (independent chains the CPU overlaps; twice as fast as sweeping position by
 * position across all lines). Every cell sees the same operations in the same order as a line solved
 * alone, so results do not depend on the grouping.
 */
export function solveBlockAcross(r: Float64Array, f: SweepFactor, base: number): void {
  const { a, u, fwd, dt, n, inner } = f
  const last = base + (n - 1) * inner
  let q = 0
  for (; q + 8 <= inner; q += 8) {
    const b = base + q
    let y0 = r[b]! * a[b]!, y1 = r[b + 1]! * a[b + 1]!, y2 = r[b + 2]! * a[b + 2]!, y3 = r[b + 3]! * a[b + 3]!
    let y4 = r[b + 4]! * a[b + 4]!, y5 = r[b + 5]! * a[b + 5]!, y6 = r[b + 6]! * a[b + 6]!, y7 = r[b + 7]! * a[b + 7]!
    r[b] = y0; r[b + 1] = y1; r[b + 2] = y2; r[b + 3] = y3; r[b + 4] = y4; r[b + 5] = y5; r[b + 6] = y6; r[b + 7] = y7
    const end = last + q
    for (let p = b + inner; p <= end; p += inner) {
      const pm = p - inner
      y0 = (r[p]! + dt * fwd[pm]! * y0) * a[p]!; r[p] = y0
      y1 = (r[p + 1]! + dt * fwd[pm + 1]! * y1) * a[p + 1]!; r[p + 1] = y1
      y2 = (r[p + 2]! + dt * fwd[pm + 2]! * y2) * a[p + 2]!; r[p + 2] = y2
      y3 = (r[p + 3]! + dt * fwd[pm + 3]! * y3) * a[p + 3]!; r[p + 3] = y3
      y4 = (r[p + 4]! + dt * fwd[pm + 4]! * y4) * a[p + 4]!; r[p + 4] = y4
      y5 = (r[p + 5]! + dt * fwd[pm + 5]! * y5) * a[p + 5]!; r[p + 5] = y5
      y6 = (r[p + 6]! + dt * fwd[pm + 6]! * y6) * a[p + 6]!; r[p + 6] = y6
      y7 = (r[p + 7]! + dt * fwd[pm + 7]! * y7) * a[p + 7]!; r[p + 7] = y7
    }
    for (let p = end - inner; p >= b; p -= inner) {
      y0 = r[p]! + u[p]! * y0; r[p] = y0
      y1 = r[p + 1]! + u[p + 1]! * y1; r[p + 1] = y1
      y2 = r[p + 2]! + u[p + 2]! * y2; r[p + 2] = y2
      y3 = r[p + 3]! + u[p + 3]! * y3; r[p + 3] = y3
      y4 = r[p + 4]! + u[p + 4]! * y4; r[p + 4] = y4
      y5 = r[p + 5]! + u[p + 5]! * y5; r[p + 5] = y5
      y6 = r[p + 6]! + u[p + 6]! * y6; r[p + 6] = y6
      y7 = r[p + 7]! + u[p + 7]! * y7; r[p + 7] = y7
    }
  }
  // Remaining lines one at a time.
  for (; q < inner; q++) {
    const b = base + q, end = last + q
    let y = r[b]! * a[b]!
    r[b] = y
    for (let p = b + inner; p <= end; p += inner) {
      y = (r[p]! + dt * fwd[p - inner]! * y) * a[p]!
      r[p] = y
    }
    for (let p = end - inner; p >= b; p -= inner) {
      y = r[p]! + u[p]! * y
      r[p] = y
    }
  }
}

/**
 * Solve `count` consecutive lines of a factor with inner = 1 (x lines, f.n cells each) in place,
 * starting at cell `base`. Each line is a serial recurrence, so its cost is the latency of the chain:
 * four lines are eliminated together (independent chains the CPU overlaps), and every line sees
 * exactly the same operations in the same order as when solved alone.
 */
export function solveLinesAlong(r: Float64Array, f: SweepFactor, base: number, count: number): void {
  const { a, u, fwd, dt, n } = f
  let o = 0
  for (; o + 4 <= count; o += 4) {
    const b0 = base + o * n, b1 = b0 + n, b2 = b1 + n, b3 = b2 + n
    let y0 = r[b0]! * a[b0]!, y1 = r[b1]! * a[b1]!, y2 = r[b2]! * a[b2]!, y3 = r[b3]! * a[b3]!
    r[b0] = y0; r[b1] = y1; r[b2] = y2; r[b3] = y3
    for (let m = 1; m < n; m++) {
      const p0 = b0 + m, p1 = b1 + m, p2 = b2 + m, p3 = b3 + m
      y0 = (r[p0]! + dt * fwd[p0 - 1]! * y0) * a[p0]!; r[p0] = y0
      y1 = (r[p1]! + dt * fwd[p1 - 1]! * y1) * a[p1]!; r[p1] = y1
      y2 = (r[p2]! + dt * fwd[p2 - 1]! * y2) * a[p2]!; r[p2] = y2
      y3 = (r[p3]! + dt * fwd[p3 - 1]! * y3) * a[p3]!; r[p3] = y3
    }
    for (let m = n - 2; m >= 0; m--) {
      const p0 = b0 + m, p1 = b1 + m, p2 = b2 + m, p3 = b3 + m
      y0 = r[p0]! + u[p0]! * y0; r[p0] = y0
      y1 = r[p1]! + u[p1]! * y1; r[p1] = y1
      y2 = r[p2]! + u[p2]! * y2; r[p2] = y2
      y3 = r[p3]! + u[p3]! * y3; r[p3] = y3
    }
  }
  for (; o < count; o++) {
    const b = base + o * n, end = b + n
    let y = r[b]! * a[b]!
    r[b] = y
    for (let p = b + 1; p < end; p++) {
      y = (r[p]! + dt * fwd[p - 1]! * y) * a[p]!
      r[p] = y
    }
    let x = r[end - 1]!
    for (let p = end - 2; p >= b; p--) {
      x = r[p]! + u[p]! * x
      r[p] = x
    }
  }
}
