import type { Release } from './scenario-schema'

/** Gas constant, J/(mol·K). */
export const R_GAS = 8.314462618
/** Reference state of all release volumes: 25 °C, 1 atm. */
export const T_REF_K = 298.15
export const P_REF_PA = 101325

/**
 * A release as a function of time. Volumes are pure gas at 25 °C and 1 atm (m³).
 * `cumulative(t)` is the continuous part released in [0, t]; `puffs` are instantaneous additions.
 * `breakpoints` are times where the rate jumps (the time stepper lands on them and restarts small);
 * `kinks` are times where only the rate's slope jumps (the stepper lands on them, so that no step
 * straddles the change, and its error control carries on).
 */
export interface ReleaseHistory {
  cumulative(t: number): number
  /** Instantaneous releases: time (s) and volume (m³). */
  puffs: { t: number; volume: number }[]
  breakpoints: number[]
  kinks: number[]
  /** Volume released over all time, m³ (Infinity for an open-ended constant release). */
  total: number
}

/** Gas properties needed by the orifice equations. */
export interface OrificeGas {
  /** Molar mass, kg/mol. */
  molarMass: number
  /** Cp/Cv. */
  gamma: number
}

/** Critical pressure ratio P_crit / P0 = (2/(γ+1))^(γ/(γ−1)) of an ideal gas. */
export function criticalPressureRatio(gamma: number): number {
  return Math.pow(2 / (gamma + 1), gamma / (gamma - 1))
}

/**
 * Mass flow (kg/s) of an ideal gas through an orifice, choked or not by the critical pressure ratio
 * (isentropic nozzle equations as given by Crowl & Louvar, "Source Models").
 * @param cdA discharge coefficient × area, m²
 * @param p0 upstream absolute pressure, Pa
 * @param t0 upstream temperature, K
 * @param pa downstream (ambient) absolute pressure, Pa
 */
export function orificeMassFlow(gas: OrificeGas, cdA: number, p0: number, t0: number, pa: number): number {
  if (p0 <= pa) return 0
  const g = gas.gamma, M = gas.molarMass
  const r = pa / p0
  if (r <= criticalPressureRatio(g)) {
    return cdA * p0 * Math.sqrt(((g * M) / (R_GAS * t0)) * Math.pow(2 / (g + 1), (g + 1) / (g - 1)))
  }
  const term = Math.pow(r, 2 / g) - Math.pow(r, (g + 1) / g)
  return cdA * p0 * Math.sqrt(((2 * M) / (R_GAS * t0)) * (g / (g - 1)) * Math.max(term, 0))
}

/** Pure-gas volume (m³ at 25 °C, 1 atm) of a mass (kg) of gas with molar mass M (kg/mol). */
export function massToReferenceVolume(massKg: number, molarMass: number): number {
  return ((massKg / molarMass) * R_GAS * T_REF_K) / P_REF_PA
}

/** Isothermal choked blow-down time constant τ = V·M/(R·T0·CdA·Φ), s. */
export function blowdownTimeConstant(gas: OrificeGas, volumeM3: number, cdA: number, t0: number): number {
  const g = gas.gamma
  const phi = Math.sqrt(((g * gas.molarMass) / (R_GAS * t0)) * Math.pow(2 / (g + 1), (g + 1) / (g - 1)))
  return (volumeM3 * gas.molarMass) / (R_GAS * t0 * cdA * phi)
}

/** When a non-decreasing cumulative release first reaches the inventory `cap` (Infinity if it never does). */
function capTime(cumulative: (t: number) => number, cap: number, t0: number, t1: number): number {
  if (!(cumulative(t1) >= cap)) return Infinity
  let lo = t0, hi = t1
  while (hi - lo > 1e-9 * Math.max(1, Math.abs(hi))) {
    const mid = 0.5 * (lo + hi)
    if (cumulative(mid) >= cap) hi = mid
    else lo = mid
  }
  return hi
}

function binarySearch(ts: Float64Array, t: number): number {
  let lo = 0, hi = ts.length - 1
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1
    if (ts[mid]! <= t) lo = mid
    else hi = mid
  }
  return lo
}

/**
 * Cylinder blowing down through an orifice (optionally capped by a restrictive flow orifice):
 * liquefied phase at constant vapour pressure while liquid remains, then isothermal gas blow-down,
 * choked (exact exponential) until P = Pa/r*, then unchoked (RK4, tabulated). The gas left at ambient
 * pressure stays in the cylinder, so the release never exceeds the inventory.
 */
