// Issue 12, deliverable 1: the adaptive stepper (default numerics) against the same model at fixed
// small steps, as a property over generated scenarios with sources, local exhausts near the source,
// undercut and open-door transfer air, cleanroom downflow with return and long runs to steady state.
// Reference: the same scenario with numerics.time_step_s = 0.5 s (halving it again moves no probe by
// more than 0.3 % of its peak in these cases, measured 0.25 %, checked below on the first scenarios), so the difference
// is the time-stepping error of the default run. Criterion (issue 12): every probe within 1 % of its
// peak, or within 0.01 ppm where the peak is below 1 ppm.
import { describe, expect, it } from 'vitest'
import { simulate } from '../../shared/engine/simulate'
import { generated, worstProbeError } from './generated-scenarios'

const SEEDS = Array.from({ length: 12 }, (_, k) => 1201 + k)

describe('adaptive step control vs small fixed steps (property over generated scenarios)', () => {
  for (const seed of SEEDS) {
    it(`seed ${seed}: every probe within 1 % of its peak (or 0.01 ppm) of the 0.5 s fixed-step run`, () => {
      const sc = generated(seed)
      const run = simulate(sc, { planFields: false })
      const ref = simulate({ ...sc, numerics: { time_step_s: 0.5 } }, { planFields: false })
      const { rel, probe } = worstProbeError(run, ref)
      expect(rel, `seed ${seed}, probe ${probe}, ${run.stats.steps} steps`).toBeLessThan(0.01)
      // The run says how its error was controlled and what it estimates.
      expect(run.error_control.method).toMatch(/trapezoidal defect/)
    }, 60_000)
  }

  it('the 0.5 s reference is converged in time (0.25 s moves no probe by 0.3 % of its peak)', () => {
    for (const seed of SEEDS.slice(0, 2)) {
      const sc = generated(seed)
      const a = simulate({ ...sc, numerics: { time_step_s: 0.5 } }, { planFields: false })
      const b = simulate({ ...sc, numerics: { time_step_s: 0.25 } }, { planFields: false })
      expect(worstProbeError(a, b).rel).toBeLessThan(0.003)
    }
  }, 120_000)
})
