import type { Gas } from '../gases/gas-schema'
import { SimulationCancelled } from './errors'
import { explicitStableStep, explicitTransportStep } from './explicit-baseline'
import { implicitSweep, implicitSweepContiguous } from './implicit-sweep'
import { buildModel, type Model } from './model'
import type { Scenario } from './scenario-schema'
import { thresholdsFor, type Threshold } from './thresholds'
import { validateScenario, type ValidScenario } from './validate'

/** Options of {@link simulate}. */
export interface SimulateOptions {
  /** Called with the simulated fraction (0–1), at most about 100 times per run. */
  onProgress?(fraction: number): void
  /** Set `cancelled` to true to stop the run; simulate then throws SimulationCancelled. */
  signal?: { cancelled: boolean }
  /** "implicit" (default): LOD implicit Euler; "explicit-baseline": FTCS at its stability limit (bench only). */
  solver?: 'implicit' | 'explicit-baseline'
  /** Wall clock in ms (injectable for tests). @default performance.now */
  now?: () => number
}

/** Time series and summary at one probe. */
export interface ProbeResult {
  id: string
  /** ppm at each output time (trilinear between cell centres of the probe's room). */
  ppm: Float64Array
  peak_ppm: number
  peak_time_s: number
  /** Highest 15-minute rolling TWA, ppm (zero exposure assumed before t = 0). */
  max_twa15_ppm: number
  /** First time each threshold is reached (s), null if never; same order as `thresholds`. */
  first_exceed_s: (number | null)[]
}

/** Everything a run produces. Plan arrays are nx·ny, index i + nx·j; NaN marks non-air cells. */
export interface SimulationResult {
  grid: { nx: number; ny: number; nz: number; cell_m: number; layer_m: number; origin_m: [number, number]; room_ids: string[]; room_of_cell: Int16Array }
  times_s: Float64Array
  thresholds: Threshold[]
  probes: ProbeResult[]
  /** ppm at the breathing height, one Float32Array (nx·ny) per output time. */
  breathing_ppm: Float32Array[]
  /** Column maximum ppm, one Float32Array (nx·ny) per output time. */
  column_max_ppm: Float32Array[]
  /** Per threshold: first time (s) the breathing-height value reaches it; Infinity = never, NaN = not air. */
  fronts_s: Float32Array[]
  /** Peak breathing-height ppm over the run. */
  peak_ppm: Float32Array
  /** Highest 15-minute rolling TWA at the breathing height, ppm. */
  max_twa15_ppm: Float32Array
  mass_balance: {
    released_m3: number
    /** Room air plus the cleanroom return paths. */
    in_air_m3: number
    in_return_m3: number
    removed_m3: number
    removed_by: { ventilation_m3: number; local_exhaust_m3: number; downflow_exhaust_m3: number }
    /** |released − in_air − removed| / released */
    closure_error: number
  }
  diffusivity_m2_s: number
  diffusivity_basis: string
  gas: Gas
  stats: { cells: number; grid_cells: number; steps: number; wall_s: number; min_dt_s: number; max_dt_s: number; solver: string }
}

const TWA_WINDOW_S = 900

/**
 * Run a scenario. Accepts the raw scenario JSON (validated here; throws ScenarioError naming the
 * field) or the output of validateScenario.
 */
export function simulate(input: unknown, opts: SimulateOptions = {}): SimulationResult {
  const now = opts.now ?? (() => performance.now())
  const t0Wall = now()
  const valid: ValidScenario = isValid(input) ? input : validateScenario(input)
  const { scenario: s, gas } = valid
  const m = buildModel(s, gas)
  return run(s, gas, m, opts, t0Wall, now)
}

function isValid(x: unknown): x is ValidScenario {
  return typeof x === 'object' && x !== null && 'scenario' in x && 'gas' in x && !('format' in x)
}

