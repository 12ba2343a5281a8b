import type { Gas } from '../gases/gas-schema'
import { ScenarioError, SimulationCancelled } from './errors'
import { applyOperator, explicitStableStep, outgoingRates } from './operator'
import { FACTOR_CACHE_LEVELS, factorSweep, solveFactored, type SweepFactor } from './factored-sweep'
import { fusedRhsSolveXY } from './fused-step'
import { accountSinks, addColumnMultiple, cellRuns, defectSums, finishStep, runDot, runSum, scaleField, snapshotPlan, type RateWeights, type RoomSums } from './step-kernels'
import { buildModel, type Model } from './model'
import { addDownflowCorrection, downflowColumns } from './tvd'
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
  /** Compute the plan fields: per-output snapshots (`breathing_ppm`, `column_max_ppm`) and the
   * per-cell fronts, peaks and 15-minute TWA. false leaves them all empty and skips their passes at
   * every step and output (the CLI without --fields prints none of them). Probes, the mass balance
   * and the stats are unaffected. @default true */
  planFields?: boolean
  /** Also run a companion on a grid twice as coarse (cells 2h, half the layers; about 1/8 of the cells)
   * and report per probe the largest difference to it (`grid_sensitivity_pct`, `error_estimate.grid`).
   * Off by default: it costs about 10–20 % more. @default false */
  gridCheck?: boolean
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
  /** With `gridCheck`: max over the outputs of |this run − the 2h companion|, % of this probe's peak
   * (null without the check or when the coarse grid cannot represent the plan). */
  grid_sensitivity_pct: number | null
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
    in_air_m3: number
    removed_m3: number
    removed_by: { ventilation_m3: number; local_exhaust_m3: number; downflow_exhaust_m3: number }
    /** |released − in_air − removed| / released */
    closure_error: number
  }
  diffusivity_m2_s: number
  diffusivity_basis: string
  gas: Gas
  /** Grid sensitivity from the coarse companion (`gridCheck`), null when not run. */
  error_estimate: { grid: { method: string; coarse_cell_m: number; coarse_layers: number; worst_probe_pct: number | null; note?: string } | null }
  /** How the time-stepping error was controlled. */
  error_control: {
    method: string
    /** Local tolerance of the h³C''' estimate and of the trapezoidal defect (relative to a room's gas); null for fixed steps. */
    tolerance: number | null
    defect_tolerance: number | null
    fixed_step_s: number | null
  }
  stats: { cells: number; grid_cells: number; steps: number; wall_s: number; min_dt_s: number; max_dt_s: number; clipped_m3: number; solver: string }
}

const TWA_WINDOW_S = 900
/**
 * A room's local error enters the step control once it holds this share of the most gas airborne so
 * far; below it a room's front is a trace whose relative error does not set the worst probe error.
 * 1e-3 on every engine fixture (worst probe error against a 0.5 s reference: benchmark 0.48 %, cleanroom
 * 0.89 %, two labs 0.65 %). A larger share saves steps on the benchmark (5e-3: 139 instead of 156 at the
 * same error) but not elsewhere: the cleanroom fixture rose to 3.2 % and the two labs to 1.2 %.
 */
const ROOM_SHARE_CONTROLLED = 1e-3
/**
 * The trapezoidal defect (first order where backward Euler acts) is held to this multiple of the
 * tolerance: its l1 norm counts cell-to-cell redistribution near a point source that diffusion damps
 * within a few steps. 8 keeps every probe of the engine fixtures and of the generated scenarios of
 * tests/engine/step-control.test.ts within 0.85 % of a 0.25–0.5 s fixed-step run (4: 0.64 % at 1.2× the
 * steps; 16: the cleanroom downflow case 1.02 %).
 */
const DEFECT_TOL_FACTOR = 8

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
  const result = run(s, gas, m, opts, t0Wall, now)
  if (opts.gridCheck) gridCompanion(s, gas, result, opts)
  return result
}

/**
 * The coarse companion of `gridCheck`: same scenario on cells of 2h and half the layers (at least 1),
 * same step control. The difference is a grid sensitivity, not a bound: where the results converge,
 * the fine run's grid error is usually below it (a factor 3 below for second-order convergence,
 * Richardson), but near a point source convergence is not monotone (tests/engine/sources.test.ts).
 */
function gridCompanion(s: Scenario, gas: Gas, result: SimulationResult, opts: SimulateOptions): void {
  const coarse: Scenario = { ...s, grid: { cell_m: 2 * s.grid.cell_m, layers: Math.max(1, Math.round(s.grid.layers / 2)) } }
  const method = 'max over outputs of |C(h) − C(2h)| / peak, companion on cells of 2h and half the layers'
  let r: SimulationResult
  try {
    r = run(coarse, gas, buildModel(coarse, gas), { planFields: false, signal: opts.signal }, 0, () => 0)
  } catch (e) {
    if (!(e instanceof ScenarioError)) throw e
    result.error_estimate.grid = { method, coarse_cell_m: coarse.grid.cell_m, coarse_layers: coarse.grid.layers, worst_probe_pct: null, note: `the coarse grid cannot represent the plan (${e.message})` }
    return
  }
  let worst = 0
  result.probes.forEach((p, q) => {
    const c = r.probes[q]!.ppm
    let peak = 0, diff = 0
    for (let k = 0; k < p.ppm.length; k++) { peak = Math.max(peak, p.ppm[k]!); diff = Math.max(diff, Math.abs(p.ppm[k]! - c[k]!)) }
    p.grid_sensitivity_pct = peak > 0 ? (100 * diff) / peak : 0
    worst = Math.max(worst, p.grid_sensitivity_pct)
  })
  result.error_estimate.grid = { method, coarse_cell_m: coarse.grid.cell_m, coarse_layers: coarse.grid.layers, worst_probe_pct: worst }
}

