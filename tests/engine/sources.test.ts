// Issue 12, deliverable 3: a point source is spread trilinearly over the (up to 8) nearest cell centres
// of its room instead of being moved to its cell's centre. Reference: the continuous point source in
// free space, C = q/(4πDr)·erfc(r/√(4Dt)) (Carslaw & Jaeger, "Conduction of Heat in Solids", §10.4,
// from memory; the same formula as analytic.test.ts, where it is checked against the reference sheet).
import { describe, expect, it } from 'vitest'
import { simulate } from '../../shared/engine/simulate'
import { at, erfc, oneRoom } from './helpers'

const D = 0.005, q = 1e-4
const exact = (r: number, t: number) => ((q / (4 * Math.PI * D * r)) * erfc(r / Math.sqrt(4 * D * t))) * 1e6

/** A 6 m box room (walls ≥ 2.4 m from the leak: images add < 0.2 % at 300 s), cells of h, leak at `src`. */
function run(h: number, src: [number, number, number], probes: { id: string; position_m: [number, number, number] }[]) {
  return simulate(oneRoom({
    size: [6, 6], ceiling_m: 6, grid: { cell_m: h, layers: Math.round(6 / h) }, duration_s: 300, output_interval_s: 60,
    effective_diffusivity_m2_s: D,
    sources: [{ id: 's', position_m: src, release: { kind: 'constant', rate_m3_s: q, start_s: 0 } }],
    probes,
  }), { planFields: false })
}

describe('sources where they are (trilinear spread)', () => {
  it('far-field values follow the leak inside its cell: error vs analytic varies < 1 % across, < 3 % along the move', () => {
    // 0.25 m cells; the leak moves across one cell in x (3.01 … 3.24 m, cell edges at 3.0 and 3.25 m);
    // probes 1.5 m from the cell centre, one along the move ("far") and one across it ("side"). Each
    // value is compared with the analytic one at its own distance, so the check is that the engine
    // follows the leak. Measured: side 2.27–3.18 % (spread 0.9 %), far 3.18–5.61 % (spread 2.4 %; the
    // spread's extra variance f(1−f)h² still shows at 5.5–6.5 cells). Snapped to the cell centre (engine
    // version 1) the far errors ran from +22.3 % to −13.1 % (spread 35 %) and the side ones 3.2–3.9 %.
    // With 0.125 m cells the far spread is 0.5 %.
    const far: number[] = [], side: number[] = []
    for (const x of [3.01, 3.06, 3.125, 3.19, 3.24]) {
      const r = run(0.25, [x, 3.125, 3.125], [{ id: 'far', position_m: [3.125 + 1.5, 3.125, 3.125] }, { id: 'side', position_m: [3.125, 3.125 + 1.5, 3.125] }])
      far.push(at(r, 'far', 300) / exact(3.125 + 1.5 - x, 300) - 1)
      side.push(at(r, 'side', 300) / exact(Math.hypot(1.5, x - 3.125), 300) - 1)
    }
    const spread = (e: number[]) => Math.max(...e) - Math.min(...e)
    const show = (e: number[]) => e.map((v) => (v * 100).toFixed(2)).join(', ')
    expect(spread(side), show(side)).toBeLessThan(0.01)
    expect(spread(far), show(far)).toBeLessThan(0.03)
  }, 60_000)

  it('mass-conserving: everything released is in the air of a closed room', () => {
    const r = run(0.5, [2.9, 3.3, 1.1], [])
    expect(r.mass_balance.released_m3).toBeCloseTo(q * 300, 12)
    expect(r.mass_balance.closure_error).toBeLessThan(1e-10)
  })

  it('near-source values converge monotonically under refinement (0.5 → 0.25 → 0.125 m), off-centre leak', () => {
    // The leak is off every grid's cell centres; probe 0.75 m away. Error vs the analytic solution must
    // fall at each halving. Measured: −5.13, +2.67, +0.80 %; snapped (version 1): −31.1, −8.3, +2.5 %.
    const src: [number, number, number] = [2.93, 3.04, 3.07]
    const probe: [number, number, number] = [2.93 + 0.75, 3.04, 3.07]
    const e = [0.5, 0.25, 0.125].map((h) => Math.abs(at(run(h, src, [{ id: 'p', position_m: probe }]), 'p', 300) / exact(0.75, 300) - 1))
    expect(e[1]!, e.map((x) => (x * 100).toFixed(2)).join(', ')).toBeLessThan(e[0]!)
    expect(e[2]!).toBeLessThan(e[1]!)
    expect(e[0]!).toBeLessThan(0.1)
    expect(e[2]!).toBeLessThan(0.015)
  }, 120_000)
})
