/**
 * Hot per-step loops, kept as small top-level functions so the JIT optimises them on their own.
 * All arrays are caller-owned; nothing is allocated.
 */

/** Coefficients of the third-derivative estimate from three successive step lengths (0 if unknown). */
export interface RateWeights { ih: number; ih1: number; ih2: number; w1: number; w2: number; w3: number }

/** Per-room sums written by {@link finishStep} (one entry per room). */
export interface RoomSums {
  /** Σ|C'''| estimate (only when rate weights are given). */
  err: Float64Array
  /** Σ new c (after clipping). */
  mass: Float64Array
  /** Σ c before the step. */
  old: Float64Array
  /** Σ ΔC of the step. */
  delta: Float64Array
}

/**
 * c ← max(c + d, 0) and the increment history: `dOld` (the increment two steps back) is overwritten
 * with d, so the caller swaps its two history buffers afterwards (d1 ↔ dOld) instead of shifting
 * both. When `wt` is given, also accumulates per room Σ|C'''| (midpoint divided differences of the
 * step rates, from d, d1 and dOld). Always accumulates per room Σc before, Σd and Σc after (the
 * ventilation removal is booked from these per room: its rate is the same in every cell of a room).
 * Writes [airborne sum of c, total negative part removed] into `out`.
 */
export function finishStep(
  c: Float64Array, d: Float64Array, d1: Float32Array, dOld: Float32Array, wt: RateWeights | null,
  roomOfCell: Int16Array, sums: RoomSums, out: Float64Array,
): void {
  const n = c.length
  const { err: roomErr, mass: roomMass, old: roomOld, delta: roomDelta } = sums
  let den = 0, neg = 0
  const ih = wt?.ih ?? 0, ih1 = wt?.ih1 ?? 0, ih2 = wt?.ih2 ?? 0, w1 = wt?.w1 ?? 0, w2 = wt?.w2 ?? 0, w3 = wt?.w3 ?? 0
  // Rooms come in runs along x: one run at a time, summed locally and added to its room at the end
  // (no per-cell store into the room arrays, no per-cell room test in the inner loop).
  for (let p = 0; p < n; ) {
    const room = roomOfCell[p]!
    let end = p + 1
    while (end < n && roomOfCell[end] === room) end++
    let accE = 0, accM = 0, accC = 0, accD = 0
    for (let i = p; i < end; i++) {
      const dp = d[i]!
      const cp = c[i]!
      const v = cp + dp
      const r0 = dp * ih, r1 = d1[i]! * ih1, r2 = dOld[i]! * ih2
      accE += Math.abs(((r0 - r1) * w1 - (r1 - r2) * w2) * w3)
      dOld[i] = dp
      const cv = v < 0 ? 0 : v
      neg += cv - v // −v where v < 0, else +0
      den += cv
      c[i] = cv
      accM += cv
      accC += cp
      accD += dp
    }
    if (room >= 0) { roomErr[room] += accE; roomMass[room] += accM; roomOld[room] += accC; roomDelta[room] += accD }
    p = end
  }
  out[0] = den
  out[1] = neg
}

/** c ← c·f (the global mass-conserving fix after zeroing undershoots). */
export function scaleField(c: Float64Array, f: number): void {
  for (let p = 0; p < c.length; p++) c[p] *= f
}

/**
 * Removal over a step by ventilation, local exhaust and floor outflow, at rate × dt × ((1−Θ)C + ΘC_new)
 * with Θ = 1/2 where sink·dt ≤ 1 and 1 where it is stiff (Θ = 0 when `d` is null: explicit).
 * Adds into acc[0] (ventilation), acc[1] (local exhaust), acc[2] (exhausted fraction of the cleanroom
 * floor outflow; the rest returns through the ceiling).
 */
export function accountSinks(
  c: Float64Array, d: Float64Array | null, dt: number, cellVolume: number, nPlan: number, nz: number, withVentilation: boolean,
  roomOfPlan: Int16Array, roomDecay: Float64Array, floorOut: Float64Array, sink: Float64Array,
  exhaustCells: Int32Array, exhaustRates: Float64Array, exhaustFractionOfRoom: Float64Array, acc: Float64Array,
): void {
  const w = dt * cellVolume
  let vent = 0, down = 0
  for (let pp = 0; pp < nPlan; pp++) {
    const r = roomOfPlan[pp]!
    if (r < 0) continue
    const k = roomDecay[r]!
    if (k > 0 && withVentilation) {
      let col = 0
      for (let kk = 0; kk < nz; kk++) {
        const p = pp + nPlan * kk
        col += d === null ? c[p]! : c[p]! + (sink[p]! * dt <= 1 ? 0.5 : 1) * d[p]!
      }
      vent += k * col
    }
    const fo = floorOut[pp]!
    if (fo > 0) down += exhaustFractionOfRoom[r]! * fo * (d === null ? c[pp]! : c[pp]! + (sink[pp]! * dt <= 1 ? 0.5 : 1) * d[pp]!)
  }
  acc[0] += vent * w
  acc[2] += down * w
  let ex = 0
  for (let a = 0; a < exhaustCells.length; a++) {
    const p = exhaustCells[a]!
    ex += exhaustRates[a]! * (d === null ? c[p]! : c[p]! + (sink[p]! * dt <= 1 ? 0.5 : 1) * d[p]!)
  }
  acc[1] += ex * w
}

