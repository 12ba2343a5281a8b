/**
 * One implicit-Euler sweep of 1-D transport along lines of the grid, solved with the Thomas algorithm
 * vectorised over `inner` parallel lines (contiguous in memory, so strided directions stay cache-friendly).
 * The grid is seen as [outer][n][inner]; line position m couples to m±1 through the face coefficients
 * (see Model): row p reads  (1 + dt(fwd[p] + bwd[p−s] + out0)) C_p − dt fwd[p−s] C_{p−s} − dt bwd[p] C_{p+s}.
 * The matrix is an M-matrix with unit column sums (plus `out0`), so the sweep is unconditionally stable,
 * keeps C ≥ 0 and conserves mass exactly apart from the floor outflow `out0` on line position 0.
 * `cp` is caller-owned scratch of the grid's size. Nothing is allocated.
 */
export function implicitSweep(
  c: Float64Array, fwd: Float64Array, bwd: Float64Array, cp: Float64Array, dt: number,
  outer: number, n: number, inner: number, out0: Float64Array | null,
): void {
  const lineBlock = n * inner
  for (let o = 0; o < outer; o++) {
    const base = o * lineBlock
    // m = 0
    for (let q = 0; q < inner; q++) {
      const p = base + q
      const up = dt * bwd[p]!
      const b = 1 + dt * fwd[p]! + (out0 !== null ? dt * out0[q]! : 0)
      const inv = 1 / b
      cp[p] = -up * inv
      c[p] = c[p]! * inv
    }
    for (let m = 1; m < n; m++) {
      const row = base + m * inner
      for (let q = 0; q < inner; q++) {
        const p = row + q, pm = p - inner
        const lo = dt * fwd[pm]!
        const up = dt * bwd[p]!
        const b = 1 + dt * (fwd[p]! + bwd[pm]!)
        const inv = 1 / (b + lo * cp[pm]!)
        cp[p] = -up * inv
        c[p] = (c[p]! + lo * c[pm]!) * inv
      }
    }
    for (let m = n - 2; m >= 0; m--) {
      const row = base + m * inner
      for (let q = 0; q < inner; q++) {
        const p = row + q
        c[p] = c[p]! - cp[p]! * c[p + inner]!
      }
    }
  }
}

/** Implicit sweep along contiguous lines (the x direction): the Thomas algorithm line by line. */
export function implicitSweepContiguous(c: Float64Array, fwd: Float64Array, bwd: Float64Array, cp: Float64Array, dt: number, lines: number, n: number): void {
  for (let o = 0; o < lines; o++) {
    const base = o * n
    let prevCp = -dt * bwd[base]! / (1 + dt * fwd[base]!)
    let prevC = c[base]! / (1 + dt * fwd[base]!)
    cp[base] = prevCp
    c[base] = prevC
    for (let m = 1; m < n; m++) {
      const p = base + m
      const lo = dt * fwd[p - 1]!
      const inv = 1 / (1 + dt * (fwd[p]! + bwd[p - 1]!) + lo * prevCp)
      prevCp = -dt * bwd[p]! * inv
      prevC = (c[p]! + lo * prevC) * inv
      cp[p] = prevCp
      c[p] = prevC
    }
    for (let p = base + n - 2; p >= base; p--) c[p] = c[p]! - cp[p]! * c[p + 1]!
  }
}