function run(s: Scenario, gas: Gas, m: Model, opts: SimulateOptions, t0Wall: number, now: () => number): SimulationResult {
  const { nx, ny, nz, cellVolume: vc } = m
  const nPlan = nx * ny, n = nPlan * nz
  const explicit = opts.solver === 'explicit-baseline'
  const c = new Float64Array(n)
  const c0 = new Float64Array(n)
  const dPrev = new Float64Array(n)
  const scratch = new Float64Array(n)

  const duration = s.duration_s, interval = s.output_interval_s
  const nOut = Math.floor(duration / interval + 1e-9) + 1
  const times = Float64Array.from({ length: nOut }, (_, k) => k * interval)
  const thresholds = thresholdsFor(gas, s.thresholds_ppm)
  const nThr = thresholds.length
  const thrFrac = Float64Array.from(thresholds, (t) => t.ppm * 1e-6)

  // Observers (all allocated before the loop).
  const probeSeries = m.probes.map(() => new Float64Array(nOut))
  const probePrev = new Float64Array(m.probes.length)
  const probeFirst = m.probes.map(() => new Float64Array(nThr).fill(Infinity))
  const probePeak = new Float64Array(m.probes.length), probePeakT = new Float64Array(m.probes.length)
  const breathing: Float32Array[] = [], columnMax: Float32Array[] = []
  for (let k = 0; k < nOut; k++) { breathing.push(new Float32Array(nPlan)); columnMax.push(new Float32Array(nPlan)) }
  const bhPrev = new Float64Array(nPlan)
  const crossed = new Uint8Array(nPlan)
  const fronts = Array.from({ length: nThr }, () => new Float32Array(nPlan).fill(Infinity))
  const peak = new Float64Array(nPlan)
  const integral = new Float64Array(nPlan) // ∫ C_bh dt, volume fraction × s
  const ringLen = Math.ceil(TWA_WINDOW_S / interval) + 2
  const ring = Array.from({ length: ringLen }, () => new Float64Array(nPlan))
  const maxTwa = new Float64Array(nPlan)

  const k0 = m.bhK0, k1 = m.bhK1, wb = m.bhW
  const bhAt = (pp: number) => c[pp + nPlan * k0]! * (1 - wb) + c[pp + nPlan * k1]! * wb
  const probeAt = (q: number) => {
    const pr = m.probes[q]!
    let v = 0
    for (let a = 0; a < pr.cells.length; a++) v += c[pr.cells[a]!]! * pr.weights[a]!
    return v
  }

  // Events: release breakpoints and puffs; the stepper lands on them.
  const breaks = new Set<number>()
  for (const src of m.sources) for (const b of src.history.breakpoints) if (b > 0 && b < duration) breaks.add(b)
  const breakList = Float64Array.from([...breaks].sort((a, b) => a - b))
  const puffs = m.sources.flatMap((src) => src.history.puffs.filter((p) => p.t <= duration).map((p) => ({ cell: src.cell, t: p.t, v: p.volume })))
  const puffDone = new Uint8Array(puffs.length)
  const released = new Float64Array(m.sources.length)
  let releasedTotal = 0
  const returnGas = new Float64Array(m.returns.length)
  let removedVent = 0, removedExhaust = 0, removedDownflow = 0

  const applyPuffs = (t: number) => {
    for (let q = 0; q < puffs.length; q++) {
      if (puffDone[q] || puffs[q]!.t > t + 1e-9) continue
      c[puffs[q]!.cell] += puffs[q]!.v / vc
      releasedTotal += puffs[q]!.v
      puffDone[q] = 1
    }
  }
  let outIndex = 0
  const recordOutput = (t: number) => {
    const bh = breathing[outIndex]!, cm = columnMax[outIndex]!
    for (let pp = 0; pp < nPlan; pp++) {
      if (m.roomOfPlan[pp]! < 0) { bh[pp] = NaN; cm[pp] = NaN; continue }
      bh[pp] = bhAt(pp) * 1e6
      let mx = 0
      for (let k = 0; k < nz; k++) { const v = c[pp + nPlan * k]!; if (v > mx) mx = v }
      cm[pp] = mx * 1e6
    }
    for (let q = 0; q < m.probes.length; q++) probeSeries[q]![outIndex] = probeAt(q) * 1e6
    // Rolling 15-min TWA at the breathing height from the running integral, sampled at outputs.
    const slot = outIndex % ringLen
    ring[slot]!.set(integral)
    const tBack = t - TWA_WINDOW_S
    let back: Float64Array | null = null, back2: Float64Array | null = null, f = 0
    if (tBack > 0) {
      const kb = Math.floor(tBack / interval + 1e-9)
      f = (tBack - kb * interval) / interval
      back = ring[kb % ringLen]!
      back2 = f > 1e-9 ? ring[(kb + 1) % ringLen]! : back
    }
    for (let pp = 0; pp < nPlan; pp++) {
      const ib = back === null ? 0 : back[pp]! * (1 - f) + back2![pp]! * f
      const twa = (integral[pp]! - ib) / TWA_WINDOW_S
      if (twa > maxTwa[pp]!) maxTwa[pp] = twa
    }
    outIndex++
  }
  const observeStep = (tPrev: number, dt: number) => {
    for (let pp = 0; pp < nPlan; pp++) {
      if (m.roomOfPlan[pp]! < 0) continue
      const v = bhAt(pp), vp = bhPrev[pp]!
      integral[pp] += 0.5 * (v + vp) * dt
      if (v > peak[pp]!) peak[pp] = v
      let kc = crossed[pp]!
      while (kc < nThr && v >= thrFrac[kc]!) {
        const th = thrFrac[kc]!
        fronts[kc]![pp] = v > vp ? tPrev + (dt * (th - vp)) / (v - vp) : tPrev + dt
        kc++
      }
      crossed[pp] = kc
      bhPrev[pp] = v
    }
    for (let q = 0; q < m.probes.length; q++) {
      const v = probeAt(q), vp = probePrev[q]!
      if (v > probePeak[q]!) { probePeak[q] = v; probePeakT[q] = tPrev + dt }
      const first = probeFirst[q]!
      for (let k = 0; k < nThr; k++) {
        if (first[k] !== Infinity || v < thrFrac[k]!) continue
        first[k] = v > vp ? tPrev + (dt * (thrFrac[k]! - vp)) / (v - vp) : tPrev + dt
      }
      probePrev[q] = v
    }
  }

  const transport = (dt: number, step: number) => {
    // Cleanroom return: what left through the floor comes back through the ceiling, less the exhaust.
    for (let q = 0; q < m.returns.length; q++) {
      const rt = m.returns[q]!
      const out = returnGas[q]! * (1 - Math.exp((-rt.flow * dt) / rt.volume))
      returnGas[q] -= out
      removedDownflow += rt.exhaustFraction * out
      const add = ((1 - rt.exhaustFraction) * out) / (rt.topCells.length * vc)
      for (let a = 0; a < rt.topCells.length; a++) c[rt.topCells[a]!] += add
    }
    // Dilution and local exhaust: exact exponential decay over the step.
    let anyAch = false
    for (let r = 0; r < m.roomDecay.length; r++) if (m.roomDecay[r]! > 0) anyAch = true
    if (anyAch) {
      for (let pp = 0; pp < nPlan; pp++) {
        const r = m.roomOfPlan[pp]!
        if (r < 0) continue
        const k = m.roomDecay[r]!
        if (k === 0) continue
        const f = Math.exp(-k * dt)
        for (let kk = 0; kk < nz; kk++) {
          const p = pp + nPlan * kk
          const v = c[p]!
          c[p] = v * f
          removedVent += v * (1 - f) * vc
        }
      }
    }
    for (let a = 0; a < m.exhaustCells.length; a++) {
      const p = m.exhaustCells[a]!
      const v = c[p]!
      const f = Math.exp(-m.exhaustRates[a]! * dt)
      c[p] = v * f
      removedExhaust += v * (1 - f) * vc
    }
    if (explicit) {
      explicitTransportStep(m, c, scratch, dt)
      // Floor outflow leaves in the explicit update: collect it before swapping.
      for (let pp = 0; pp < nPlan; pp++) if (m.floorOut[pp]! > 0) addToReturn(pp, dt * m.floorOut[pp]! * c[pp]! * vc)
      c.set(scratch)
      return
    }
    // LOD: x, y, z sweeps, order reversed every other step so the splitting error does not drift one way.
    if (step % 2 === 0) {
      implicitSweepContiguous(c, m.fwdX, m.bwdX, scratch, dt, ny * nz, nx)
      implicitSweep(c, m.fwdY, m.bwdY, scratch, dt, nz, ny, nx, null)
      implicitSweep(c, m.fwdZ, m.bwdZ, scratch, dt, 1, nz, nPlan, m.floorOut)
    } else {
      implicitSweep(c, m.fwdZ, m.bwdZ, scratch, dt, 1, nz, nPlan, m.floorOut)
      implicitSweep(c, m.fwdY, m.bwdY, scratch, dt, nz, ny, nx, null)
      implicitSweepContiguous(c, m.fwdX, m.bwdX, scratch, dt, ny * nz, nx)
    }
    // Implicit floor outflow: rate × C(new) × dt, which is exactly what the z-sweep removed.
    for (let pp = 0; pp < nPlan; pp++) if (m.floorOut[pp]! > 0) addToReturn(pp, dt * m.floorOut[pp]! * c[pp]! * vc)
  }
  const returnOfRoom = new Int32Array(m.roomIds.length).fill(-1)
  m.returns.forEach((rt, q) => { returnOfRoom[rt.room] = q })
  const addToReturn = (pp: number, v: number) => { returnGas[returnOfRoom[m.roomOfPlan[pp]!]!] += v }

  const num = s.numerics
  const fixedDt = explicit ? 0.98 * explicitStableStep(m) : num.time_step_s
  const dtMax = explicit ? Infinity : num.max_time_step_s
  const dtInit = num.initial_time_step_s
  let dt = fixedDt ?? dtInit
  let dtLast = 0, haveHistory = false
  let t = 0, steps = 0, nextBreak = 0, minDt = Infinity, maxDt = 0
  let lastProgress = -1

  applyPuffs(0)
  for (let pp = 0; pp < nPlan; pp++) if (m.roomOfPlan[pp]! >= 0) bhPrev[pp] = bhAt(pp)
  for (let q = 0; q < m.probes.length; q++) probePrev[q] = probeAt(q)
  observeStep(0, 0)
  recordOutput(0)

  while (outIndex < nOut) {
    if (opts.signal?.cancelled) throw new SimulationCancelled()
    while (nextBreak < breakList.length && breakList[nextBreak]! <= t + 1e-9) nextBreak++
    const tEvent = Math.min(times[outIndex]!, nextBreak < breakList.length ? breakList[nextBreak]! : Infinity)
    let h = Math.min(fixedDt ?? dt, dtMax)
    const rem = tEvent - t
    if (rem <= h * 1.2) h = rem
    else if (rem < 2 * h) h = rem / 2
    const tNew = t + h
    c0.set(c)
    for (let q = 0; q < m.sources.length; q++) {
      const src = m.sources[q]!
      const v = src.history.cumulative(tNew)
      const add = v - released[q]!
      if (add > 0) { c[src.cell] += add / vc; releasedTotal += add; released[q] = v }
    }
    transport(h, steps)
    steps++
    if (h < minDt) minDt = h
    if (h > maxDt) maxDt = h
    const hitBreak = nextBreak < breakList.length && Math.abs(tNew - breakList[nextBreak]!) < 1e-9
    const tPrev = t
    t = Math.abs(tNew - tEvent) < 1e-9 ? tEvent : tNew
    // Accuracy control: implicit Euler's local error ≈ (h²/2)|C''|, C'' from two successive increments.
    if (fixedDt === undefined) {
      let num2 = 0, den = 0
      const ih = 1 / h, ihl = dtLast > 0 ? 1 / dtLast : 0
      for (let p = 0; p < n; p++) {
        const d = c[p]! - c0[p]!
        num2 += Math.abs(d * ih - dPrev[p]! * ihl)
        den += c[p]!
        dPrev[p] = d
      }
      if (haveHistory && den > 0) {
        const err = ((h * h) / (h + dtLast)) * (num2 / den)
        const factor = err > 0 ? 0.9 * Math.sqrt(num.tolerance / err) : 1.5
        dt = h * Math.min(1.5, Math.max(0.5, factor))
      } else dt = Math.min(h * 1.5, dtMax)
      dtLast = h
      haveHistory = true
    } else {
      for (let p = 0; p < n; p++) dPrev[p] = c[p]! - c0[p]!
    }
    applyPuffs(t)
    if (hitBreak) { dt = dtInit; haveHistory = false; dtLast = 0 }
    observeStep(tPrev, h)
    if (Math.abs(t - times[outIndex]!) < 1e-9) recordOutput(t)
    const frac = t / duration
    if (opts.onProgress && frac - lastProgress >= 0.01) { opts.onProgress(Math.min(frac, 1)); lastProgress = frac }
  }

  let inAir = 0
  for (let p = 0; p < n; p++) inAir += c[p]!
  inAir *= vc
  let inReturn = 0
  for (let q = 0; q < returnGas.length; q++) inReturn += returnGas[q]!
  const removed = removedVent + removedExhaust + removedDownflow
  const totalAir = inAir + inReturn

  // Probe summaries from the output series.
  const probes: ProbeResult[] = m.probes.map((pr, q) => {
    const series = probeSeries[q]!
    let best = 0
    for (let k = 0; k < nOut; k++) {
      // Trapezoid integral over the trailing 15 min (zero before t = 0), window clipped to the samples.
      let acc = 0
      const tEnd = times[k]!, tStart = tEnd - TWA_WINDOW_S
      for (let j = k; j > 0 && times[j]! > tStart; j--) {
        const a = Math.max(times[j - 1]!, tStart)
        const fa = series[j - 1]! + ((series[j]! - series[j - 1]!) * (a - times[j - 1]!)) / interval
        acc += 0.5 * (fa + series[j]!) * (times[j]! - a)
      }
      best = Math.max(best, acc / TWA_WINDOW_S)
    }
    return {
      id: pr.id, ppm: series, peak_ppm: probePeak[q]! * 1e6, peak_time_s: probePeakT[q]!, max_twa15_ppm: best,
      first_exceed_s: Array.from(probeFirst[q]!, (v) => (Number.isFinite(v) ? v : null)),
    }
  })
  const nan = (a: Float64Array, scale: number) => {
    const out = new Float32Array(nPlan)
    for (let pp = 0; pp < nPlan; pp++) out[pp] = m.roomOfPlan[pp]! < 0 ? NaN : a[pp]! * scale
    return out
  }
  for (const f of fronts) for (let pp = 0; pp < nPlan; pp++) if (m.roomOfPlan[pp]! < 0) f[pp] = NaN

  return {
    grid: { nx, ny, nz, cell_m: m.h, layer_m: m.dz, origin_m: [m.x0, m.y0], room_ids: m.roomIds, room_of_cell: m.roomOfPlan },
    times_s: times, thresholds, probes,
    breathing_ppm: breathing, column_max_ppm: columnMax, fronts_s: fronts,
    peak_ppm: nan(peak, 1e6), max_twa15_ppm: nan(maxTwa, 1e6),
    mass_balance: {
      released_m3: releasedTotal, in_air_m3: totalAir, in_return_m3: inReturn, removed_m3: removed,
      removed_by: { ventilation_m3: removedVent, local_exhaust_m3: removedExhaust, downflow_exhaust_m3: removedDownflow },
      closure_error: releasedTotal > 0 ? Math.abs(releasedTotal - totalAir - removed) / releasedTotal : 0,
    },
    diffusivity_m2_s: m.diffusivity, diffusivity_basis: m.diffusivityBasis, gas,
    stats: { cells: m.airCells, grid_cells: n, steps, wall_s: (now() - t0Wall) / 1000, min_dt_s: minDt, max_dt_s: maxDt, solver: explicit ? 'explicit-baseline (FTCS)' : 'implicit LOD (backward Euler, Thomas)' },
  }
}