function cylinderHistory(r: Extract<Release, { kind: 'cylinder' }>, gas: OrificeGas, horizon: number): ReleaseHistory {
  const area = (d: number) => (Math.PI * d * d) / 4
  let cdA = r.discharge_coefficient * area(r.orifice_diameter_m)
  if (r.rfo_diameter_m !== undefined) cdA = Math.min(cdA, r.rfo_discharge_coefficient * area(r.rfo_diameter_m))
  const T = r.temperature_k, V = r.water_volume_m3, pa = r.ambient_pressure_pa
  const M = gas.molarMass
  const kgPerPa = (V * M) / (R_GAS * T) // gas mass per pascal of cylinder pressure
  // Liquefied phase: constant rate at the vapour pressure until only the vapour in the headspace is left.
  let pGas0 = r.pressure_pa, tLiquidEnd = 0, mLiquid = 0, liquidRate = 0
  if (r.liquefied) {
    pGas0 = r.liquefied.vapour_pressure_pa
    const mVapour = pGas0 * kgPerPa
    mLiquid = Math.max(r.liquefied.contents_kg - mVapour, 0)
    liquidRate = orificeMassFlow(gas, cdA, pGas0, T, pa)
    tLiquidEnd = liquidRate > 0 ? mLiquid / liquidRate : Infinity
  }
  // Gas phase: tabulate P(t) on a grid fine enough for linear interpolation of the released mass.
  const tau = blowdownTimeConstant(gas, V, cdA, T)
  const pChoke = pa / criticalPressureRatio(gas.gamma)
  const ts: number[] = [0], ps: number[] = [pGas0]
  if (Number.isFinite(tLiquidEnd) && pGas0 > pa) {
    const tEnd = Math.max(horizon - r.start_s - tLiquidEnd, 0)
    const h = tau / 200
    let t = 0, p = pGas0
    const dpdt = (pp: number) => -orificeMassFlow(gas, cdA, pp, T, pa) / kgPerPa
    while (t < tEnd && p - pa > 1e-9 * (pGas0 - pa) && ts.length < 400000) {
      if (p > pChoke) {
        // Exact exponential while choked; stop exactly at the choke point.
        const tNext = Math.min(t + h, t + tau * Math.log(p / pChoke))
        p = p * Math.exp(-(tNext - t) / tau)
        t = tNext === t ? t + h : tNext
        if (Math.abs(p - pChoke) < 1e-9 * pChoke) p = pChoke
      } else {
        const k1 = dpdt(p), k2 = dpdt(Math.max(p + 0.5 * h * k1, pa)), k3 = dpdt(Math.max(p + 0.5 * h * k2, pa)), k4 = dpdt(Math.max(p + h * k3, pa))
        p = Math.max(p + (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4), pa)
        t += h
      }
      ts.push(t)
      ps.push(p)
    }
  }
  const tArr = Float64Array.from(ts), pArr = Float64Array.from(ps)
  // dP/dt at every node from the orifice equation: cubic Hermite interpolation between nodes keeps the
  // release rate continuous (a piecewise-linear P(t) would make the rate jump at every node).
  const dArr = Float64Array.from(pArr, (pp) => -orificeMassFlow(gas, cdA, pp, T, pa) / kgPerPa)
  const gasMassAt = (tg: number): number => {
    if (tg <= 0) return 0
    const last = tArr.length - 1
    if (tg >= tArr[last]!) return (pGas0 - pArr[last]!) * kgPerPa
    if (pArr[0]! > pChoke && tg <= tau * Math.log(pArr[0]! / pChoke)) return pGas0 * (1 - Math.exp(-tg / tau)) * kgPerPa
    const i = binarySearch(tArr, tg)
    const hh = tArr[i + 1]! - tArr[i]!
    const u = (tg - tArr[i]!) / hh, u2 = u * u, u3 = u2 * u
    const p = (2 * u3 - 3 * u2 + 1) * pArr[i]! + (u3 - 2 * u2 + u) * hh * dArr[i]! + (-2 * u3 + 3 * u2) * pArr[i + 1]! + (u3 - u2) * hh * dArr[i + 1]!
    return (pGas0 - Math.max(p, pa)) * kgPerPa
  }
  const massAt = (t: number): number => {
    const tl = t - r.start_s
    if (tl <= 0) return 0
    if (tl <= tLiquidEnd) return liquidRate * tl
    return mLiquid + gasMassAt(tl - tLiquidEnd)
  }
  const totalMass = mLiquid + Math.max(pGas0 - pa, 0) * kgPerPa
  const bp = [r.start_s]
  if (r.liquefied && Number.isFinite(tLiquidEnd)) bp.push(r.start_s + tLiquidEnd)
  // The rate is continuous but its slope jumps where the flow unchokes and where the cylinder reaches
  // ambient pressure (the subsonic rate falls linearly to zero there).
  const kinks: number[] = []
  const tBlowdown = r.start_s + (r.liquefied ? tLiquidEnd : 0)
  if (Number.isFinite(tBlowdown) && pGas0 > pa) {
    if (pGas0 > pChoke) kinks.push(tBlowdown + tau * Math.log(pGas0 / pChoke))
    const last = tArr.length - 1
    if (last > 0 && pArr[last]! - pa <= 1e-9 * (pGas0 - pa)) kinks.push(tBlowdown + tArr[last]!)
  }
  return {
    cumulative: (t) => massToReferenceVolume(massAt(t), M),
    puffs: [],
    breakpoints: bp,
    kinks,
    total: massToReferenceVolume(totalMass, M),
  }
}

