// Release models. The worked values come from the project's reference sheet §5.2/§5.3 and §12 #18-19,
// which derived them there from the ideal-gas orifice and blow-down equations in Crowl & Louvar,
// "Chemical Process Safety", chapter "Source Models" (so these tests check our code against those
// equations with independent arithmetic, not against a measured experiment).
import { describe, expect, it } from 'vitest'
import {
  blowdownTimeConstant, criticalPressureRatio, massToReferenceVolume, orificeMassFlow, releaseHistory,
} from '../../shared/engine/releases'
import { ReleaseSchema } from '../../shared/engine/scenario-schema'

const N2 = { molarMass: 0.028014, gamma: 1.4 }
const NH3 = { molarMass: 0.017031, gamma: 1.31 }
const area = (d: number) => (Math.PI * d * d) / 4

describe('orifice flow (choked / unchoked by the critical pressure ratio)', () => {
  it('critical pressure ratio 0.52828 for gamma 1.4 (§12 #18)', () => {
    expect(criticalPressureRatio(1.4)).toBeCloseTo(0.52828, 5)
  })
  it('choked N2, 100 bar abs, 293.15 K, 0.254 mm, Cd 1: 1.1763 g/s = 61.64 L/min at 25 C (§5.2)', () => {
    const m = orificeMassFlow(N2, area(0.254e-3), 100e5, 293.15, 101325)
    expect(m * 1000).toBeCloseTo(1.1763, 3)
    expect(massToReferenceVolume(m, N2.molarMass) * 60000).toBeCloseTo(61.64, 1)
  })
  it('Cd 0.61 scales the flow: 0.7175 g/s (§5.2)', () => {
    expect(orificeMassFlow(N2, 0.61 * area(0.254e-3), 100e5, 293.15, 101325) * 1000).toBeCloseTo(0.7175, 3)
  })
  it('unchoked N2, 1.5 bar abs to 1.01325 bar, 1 mm, Cd 0.61: 0.1586 g/s (§5.2)', () => {
    expect(orificeMassFlow(N2, 0.61 * area(1e-3), 1.5e5, 293.15, 101325) * 1000).toBeCloseTo(0.1586, 3)
  })
  it('NH3 vapour, 8.6 bar, 20 C, 1 mm, Cd 0.61: 0.729 g/s (§5.2)', () => {
    expect(orificeMassFlow(NH3, 0.61 * area(1e-3), 8.6e5, 293.15, 101325) * 1000).toBeCloseTo(0.729, 2)
  })
})

describe('cylinder blow-down (isothermal)', () => {
  // 49 L N2 at 150 bar abs, 293.15 K, 0.254 mm, Cd 1: tau = 4,788 s, P = 10 bar at 12,966 s (§5.3, §12 #19).
  const release = ReleaseSchema.parse({ kind: 'cylinder', water_volume_m3: 0.049, pressure_pa: 150e5, orifice_diameter_m: 0.254e-3, temperature_k: 293.15 })
  const hist = releaseHistory(release, N2, 40000)
  const kgPerPa = (0.049 * N2.molarMass) / (8.314462618 * 293.15)
  const volAt = (p: number) => massToReferenceVolume((150e5 - p) * kgPerPa, N2.molarMass)
  it('time constant 4,788 s', () => {
    expect(blowdownTimeConstant(N2, 0.049, area(0.254e-3), 293.15)).toBeCloseTo(4788, -1)
  })
  it('initial rate 1.764 g/s', () => {
    const dv = hist.cumulative(1) - hist.cumulative(0)
    expect((dv * 101325 * N2.molarMass) / (8.314462618 * 298.15) * 1000).toBeCloseTo(1.764, 2)
  })
  it('released volume when P = 10 bar is reached at 12,966 s', () => {
    expect(hist.cumulative(12966) / volAt(10e5)).toBeCloseTo(1, 3)
  })
  it('never releases more than the inventory above ambient pressure', () => {
    expect(hist.cumulative(1e9)).toBeLessThanOrEqual(hist.total + 1e-12)
    expect(hist.total).toBeCloseTo(volAt(101325), 6)
    expect(hist.cumulative(40000)).toBeGreaterThan(0.99 * hist.total)
  })
  it('marks where the flow unchokes (P = Pa / r*, at tau ln(P0 r* / Pa) = 20,871 s) and where the cylinder is empty', () => {
    // Choked isothermal blow-down is P0 exp(-t/tau) (same source), so it reaches Pa / r* at tau ln(P0 r*/Pa).
    const [unchoke, empty] = hist.kinks
    expect(unchoke).toBeCloseTo(blowdownTimeConstant(N2, 0.049, area(0.254e-3), 293.15) * Math.log((150e5 * criticalPressureRatio(1.4)) / 101325), 3)
    expect(unchoke! / 20871).toBeCloseTo(1, 3)
    // Empty: the subsonic rate falls to zero there and stays zero.
    expect(empty!).toBeGreaterThan(unchoke!)
    expect(hist.cumulative(empty!) / hist.total).toBeCloseTo(1, 9)
    expect(hist.cumulative(empty!) - hist.cumulative(empty! - 60)).toBeGreaterThan(0)
    expect(hist.cumulative(empty! + 60)).toBe(hist.cumulative(empty!))
    expect(hist.breakpoints).toEqual([0])
  })
  it('a restrictive flow orifice caps the flow at the smaller CdA', () => {
    const big = ReleaseSchema.parse({ kind: 'cylinder', water_volume_m3: 0.049, pressure_pa: 150e5, orifice_diameter_m: 5e-3, rfo_diameter_m: 0.254e-3 })
    const h2 = releaseHistory(big, N2, 1000)
    expect(h2.cumulative(10) / hist.cumulative(10)).toBeCloseTo(1, 6)
  })
  it('liquefied gas releases at constant vapour pressure until the liquid is gone', () => {
    const liq = ReleaseSchema.parse({ kind: 'cylinder', water_volume_m3: 0.0022, pressure_pa: 8.6e5, orifice_diameter_m: 1e-3, discharge_coefficient: 0.61, liquefied: { vapour_pressure_pa: 8.6e5, contents_kg: 0.3 } })
    const h3 = releaseHistory(liq, NH3, 5000)
    const rate = orificeMassFlow(NH3, 0.61 * area(1e-3), 8.6e5, 293.15, 101325)
    expect(h3.cumulative(100)).toBeCloseTo(massToReferenceVolume(rate * 100, NH3.molarMass), 9)
    expect(h3.total).toBeLessThanOrEqual(massToReferenceVolume(0.3, NH3.molarMass))
    expect(h3.cumulative(5000)).toBeLessThanOrEqual(h3.total + 1e-12)
  })
})