function isValid(x: unknown): x is ValidScenario {
  return typeof x === 'object' && x !== null && 'scenario' in x && 'gas' in x && !('format' in x)
}

function run(s: Scenario, gas: Gas, m: Model, opts: SimulateOptions, t0Wall: number, now: () => number): SimulationResult {
  const { nx, ny, nz, cellVolume: vc } = m
  const nPlan = nx * ny, n = nPlan * nz
  const explicit = opts.solver === 'explicit-baseline'
  const c = new Float64Array(n)
  // Increment history (ΔC of the last two steps): only for the error estimate and output interpolation.
  // Two buffers swapped after every step (finishStep overwrites the older one with the new increment).
  let dPrev = new Float32Array(n)
  let dPrev2 = new Float32Array(n)

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
  const fields = opts.planFields !== false
  const nField = fields ? nPlan : 0 // plan-field arrays are empty when they are not computed
  const breathing: Float32Array[] = [], columnMax: Float32Array[] = []
  if (fields) for (let k = 0; k < nOut; k++) { breathing.push(new Float32Array(nPlan)); columnMax.push(new Float32Array(nPlan)) }
  const bhPrev = new Float64Array(nField)
  const crossed = new Uint8Array(nField)
  const fronts = fields ? Array.from({ length: nThr }, () => new Float32Array(nPlan).fill(Infinity)) : []
  const peak = new Float64Array(nField)
  const integral = new Float64Array(nField) // ∫ C_bh dt, volume fraction × s
  const ringLen = Math.ceil(TWA_WINDOW_S / interval) + 2
  const ring = Array.from({ length: fields ? ringLen : 0 }, () => new Float64Array(nPlan))
  const maxTwa = new Float64Array(nField)

  const k0 = m.bhK0, k1 = m.bhK1, wb = m.bhW
  const bhAt = (pp: number) => c[pp + nPlan * k0]! * (1 - wb) + c[pp + nPlan * k1]! * wb
  const probeAt = (q: number) => {
    const pr = m.probes[q]!
    let v = 0
    for (let a = 0; a < pr.cells.length; a++) v += c[pr.cells[a]!]! * pr.weights[a]!
    return v
  }

  // Events the stepper lands on: release breakpoints (the rate jumps, or a puff: restart from a small
  // step) and kinks (only the rate's slope jumps: no restart). A time that is both is a breakpoint.
  const events = new Map<number, 'break' | 'kink'>()
  for (const src of m.sources) for (const b of src.history.kinks) if (b > 0 && b < duration) events.set(b, 'kink')
  for (const src of m.sources) for (const b of src.history.breakpoints) if (b > 0 && b < duration) events.set(b, 'break')
  const breakList = Float64Array.from([...events.keys()].sort((a, b) => a - b))
  const isKink = Uint8Array.from(breakList, (b) => (events.get(b) === 'kink' ? 1 : 0))
  const puffs = m.sources.flatMap((src) => src.history.puffs.filter((p) => p.t <= duration).map((p) => ({ cells: src.cells, weights: src.weights, t: p.t, v: p.volume })))
  const puffDone = new Uint8Array(puffs.length)
  const released = new Float64Array(m.sources.length)
  const sourceAdd = new Float64Array(m.sources.length)
  let releasedTotal = 0
  let removedVent = 0, removedExhaust = 0, removedDownflow = 0

  /** Add the puffs due by t; true when one was added. */
  const applyPuffs = (t: number) => {
    let added = false
    for (let q = 0; q < puffs.length; q++) {
      if (puffDone[q] || puffs[q]!.t > t + 1e-9) continue
      const pf = puffs[q]!
      for (let a = 0; a < pf.cells.length; a++) c[pf.cells[a]!] += (pf.v * pf.weights[a]!) / vc
      releasedTotal += puffs[q]!.v
      puffDone[q] = 1
      added = true
    }
    return added
  }
  let outIndex = 0
  const integralPrev = new Float64Array(nField)
  /**
   * Record output `outIndex` at time t, a fraction θ through the last step of length h: quadratic
   * interpolation through the last three states (linear when h1, the step before, is unknown).
   */
  const recordOutput = (t: number, theta: number, h: number, h1: number) => {
    const g = h1 > 0 ? (theta * h) / (h + h1) : 0
    const alpha = (1 - theta) * (1 + g), beta = h1 > 0 ? ((1 - theta) * g * h) / h1 : 0
    const at = (p: number) => { const v = c[p]! - alpha * dPrev[p]! + beta * dPrev2[p]!; return v > 0 ? v : 0 }
    if (fields) snapshotPlan(c, dPrev, dPrev2, alpha, beta, m.roomOfPlan, nPlan, nz, k0, k1, wb, breathing[outIndex]!, columnMax[outIndex]!)
    for (let q = 0; q < m.probes.length; q++) {
      const pr = m.probes[q]!
      let v = 0
      for (let a = 0; a < pr.cells.length; a++) v += at(pr.cells[a]!) * pr.weights[a]!
      probeSeries[q]![outIndex] = v * 1e6
    }
    if (fields) recordTwa(t, theta, outIndex)
    outIndex++
  }
  /** Rolling 15-min TWA at the breathing height from the running integral, sampled at outputs. */
  const recordTwa = (t: number, theta: number, k: number) => {
    const slot = ring[k % ringLen]!
    for (let pp = 0; pp < nPlan; pp++) slot[pp] = integralPrev[pp]! + theta * (integral[pp]! - integralPrev[pp]!)
    const tBack = t - TWA_WINDOW_S
    let b1: Float64Array | null = null, b2: Float64Array | null = null, f = 0
    if (tBack > 0) {
      const kb = Math.floor(tBack / interval + 1e-9)
      f = (tBack - kb * interval) / interval
      b1 = ring[kb % ringLen]!
      b2 = f > 1e-9 ? ring[(kb + 1) % ringLen]! : b1
    }
    for (let pp = 0; pp < nPlan; pp++) {
      const ib = b1 === null ? 0 : b1[pp]! * (1 - f) + b2![pp]! * f
      const twa = (slot[pp]! - ib) / TWA_WINDOW_S
      if (twa > maxTwa[pp]!) maxTwa[pp] = twa
    }
  }
  const observeStep = (tPrev: number, dt: number) => {
    integralPrev.set(integral)
    for (let pp = 0; pp < nField; pp++) {
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

  // Per-cell first-order sinks: dilution ventilation, local exhaust and (bottom layer) floor outflow.
  // Dilution is the same on every layer: one layer, copied (ventOfCell), then the floor outflow on the
  // bottom layer and the exhausts on top of it (sink).
  const ventOfCell = new Float64Array(n)
  for (let pp = 0; pp < nPlan; pp++) {
    const r = m.roomOfPlan[pp]!
    if (r >= 0) ventOfCell[pp] = m.roomDecay[r]!
  }
  for (let k = 1; k < nz; k++) ventOfCell.copyWithin(k * nPlan, 0, nPlan)
  const sink = ventOfCell.slice()
  for (let pp = 0; pp < nPlan; pp++) if (m.roomOfPlan[pp]! >= 0) sink[pp] += m.floorOut[pp]!
  for (let a = 0; a < m.exhaustCells.length; a++) sink[m.exhaustCells[a]!] += m.exhaustRates[a]!
  const exhaustFractionOfRoom = new Float64Array(m.roomIds.length)
  for (const rt of m.returns) exhaustFractionOfRoom[rt.room] = rt.exhaustFraction
  const rhs = new Float64Array(n)
  let clipped = 0

  const sinkAcc = new Float64Array(3)
  const account = (cOld: Float64Array, d: Float64Array | null, dt: number) => {
    sinkAcc[0] = 0; sinkAcc[1] = 0; sinkAcc[2] = 0
    accountSinks(cOld, d, dt, vc, nPlan, nz, d === null, m.roomOfPlan, m.roomDecay, m.floorOut, sink, m.exhaustCells, m.exhaustRates, exhaustFractionOfRoom, sinkAcc)
    removedVent += sinkAcc[0]!
    removedExhaust += sinkAcc[1]!
    removedDownflow += sinkAcc[2]!
  }
  /** Weight of the new value in a cell's sink term: Crank-Nicolson where k·dt ≤ 1, backward Euler
   * where the sink is stiff (a strong exhaust), so it can never overshoot (same rule in accountSinks). */
  const sinkTheta = (k: number, dt: number) => (k * dt <= 1 ? 0.5 : 1)
  /** Sources and the cleanroom return supply, as volume fractions added over the step (into `target`). */
  const addInputs = (target: Float64Array, dt: number, tNew: number) => {
    for (let q = 0; q < m.sources.length; q++) {
      const src = m.sources[q]!
      const v = src.history.cumulative(tNew)
      const add = v - released[q]!
      if (add > 0) {
        for (let a = 0; a < src.cells.length; a++) target[src.cells[a]!] += (add * src.weights[a]!) / vc
        releasedTotal += add; released[q] = v
      }
    }
    // What leaves through the floor comes back through the ceiling filters, less the exhausted
    // fraction, spread evenly over the room's top layer (explicit part of the delta form).
    for (let q = 0; q < m.returns.length; q++) {
      const rt = m.returns[q]!
      const add = (dt * (1 - rt.exhaustFraction) * rt.rate * runSum(c, bottomRuns[q]!)) / rt.bottomCells.length
      for (let a = 0; a < rt.topCells.length; a++) target[rt.topCells[a]!] += add
    }
  }
  const out = outgoingRates(m, sink)
  // The same inputs in sparse form for the fused implicit kernel: entry e adds inAmount[inSlot[e]] to
  // cell inCell[e] (sources first, then the returns' top cells, as addInputs applies them), grouped by
  // x-row in CSR form (inRowStart) with the order inside each row kept.
  // One input slot per (source, cell) pair of the trilinear spread: entry e of source srcEntry[e].
  const srcEntryCell: number[] = [], srcEntryWeight: number[] = [], srcEntryOf: number[] = []
  m.sources.forEach((src, q) => src.cells.forEach((p, a) => { srcEntryCell.push(p); srcEntryWeight.push(src.weights[a]!); srcEntryOf.push(q) }))
  const nSrc = srcEntryCell.length
  const inAmount = new Float64Array(nSrc + m.returns.length)
  const inList: [number, number][] = srcEntryCell.map((p, e) => [p, e])
  m.returns.forEach((rt, q) => { for (const p of rt.topCells) inList.push([p, nSrc + q]) })
  const nRows = ny * nz
  const inRowStart = new Int32Array(nRows + 1)
  for (const [p] of inList) inRowStart[Math.floor(p / nx) + 1]++
  for (let row = 0; row < nRows; row++) inRowStart[row + 1] += inRowStart[row]!
  const inCell = new Int32Array(inList.length), inSlot = new Int32Array(inList.length)
  {
    const fill = inRowStart.slice(0, nRows)
    for (const [p, slot] of inList) { const e = fill[Math.floor(p / nx)]!++; inCell[e] = p; inSlot[e] = slot }
  }
  /** addInputs for the fused kernel: the per-source and per-return amounts of this step. */
  const inputAmounts = (dt: number, tNew: number) => {
    for (let e = 0; e < nSrc; e++) inAmount[e] = 0
    for (let q = 0; q < m.sources.length; q++) {
      const src = m.sources[q]!
      const v = src.history.cumulative(tNew)
      const add = v - released[q]!
      if (add > 0) { sourceAdd[q] = add / vc; releasedTotal += add; released[q] = v } else sourceAdd[q] = 0
    }
    for (let e = 0; e < nSrc; e++) inAmount[e] = sourceAdd[srcEntryOf[e]!]! * srcEntryWeight[e]!
    for (let q = 0; q < m.returns.length; q++) {
      const rt = m.returns[q]!
      const sum = runSum(c, bottomRuns[q]!)
      inAmount[nSrc + q] = (dt * (1 - rt.exhaustFraction) * rt.rate * sum) / rt.bottomCells.length
    }
  }
  /**
   * The return makes the last factor T − u vᵀ per cleanroom: u marks its top cells, v_q = Θ_q dt (1−f)
   * (w/dz) / N on its N bottom cells (Θ as for the floor outflow, so the net floor sink is exactly f·w/dz).
   * Precompute z = T⁻¹u and 1 − vᵀz for the Sherman-Morrison update of each solve.
   */
  // z is non-zero only in the room's columns (the z factor couples cells of one column): solved in a
  // shared scratch field, kept compactly as z[k·nb + a] for column a, and the scratch cleared again.
  const zScratch = new Float64Array(n)
  const bottomRuns = m.returns.map((rt) => cellRuns(rt.bottomCells))
  const returnCorrection = (rt: Model['returns'][number], fz: SweepFactor, h: number) => {
    const bottom = rt.bottomCells, nb = bottom.length
    for (let a = 0; a < rt.topCells.length; a++) zScratch[rt.topCells[a]!] = 1
    // The whole z solve is faster than the room's columns alone; the other columns stay exactly 0.
    solveFactored(zScratch, fz)
    const z = new Float64Array(nb * nz)
    for (let k = 0; k < nz; k++) {
      const off = nPlan * k
      for (let a = 0; a < nb; a++) { const p = bottom[a]! + off; z[k * nb + a] = zScratch[p]!; zScratch[p] = 0 }
    }
    const v = new Float64Array(nb)
    let vz = 0
    for (let a = 0; a < nb; a++) {
      const p = bottom[a]!
      v[a] = (sinkTheta(sink[p]!, h) * h * (1 - rt.exhaustFraction) * rt.rate) / nb
      vz += v[a]! * z[a]!
    }
    return { z, v, denom: 1 - vz }
  }
  // TVD correction of the downflow (tvd.ts), by deferred correction: a rate field over the downflow
  // columns, recomputed from the current state before each step.
  const tvdCols = downflowColumns(m, Float64Array.from(s.rooms, (r) => r.ventilation.downflow?.speed_m_s ?? 0))
  const tvdField = tvdCols.plan.length > 0 ? new Float64Array(n) : null
  const downflowCorrection = (): Float64Array | null => {
    if (tvdField === null) return null
    for (let a = 0; a < tvdCols.plan.length; a++) for (let k = 0; k < nz; k++) tvdField[tvdCols.plan[a]! + nPlan * k] = 0
    addDownflowCorrection(c, tvdCols, nPlan, nz, tvdField, 1)
    return tvdField
  }
  const returnFactors = new Map<SweepFactor[], { z: Float64Array; v: Float64Array; denom: number }[]>()
  // The source-free operator L c = −(A + K)c + U c at the start and the end of the step, for the
  // trapezoidal defect of the step control (defectSums). One operator pass per step.
  let lOld = explicit ? new Float64Array(0) : new Float64Array(n)
  let lNew = explicit ? new Float64Array(0) : new Float64Array(n)
  const evalL = (target: Float64Array) => {
    applyOperator(m, c, out, target, 1)
    if (tvdCols.plan.length > 0) addDownflowCorrection(c, tvdCols, nPlan, nz, target, 1)
    for (let q = 0; q < m.returns.length; q++) {
      const rt = m.returns[q]!
      const add = ((1 - rt.exhaustFraction) * rt.rate * runSum(c, bottomRuns[q]!)) / rt.bottomCells.length
      for (let a = 0; a < rt.topCells.length; a++) target[rt.topCells[a]!] += add
    }
  }
  // Source cells (distinct) and, per source, its slot among them: their input is part of ΔC, not of L.
  const srcCellList = [...new Set(srcEntryCell)]
  const srcCells = Int32Array.from(srcCellList)
  const srcSlot = Int32Array.from(srcEntryCell, (p) => srcCellList.indexOf(p))
  const srcIn = new Float64Array(srcCells.length)
  const roomDef = new Float64Array(m.roomIds.length)
  /** roomDef ← per-room trapezoidal defect of the step just taken (ΔC in d). */
  const stepDefect = (d: Float64Array, h: number) => {
    roomDef.fill(0)
    defectSums(d, lOld, lNew, h, roomOfCell, roomDef)
    srcIn.fill(0)
    for (let q = 0; q < nSrc; q++) srcIn[srcSlot[q]!] += inAmount[q]!
    for (let a = 0; a < srcCells.length; a++) {
      const p = srcCells[a]!, r = roomOfCell[p]!
      const e = d[p]! - 0.5 * h * (lOld[p]! + lNew[p]!)
      if (r >= 0) roomDef[r] += Math.abs(e - srcIn[a]!) - Math.abs(e)
    }
  }
  const theta = s.numerics.theta
  // Implicit weights per face: θ for diffusive faces, 1 (backward Euler) for faces that carry air
  // (downflow, transfer air), where Crank-Nicolson would ring at Courant numbers above 1.
  // An advective face whose larger coefficient × h is at most 1 is Crank-Nicolson too (second order;
  // its explicit half stays positive): the weights depend on h only through how many advective faces
  // qualify, so one weight set is kept per count (a handful per run).
  const advRates = explicit ? new Float64Array(0) : advectiveRates([m.fwdX, m.fwdY, m.fwdZ], [m.bwdX, m.bwdY, m.bwdZ])
  type Weights = { fwd: Float32Array; bwd: Float32Array }[]
  const weightSets = new Map<number, Weights>()
  const weightsFor = (h: number): Weights => {
    let lo = 0, hi = advRates.length // count of rates with rate·h ≤ 1 (advRates ascending)
    while (lo < hi) { const mid = (lo + hi) >> 1; if (advRates[mid]! * h <= 1) lo = mid + 1; else hi = mid }
    const limit = lo === 0 ? 0 : advRates[lo - 1]!
    let w = weightSets.get(lo)
    if (!w) {
      w = [implicitWeights(m.fwdX, m.bwdX, theta, limit), implicitWeights(m.fwdY, m.bwdY, theta, limit), implicitWeights(m.fwdZ, m.bwdZ, theta, limit)]
      weightSets.set(lo, w)
    }
    return w
  }
  const sinkScratch = new Float64Array(n)
  const scaledSink = (h: number) => {
    for (let p = 0; p < n; p++) sinkScratch[p] = sinkTheta(sink[p]!, h) * h * sink[p]!
    return sinkScratch
  }
  const factors = new Map<number, SweepFactor[]>()
  let oddFactor: SweepFactor[] | null = null
  /**
   * Factorisations of the three sweeps for step h: cached per ladder level (at most
   * FACTOR_CACHE_LEVELS, least recently used evicted and its arrays reused), recomputed for odd steps.
   */
  const factorsFor = (h: number, level: number): SweepFactor[] => {
    const cached = level >= 0 ? factors.get(level) : undefined
    if (cached) {
      factors.delete(level) // re-insert: Map order is the recency order
      factors.set(level, cached)
      return cached
    }
    let into: SweepFactor[] | undefined
    if (level < 0) into = oddFactor ?? undefined
    else if (factors.size >= FACTOR_CACHE_LEVELS) {
      const [oldest, arrays] = factors.entries().next().value as [number, SweepFactor[]]
      factors.delete(oldest)
      into = arrays
    }
    if (into) returnFactors.delete(into)
    const [wX, wY, wZ] = weightsFor(h) as [Weights[number], Weights[number], Weights[number]]
    const f = [
      factorSweep(wX.fwd, wX.bwd, h, ny * nz, nx, 1, null, into?.[0]),
      factorSweep(wY.fwd, wY.bwd, h, nz, ny, nx, null, into?.[1]),
      factorSweep(wZ.fwd, wZ.bwd, h, 1, nz, nPlan, scaledSink(h), into?.[2]),
    ]
    if (level >= 0) factors.set(level, f)
    else oddFactor = f
    returnFactors.set(f, m.returns.map((rt) => returnCorrection(rt, f[2]!, h)))
    return f
  }

  const transport = (dt: number, tNew: number, level: number) => {
    const extra = downflowCorrection()
    if (explicit) {
      account(c, null, dt)
      applyOperator(m, c, out, rhs, dt)
      addInputs(rhs, dt, tNew)
      if (extra !== null) for (let p = 0; p < n; p++) rhs[p] += dt * extra[p]!
      return
    }
    // Delta-form approximate factorisation (Douglas):
    //   (I + θdt Ax)(I + θdt Ay)(I + θdt Az + dt Θ K) ΔC = dt (S − (A + K) C)
    // θ = 1/2 (Crank-Nicolson) for transport, Θ per cell for sinks (see sinkTheta). It keeps the exact
    // discrete steady state, and the sink factor is solved last so that the removal is exactly
    // dt·K·((1−Θ)C + Θ C_new) and mass closes to round-off.
    // Right-hand side and the x and y solves fused layer by layer (the same arithmetic as
    // applyOperator + addInputs + solveFactored ×2), then the z solve over all columns.
    inputAmounts(dt, tNew)
    const f = factorsFor(dt, level)
    fusedRhsSolveXY(m, c, out, rhs, dt, f[0]!, f[1]!, inRowStart, inCell, inSlot, inAmount, extra)
    solveFactored(rhs, f[2]!)
    // Sherman-Morrison for the rank-one return coupling of each cleanroom (bottom layer -> top layer).
    const corr = returnFactors.get(f)!
    for (let q = 0; q < m.returns.length; q++) {
      const rt = m.returns[q]!, rc = corr[q]!
      const runs = bottomRuns[q]!
      addColumnMultiple(rhs, runs, rt.bottomCells.length, rc.z, runDot(rc.v, rhs, runs) / rc.denom, nPlan, nz)
    }
  }

  const nRooms = m.roomIds.length
  const roomOfCell = new Int16Array(n)
  for (let k = 0; k < nz; k++) roomOfCell.set(m.roomOfPlan, k * nPlan)
  const roomSums: RoomSums = { err: new Float64Array(nRooms), mass: new Float64Array(nRooms), old: new Float64Array(nRooms), delta: new Float64Array(nRooms) }
  const roomErr = roomSums.err, roomMass = roomSums.mass
  // Ventilation removal of an implicit step, Σ k_vent·((1−Θ)C + ΘC_new)·dt·V: per room from the room
  // sums with Θ = 1/2, plus the other half of ΔC in the cells where the sink is stiff (Θ = 1). Those
  // are cells with an exhaust or a floor outflow on top of the dilution, or every ventilated cell once
  // k_vent·dt > 1 (steps far above 3600/ACH).
  const stiffSet = new Set<number>()
  for (let pp = 0; pp < nPlan; pp++) if (m.floorOut[pp]! > 0) stiffSet.add(pp)
  for (let a = 0; a < m.exhaustCells.length; a++) stiffSet.add(m.exhaustCells[a]!)
  const stiffCandidates = Int32Array.from([...stiffSet].filter((p) => ventOfCell[p]! > 0 && sink[p]! > ventOfCell[p]!)).sort()
  let maxVent = 0
  for (let r = 0; r < nRooms; r++) maxVent = Math.max(maxVent, m.roomDecay[r]!)
  const ventRemoval = (d: Float64Array, h: number) => {
    let v = 0
    for (let r = 0; r < nRooms; r++) v += m.roomDecay[r]! * (roomSums.old[r]! + 0.5 * roomSums.delta[r]!)
    if (maxVent * h > 1) {
      for (let p = 0; p < n; p++) if (ventOfCell[p]! > 0 && sink[p]! * h > 1) v += 0.5 * ventOfCell[p]! * d[p]!
    } else {
      for (let a = 0; a < stiffCandidates.length; a++) {
        const p = stiffCandidates[a]!
        if (sink[p]! * h > 1) v += 0.5 * ventOfCell[p]! * d[p]!
      }
    }
    return v * h * vc
  }
  const rateWeights: RateWeights = { ih: 0, ih1: 0, ih2: 0, w1: 0, w2: 0, w3: 0 }
  const pair = new Float64Array(3)
  const num = s.numerics
  const fixedDt = explicit ? 0.98 * explicitStableStep(m, sink) : num.time_step_s
  // Step ladder: L0 divides the output interval, levels halve it, so aligned steps land on outputs
  // and their factorisations are reused.
  // Steps may be longer than the output interval (outputs are then interpolated in time within the step).
  const dtCap = num.max_time_step_s
  const L0 = fixedDt ?? (dtCap >= interval ? interval * 2 ** Math.floor(Math.log2(dtCap / interval) + 1e-9) : interval / Math.ceil(interval / dtCap - 1e-9))
  const MAX_LEVEL = 30
  const levelFor = (dtWanted: number) => Math.min(MAX_LEVEL, Math.max(0, Math.ceil(Math.log2(L0 / dtWanted) - 1e-9)))
  const initLevel = fixedDt !== undefined ? 0 : levelFor(num.initial_time_step_s)
  // After a puff the control restarts two levels lower (a quarter of the initial step): Crank-Nicolson
  // rings on a point of gas, and the first steps, taken before any estimate exists, left a 1.3 % error
  // at the peak of a probe 1.5 m away with 2 s (generated scenario 1201 of step-control.test.ts;
  // 0.1 % with 0.5 s). Later steps grow as the estimates allow.
  const puffLevel = fixedDt !== undefined ? 0 : Math.min(MAX_LEVEL, initLevel + 2)
  let level = initLevel
  let dtLast = 0, dtLast2 = 0, histSteps = 0, peakAirborne = 0, hPrevStep = 0
  let t = 0, steps = 0, nextBreak = 0, minDt = Infinity, maxDt = 0
  let lastProgress = -1

  // After a puff (a point of gas: the roughest start there is) the first steps, taken before the
  // error estimate exists, keep the initial step instead of doubling it: doubling blindly from a
  // puff put 1.2 % errors 1 m away at the first output of the format example.
  let puffStart = applyPuffs(0)
  if (puffStart) level = puffLevel
  if (!explicit) evalL(lOld)
  for (let pp = 0; pp < nField; pp++) if (m.roomOfPlan[pp]! >= 0) bhPrev[pp] = bhAt(pp)
  for (let q = 0; q < m.probes.length; q++) probePrev[q] = probeAt(q)
  observeStep(0, 0)
  recordOutput(0, 1, 0, 0)

  while (outIndex < nOut) {
    if (opts.signal?.cancelled) throw new SimulationCancelled()
    while (nextBreak < breakList.length && breakList[nextBreak]! <= t + 1e-9) nextBreak++
    const tEvent = Math.min(duration, nextBreak < breakList.length ? breakList[nextBreak]! : Infinity)
    let h = L0 / 2 ** level
    let stepLevel = explicit ? -1 : level
    const rem = tEvent - t
    if (rem <= h * (1 + 1e-9)) {
      // Land exactly on the event; reuse a cached level when the remainder is one of them.
      const lv = Math.round(Math.log2(L0 / rem))
      stepLevel = !explicit && lv >= 0 && lv <= MAX_LEVEL && Math.abs(L0 / 2 ** lv - rem) <= 1e-9 * rem ? lv : -1
      h = stepLevel >= 0 ? L0 / 2 ** stepLevel : rem
    }
    const tNew = t + h
    const hBefore = hPrevStep
    transport(h, tNew, stepLevel)
    if (!explicit) account(c, rhs, h)
    // New field, clipping and the accuracy estimate in one pass. rhs holds ΔC.
    // Third derivative from three successive step rates (midpoint divided differences): Crank-Nicolson's
    // local error is about h^3 |C'''| / 12.
    const h1 = dtLast, h2 = dtLast2
    let wt: RateWeights | null = null
    if (!explicit && histSteps >= 2) {
      wt = rateWeights
      wt.ih = 1 / h; wt.ih1 = 1 / h1; wt.ih2 = 1 / h2
      wt.w1 = 2 / (h + h1); wt.w2 = 2 / (h1 + h2); wt.w3 = 4 / (h + 2 * h1 + h2)
    }
    finishStep(c, rhs, dPrev, dPrev2, wt, roomOfCell, roomSums, pair)
    const dNewest = dPrev2
    dPrev2 = dPrev
    dPrev = dNewest
    if (!explicit) removedVent += ventRemoval(rhs, h)
    const den = pair[0]!, neg = pair[1]!
    if (neg > 0 && den > 0) {
      // Rare undershoots ahead of steep fronts: zero them and take the same mass from the positive
      // cells in proportion (a global, mass-conserving fix; the amount is reported in stats).
      scaleField(c, 1 - neg / den)
      clipped += neg * vc
    }
    let defRel = 0
    if (!explicit) {
      evalL(lNew)
      stepDefect(rhs, h)
      if (den > peakAirborne) peakAirborne = den
      for (let r = 0; r < nRooms; r++) {
        if (roomMass[r]! > ROOM_SHARE_CONTROLLED * peakAirborne && roomMass[r]! > 0) defRel = Math.max(defRel, roomDef[r]! / roomMass[r]!)
      }
      const sw = lOld; lOld = lNew; lNew = sw
    }
    steps++
    if (h < minDt) minDt = h
    if (h > maxDt) maxDt = h
    const hitBreak = nextBreak < breakList.length && Math.abs(tNew - breakList[nextBreak]!) < 1e-9 && isKink[nextBreak] === 0
    const tPrev = t
    t = Math.abs(tNew - tEvent) < 1e-9 ? tEvent : tNew
    observeStep(tPrev, h)
    // Accuracy control: the local error estimate h^3 |C'''| / 12, relative to the gas in each room; the
    // next step is the ladder level that meets the tolerance (growing at most 2x per step).
    if (fixedDt === undefined) {
      if (histSteps >= 2 && den > 0) {
        // Per-room relative norm, so a room far from the source is controlled as tightly as the source
        // room once it holds a noticeable share (ROOM_SHARE_CONTROLLED of the most gas airborne so far).
        if (den > peakAirborne) peakAirborne = den
        let worst = 0
        for (let r = 0; r < nRooms; r++) {
          if (roomMass[r]! > ROOM_SHARE_CONTROLLED * peakAirborne && roomMass[r]! > 0) worst = Math.max(worst, roomErr[r]! / roomMass[r]!)
        }
        const err = ((h * h * h) / 12) * worst
        const wanted = err > 0 ? h * Math.min(2, 0.9 * Math.cbrt(num.tolerance / err)) : 2 * h
        level = Math.max(levelFor(wanted), level - 1)
      } else if (stepLevel >= 0 && !puffStart) level = Math.max(level - 1, 0)
      // The trapezoidal defect (first order where backward Euler acts): the step also meets it.
      if (defRel > 0) level = Math.max(level, levelFor(h * Math.min(2, 0.9 * Math.sqrt((num.tolerance * DEFECT_TOL_FACTOR) / defRel))))
      if (histSteps >= 2) puffStart = false
    }
    if (!explicit) {
      dtLast2 = dtLast
      dtLast = h
      histSteps++
    }
    roomErr.fill(0); roomMass.fill(0); roomSums.old.fill(0); roomSums.delta.fill(0)
    while (outIndex < nOut && times[outIndex]! < t - 1e-9) recordOutput(times[outIndex]!, (times[outIndex]! - tPrev) / h, h, hBefore)
    // Puffs at t count in the state at t (outputs are right-continuous in time).
    if (applyPuffs(t)) { puffStart = true; if (!explicit) evalL(lOld) }
    if (outIndex < nOut && times[outIndex]! <= t + 1e-9) recordOutput(times[outIndex]!, 1, h, hBefore)
    hPrevStep = h
    // A release event (start, stop, puff) restarts the control from a small step.
    if (hitBreak) {
      if (fixedDt === undefined) level = initLevel
      if (fixedDt === undefined && puffStart) level = puffLevel
      histSteps = 0; dtLast = 0; dtLast2 = 0
      dPrev.fill(0); dPrev2.fill(0); hPrevStep = 0
    }
    const frac = t / duration
    if (opts.onProgress && frac - lastProgress >= 0.01) { opts.onProgress(Math.min(frac, 1)); lastProgress = frac }
  }

  if (opts.onProgress && lastProgress < 1) opts.onProgress(1)
  let inAir = 0
  for (let p = 0; p < n; p++) inAir += c[p]!
  inAir *= vc
  const removed = removedVent + removedExhaust + removedDownflow
  const totalAir = inAir

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
      grid_sensitivity_pct: null,
    }
  })
  const nan = (a: Float64Array, scale: number) => {
    const out = new Float32Array(nField)
    for (let pp = 0; pp < nField; pp++) out[pp] = m.roomOfPlan[pp]! < 0 ? NaN : a[pp]! * scale
    return out
  }
  for (const f of fronts) for (let pp = 0; pp < nPlan; pp++) if (m.roomOfPlan[pp]! < 0) f[pp] = NaN

  return {
    grid: { nx, ny, nz, cell_m: m.h, layer_m: m.dz, origin_m: [m.x0, m.y0], room_ids: m.roomIds, room_of_cell: m.roomOfPlan },
    times_s: times, thresholds, probes,
    breathing_ppm: breathing, column_max_ppm: columnMax, fronts_s: fronts,
    peak_ppm: nan(peak, 1e6), max_twa15_ppm: nan(maxTwa, 1e6),
    mass_balance: {
      released_m3: releasedTotal, in_air_m3: totalAir, removed_m3: removed,
      removed_by: { ventilation_m3: removedVent, local_exhaust_m3: removedExhaust, downflow_exhaust_m3: removedDownflow },
      closure_error: releasedTotal > 0 ? Math.abs(releasedTotal - totalAir - removed) / releasedTotal : 0,
    },
    diffusivity_m2_s: m.diffusivity, diffusivity_basis: m.diffusivityBasis, gas,
    error_estimate: { grid: null },
    error_control: {
      method: explicit ? 'explicit FTCS at 0.98 × its stability limit (bench baseline; no estimate)'
        : (fixedDt !== undefined ? `fixed step ${fixedDt} s (numerics.time_step_s); ` : 'adaptive steps: each step meets the local Crank-Nicolson estimate h³/12·|C\'\'\'| (tolerance) and ')
          + 'the trapezoidal defect |ΔC − h/2·(L Cⁿ + L Cⁿ⁺¹)| (first order where backward Euler acts: advective faces, stiff sinks; also the factorisation error and a stalled steady state), both relative to each room\'s gas',
      tolerance: fixedDt === undefined ? num.tolerance : null,
      defect_tolerance: fixedDt === undefined ? num.tolerance * DEFECT_TOL_FACTOR : null,
      fixed_step_s: fixedDt ?? null,
    },
    stats: { cells: m.airCells, grid_cells: n, steps, wall_s: (now() - t0Wall) / 1000, min_dt_s: minDt, max_dt_s: maxDt, clipped_m3: clipped, solver: explicit ? 'explicit-baseline (FTCS)' : 'implicit delta-form ADI (Crank-Nicolson on diffusive faces, backward Euler on advective faces and stiff sinks; pre-factorised Thomas)' },
  }
}