/**
 * Build the time history of one release.
 * @param gas molar mass (kg/mol) and γ, used by cylinder releases
 * @param horizon simulated duration, s (cylinder tables are built up to it)
 */
export function releaseHistory(release: Release, gas: OrificeGas, horizon: number): ReleaseHistory {
  switch (release.kind) {
    case 'constant': {
      const { rate_m3_s: q, start_s: t0 } = release
      const t1 = release.end_s ?? Infinity
      const cap = release.inventory_m3 ?? Infinity
      const tCap = q > 0 ? t0 + cap / q : Infinity
      return {
        cumulative: (t) => Math.min(q * Math.max(0, Math.min(t, t1) - t0), cap),
        puffs: [],
        breakpoints: [t0, Math.min(t1, tCap)].filter(Number.isFinite),
        kinks: [],
        total: Math.min(q * (t1 - t0), cap),
      }
    }
    case 'instant':
      return { cumulative: () => 0, puffs: [{ t: release.at_s, volume: release.volume_m3 }], breakpoints: [release.at_s], kinks: [], total: release.volume_m3 }
    case 'schedule': {
      const pts = release.points
      const n = pts.length
      const ts = new Float64Array(n), qs = new Float64Array(n), cum = new Float64Array(n)
      for (let i = 0; i < n; i++) {
        ts[i] = pts[i]![0]
        qs[i] = pts[i]![1]
      }
      const linear = release.interpolation === 'linear'
      for (let i = 1; i < n; i++) {
        const dt = ts[i]! - ts[i - 1]!
        cum[i] = cum[i - 1]! + (linear ? 0.5 * (qs[i - 1]! + qs[i]!) : qs[i - 1]!) * dt
      }
      const cap = release.inventory_m3 ?? Infinity
      const raw = (t: number): number => {
        if (t <= ts[0]!) return 0
        if (t >= ts[n - 1]!) return cum[n - 1]!
        const i = binarySearch(ts, t)
        const dt = t - ts[i]!
        if (!linear) return cum[i]! + qs[i]! * dt
        const slope = (qs[i + 1]! - qs[i]!) / (ts[i + 1]! - ts[i]!)
        return cum[i]! + qs[i]! * dt + 0.5 * slope * dt * dt
      }
      // The rate jumps at a step schedule's points, at a linear schedule's first and last points and
      // where the inventory runs out; a linear schedule's inner points only bend it.
      const tCap = capTime(raw, cap, ts[0]!, ts[n - 1]!)
      const jumps = linear ? [ts[0]!, ts[n - 1]!] : Array.from(ts)
      const bends = linear ? Array.from(ts.subarray(1, n - 1)) : []
      return {
        cumulative: (t) => Math.min(raw(t), cap), puffs: [],
        breakpoints: Number.isFinite(tCap) ? [...jumps.filter((t) => t < tCap), tCap] : jumps,
        kinks: bends.filter((t) => t < tCap),
        total: Math.min(cum[n - 1]!, cap),
      }
    }
    case 'cylinder':
      return cylinderHistory(release, gas, horizon)
  }
}
