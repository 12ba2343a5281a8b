// Grid and time-step convergence: the measured order of accuracy is asserted (Richardson-style, as in
// the scijs ODE test suites). Space: cell-centred finite volumes are second order; time: Crank-Nicolson
// on the diffusive faces is second order. Exact solution: instantaneous plane source in a corridor,
// C = N0/(2A sqrt(pi D t)) exp(-x^2/(4 D t)) (Carslaw & Jaeger, from memory).
import { describe, expect, it } from 'vitest'
import { simulate } from '../../shared/engine/simulate'
import { at, rect } from './helpers'

const D = 0.01, N0 = 0.001, AREA = 0.04, T = 50

function corridor(h: number, dt: number) {
  const n = Math.round(0.2 / h)
  const xs = (Math.floor(10 / h) + 0.5) * h
  const sources = []
  for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) {
    sources.push({ id: `s${j}-${k}`, position_m: [xs, (j + 0.5) * h, (k + 0.5) * h] as [number, number, number], release: { kind: 'instant' as const, volume_m3: N0 / (n * n), at_s: 0 } })
  }
  const r = simulate({
    format: 'driftwarden-scenario/1', duration_s: T, output_interval_s: T, grid: { cell_m: h, layers: n }, ceiling_m: 0.2,
    rooms: [{ id: 'c', polygon_m: rect(0, 0, 20, 0.2) }], gas: { id: 'CO' }, effective_diffusivity_m2_s: D, sources,
    probes: [{ id: 'p', position_m: [xs + 1, h / 2, h / 2] }], numerics: { time_step_s: dt },
  })
  return at(r, 'p', T)
}
const exact = (x: number) => (N0 / (2 * AREA * Math.sqrt(Math.PI * D * T))) * Math.exp((-x * x) / (4 * D * T)) * 1e6

describe('convergence', () => {
  it('halving the cell (and quartering dt) reduces the error 4x: spatial order 2 +- 0.2', () => {
    const e = [0.2, 0.1, 0.05].map((h) => Math.abs(corridor(h, 4 * h * h) - exact(1)))
    const order1 = Math.log2(e[0]! / e[1]!), order2 = Math.log2(e[1]! / e[2]!)
    expect(order1).toBeGreaterThan(1.8)
    expect(order1).toBeLessThan(2.2)
    expect(order2).toBeGreaterThan(1.8)
    expect(order2).toBeLessThan(2.2)
  })
  it('halving the time step on a fixed grid: temporal order 2 +- 0.3 (Crank-Nicolson)', () => {
    const ref = corridor(0.1, 0.05)
    const e = [2, 1, 0.5].map((dt) => Math.abs(corridor(0.1, dt) - ref))
    const o1 = Math.log2(e[0]! / e[1]!), o2 = Math.log2(e[1]! / e[2]!)
    expect(o1).toBeGreaterThan(1.7)
    expect(o1).toBeLessThan(2.3)
    expect(o2).toBeGreaterThan(1.7)
    expect(o2).toBeLessThan(2.3)
  })
})