/** Ascending max(fwd, bwd) of every face that carries air (fwd ≠ bwd). */
function advectiveRates(fwds: Float32Array[], bwds: Float32Array[]): Float64Array {
  const rates: number[] = []
  for (let a = 0; a < fwds.length; a++) {
    const f = fwds[a]!, b = bwds[a]!
    for (let p = 0; p < f.length; p++) if (f[p] !== b[p]) rates.push(Math.max(f[p]!, b[p]!))
  }
  return Float64Array.from(rates).sort()
}

/**
 * Implicit face weights: θ·coefficient on diffusive (symmetric) faces and on faces that carry air
 * whose larger coefficient is at most `cnLimit` (s⁻¹); the full coefficient (backward Euler) on the
 * other faces that carry air, where Crank-Nicolson would ring at Courant numbers above 1.
 */
function implicitWeights(fwd: Float32Array, bwd: Float32Array, theta: number, cnLimit: number): { fwd: Float32Array; bwd: Float32Array } {
  const n = fwd.length
  const f = new Float32Array(n), b = new Float32Array(n)
  for (let p = 0; p < n; p++) {
    const fp = fwd[p]!, bp = bwd[p]!
    const w = fp === bp || Math.max(fp, bp) <= cnLimit ? theta : 1
    f[p] = w * fp
    b[p] = w * bp
  }
  return { fwd: f, bwd: b }
}