/**
 * Breathing-height and column-maximum snapshots (ppm) of the field c − α·d1 + β·d2 (time
 * interpolation within the last step), NaN for non-air cells.
 */
export function snapshotPlan(
  c: Float64Array, d: Float32Array, d2: Float32Array, alpha: number, beta: number, roomOfPlan: Int16Array, nPlan: number, nz: number,
  k0: number, k1: number, wb: number, bh: Float32Array, cm: Float32Array,
): void {
  for (let pp = 0; pp < nPlan; pp++) {
    if (roomOfPlan[pp]! < 0) { bh[pp] = NaN; cm[pp] = NaN; continue }
    const p0 = pp + nPlan * k0, p1 = pp + nPlan * k1
    let v0 = c[p0]! - alpha * d[p0]! + beta * d2[p0]!, v1 = c[p1]! - alpha * d[p1]! + beta * d2[p1]!
    if (v0 < 0) v0 = 0
    if (v1 < 0) v1 = 0
    bh[pp] = (v0 * (1 - wb) + v1 * wb) * 1e6
    let mx = 0
    for (let k = 0; k < nz; k++) {
      const p = pp + nPlan * k
      const v = c[p]! - alpha * d[p]! + beta * d2[p]!
      if (v > mx) mx = v
    }
    cm[pp] = mx * 1e6
  }
}

/**
 * Ascending cell indices as runs of consecutive cells: [start0, length0, start1, length1, …]. The
 * cleanroom return's cells form a few long runs, so its loops index directly instead of gathering.
 */
export function cellRuns(cells: Int32Array): Int32Array {
  const runs: number[] = []
  for (let a = 0; a < cells.length; ) {
    let b = a + 1
    while (b < cells.length && cells[b] === cells[b - 1]! + 1) b++
    runs.push(cells[a]!, b - a)
    a = b
  }
  return Int32Array.from(runs)
}

/** Σ x over the cells of `runs` (from {@link cellRuns}), in ascending cell order. */
export function runSum(x: Float64Array, runs: Int32Array): number {
  let s = 0
  for (let k = 0; k < runs.length; k += 2) {
    for (let p = runs[k]!, e = p + runs[k + 1]!; p < e; p++) s += x[p]!
  }
  return s
}

/** Σ w[a]·x[cell a] over the cells of `runs`, a counting the cells in ascending order. */
export function runDot(w: Float64Array, x: Float64Array, runs: Int32Array): number {
  let s = 0, a = 0
  for (let k = 0; k < runs.length; k += 2) {
    for (let p = runs[k]!, e = p + runs[k + 1]!; p < e; p++, a++) s += w[a]! * x[p]!
  }
  return s
}

/**
 * r += coef·z over the columns of the plan cells in `runs`, z stored compactly as z[k·nb + a] for the
 * a-th column (ascending) at layer k. Layer by layer: consecutive cells of a layer are close in memory.
 */
export function addColumnMultiple(r: Float64Array, runs: Int32Array, nb: number, z: Float64Array, coef: number, nPlan: number, nz: number): void {
  for (let k = 0; k < nz; k++) {
    const off = nPlan * k
    let a = nb * k
    for (let q = 0; q < runs.length; q += 2) {
      for (let p = runs[q]! + off, e = p + runs[q + 1]!; p < e; p++, a++) r[p] += coef * z[a]!
    }
  }
}

/**
 * Trapezoidal defect of the step just taken, summed per room: Σ|ΔC − h/2·(L Cⁿ + L Cⁿ⁺¹)| where L is
 * the whole semi-discrete operator without sources (transport, sinks, cleanroom return). For an exactly
 * solved Crank-Nicolson step it is zero; what remains is what the h³C''' estimate cannot see: the
 * backward-Euler parts (advective faces, stiff sinks: first order, ≈ h²/2·|C''|), the approximate
 * factorisation's splitting error and a stalled approach to a steady state. Source cells are corrected
 * by the caller (their input is part of ΔC). Adds into roomDef; allocates nothing.
 */
export function defectSums(d: Float64Array, lOld: Float64Array, lNew: Float64Array, h: number, roomOfCell: Int16Array, roomDef: Float64Array): void {
  const n = d.length, hh = 0.5 * h
  for (let p = 0; p < n; ) {
    const room = roomOfCell[p]!
    let end = p + 1
    while (end < n && roomOfCell[end] === room) end++
    let acc = 0
    for (let i = p; i < end; i++) acc += Math.abs(d[i]! - hh * (lOld[i]! + lNew[i]!))
    if (room >= 0) roomDef[room] += acc
    p = end
  }
}