describe('simple releases', () => {
  it('constant: rate x duration, capped by inventory', () => {
    const h = releaseHistory(ReleaseSchema.parse({ kind: 'constant', rate_m3_s: 1e-3, start_s: 10, end_s: 110, inventory_m3: 0.05 }), N2, 200)
    expect(h.cumulative(10)).toBe(0)
    expect(h.cumulative(40)).toBeCloseTo(0.03, 12)
    expect(h.cumulative(200)).toBeCloseTo(0.05, 12)
    expect(h.breakpoints).toEqual([10, 60])
  })
  it('instant: one puff', () => {
    const h = releaseHistory(ReleaseSchema.parse({ kind: 'instant', volume_m3: 0.2, at_s: 5 }), N2, 100)
    expect(h.puffs).toEqual([{ t: 5, volume: 0.2 }])
    expect(h.cumulative(100)).toBe(0)
  })
  it('schedule: step and linear integrals', () => {
    const step = releaseHistory(ReleaseSchema.parse({ kind: 'schedule', points: [[0, 1e-3], [10, 2e-3], [20, 0]] }), N2, 100)
    expect(step.cumulative(15)).toBeCloseTo(0.01 + 0.01, 12)
    expect(step.total).toBeCloseTo(0.03, 12)
    const lin = releaseHistory(ReleaseSchema.parse({ kind: 'schedule', points: [[0, 0], [10, 2e-3]], interpolation: 'linear' }), N2, 100)
    expect(lin.cumulative(10)).toBeCloseTo(0.01, 12)
    expect(lin.cumulative(5)).toBeCloseTo(0.0025, 12)
  })
  it('schedule: the stepper lands where the rate jumps, and only bends at a linear schedule\'s inner points', () => {
    const step = releaseHistory(ReleaseSchema.parse({ kind: 'schedule', points: [[0, 1e-3], [10, 2e-3], [20, 0]] }), N2, 100)
    expect(step.breakpoints).toEqual([0, 10, 20])
    expect(step.kinks).toEqual([])
    const lin = releaseHistory(ReleaseSchema.parse({ kind: 'schedule', points: [[0, 0], [10, 2e-3], [30, 1e-3], [40, 0]], interpolation: 'linear' }), N2, 100)
    expect(lin.breakpoints).toEqual([0, 40])
    expect(lin.kinks).toEqual([10, 30])
  })
  it('schedule: the moment the inventory runs out is a breakpoint (the rate drops to zero there)', () => {
    // Step schedule 1 L/s from 0 s, 2 L/s from 10 s: 25 L are gone at 10 + (25 − 10) / 2 = 17.5 s.
    const h = releaseHistory(ReleaseSchema.parse({ kind: 'schedule', points: [[0, 1e-3], [10, 2e-3], [20, 0]], inventory_m3: 0.025 }), N2, 100)
    expect(h.breakpoints).toHaveLength(3)
    expect(h.breakpoints.slice(0, 2)).toEqual([0, 10])
    expect(h.breakpoints[2]!).toBeCloseTo(17.5, 6)
    expect(h.cumulative(17.5 + 1e-6)).toBeCloseTo(0.025, 12)
    expect(h.cumulative(17.4)).toBeLessThan(0.025)
  })
})
