// Issue 12, deliverable 4: sub-grid models under refinement (same geometry, cells of 0.4, 0.2, 0.1 m,
// layers of the same size). No outside reference exists for these models: the check is that each
// halving changes the result less and less (grid convergence), with the measured figures beside it.
import { describe, expect, it } from 'vitest'
import { simulate } from '../../shared/engine/simulate'
import type { ScenarioInput } from '../../shared/engine/scenario-schema'
import { rect } from './helpers'

function at(h: number, over: Partial<ScenarioInput>) {
  const sc: ScenarioInput = {
    format: 'driftwarden-scenario/1', duration_s: 1800, output_interval_s: 300, grid: { cell_m: h, layers: Math.round(2.4 / h) }, ceiling_m: 2.4,
    gas: { id: 'NH3' }, effective_diffusivity_m2_s: 0.005, rooms: [], sources: [{ id: 's', position_m: [1.2, 1.2, 1.2], release: { kind: 'constant', rate_m3_s: 1e-4 } }],
    probes: [{ id: 'b', position_m: [4.0, 1.2, 1.2] }], ...over,
  }
  return simulate(sc, { planFields: false })
}
const change = (a: number, b: number) => Math.abs(b / a - 1)

describe('sub-grid models converge under refinement', () => {
  it('door undercut: the exchange no longer scales as 1/h (room beyond the door, 30 min)', () => {
    // Closed door, 10 mm undercut, between two 2.4 m rooms, leak in the first. Measured ppm in the second
    // room: 130.1, 124.8, 120.4 (−4.1 %, −3.6 % per halving: the spreading of the gap flow into the
    // bottom cells is resolved at first order). With the conductance D·area/h of engine version 1:
    // 61.2, 118.6, 205.5 (×1.9, ×1.7 per halving).
    const runs = [0.4, 0.2, 0.1].map((h) => at(h, {
      rooms: [{ id: 'a', polygon_m: rect(0, 0, 2.4, 2.4) }, { id: 'b', polygon_m: rect(2.4, 0, 4.8, 2.4) }],
      openings: [{ id: 'd', segment_m: [[2.4, 0.8], [2.4, 1.6]], open: false, undercut_m: 0.01 }],
    }).probes[0]!.ppm.at(-1)!)
    const c1 = change(runs[0]!, runs[1]!), c2 = change(runs[1]!, runs[2]!)
    expect(c1, runs.join(', ')).toBeLessThan(0.05)
    expect(c2).toBeLessThan(0.05)
    expect(c2).toBeLessThan(c1)
  }, 60_000)

  it('gas cabinet 0.5 m from the leak: removal changes < 3 % from 0.2 to 0.1 m cells (capture sphere by volume)', () => {
    // 0.1 m³/s, default capture radius 0.3 m. Measured removal over 30 min: 0.1088, 0.0892, 0.0869 m³
    // (0.4 m cells cannot resolve a 0.3 m sphere: −18 %; then −2.5 %). Engine version 1 (cells whose
    // centre lies within 0.75 cell): 0.0426, 0.0364, 0.0056 m³ (at 0.1 m no centre fell inside).
    const runs = [0.4, 0.2, 0.1].map((h) => at(h, {
      rooms: [{ id: 'a', polygon_m: rect(0, 0, 4.8, 2.4), ventilation: { air_changes_per_hour: 6 } }],
      local_exhausts: [{ id: 'x', kind: 'gas_cabinet', position_m: [1.7, 1.2, 1.2], flow_m3_s: 0.1 }],
    }))
    const removed = runs.map((r) => r.mass_balance.removed_by.local_exhaust_m3)
    expect(change(removed[1]!, removed[2]!), removed.join(', ')).toBeLessThan(0.03)
    const far = runs.map((r) => r.probes[0]!.ppm.at(-1)!)
    expect(change(far[1]!, far[2]!), far.join(', ')).toBeLessThan(0.05) // measured 4.2 %
  }, 60_000)
})
