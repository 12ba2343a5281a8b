import type { Gas } from '../gases/gas-schema'
import type { Scenario } from './scenario-schema'
import { polygonArea } from '../geometry/polygon'

/** Range of indoor eddy diffusivities measured by Cheng et al. (2011), m²/s. */
export const CHENG_RANGE_M2_S = [0.001, 0.013] as const

/**
 * Indoor eddy diffusivity from the air-change rate, Cheng et al. (2011) Environ. Sci. Technol.
 * 45:4016 (form verified; coefficients 0.52 and 0.19 as usually quoted, from memory):
 * D [m²/h] = (0.52 ACH + 0.19) · V^(2/3). Measured in naturally ventilated homes, so the result is
 * clamped to the range they measured rather than extrapolated.
 * @returns m²/s
 */
export function chengEddyDiffusivity(ach: number, volumeM3: number): number {
  return ((0.52 * ach + 0.19) * Math.pow(volumeM3, 2 / 3)) / 3600
}

/** The diffusivity used for a run and the reason, shown to users. */
export interface DiffusivityChoice {
  /** m²/s */
  value: number
  basis: string
}

/**
 * Effective (turbulent + molecular) diffusivity for a scenario: the scenario's
 * `effective_diffusivity_m2_s` when given, else molecular + the volume-weighted Cheng estimate over
 * the rooms (dilution ACH only; cleanroom recirculation is not an air change for this purpose),
 * clamped to the measured 0.001–0.013 m²/s.
 */
export function chooseDiffusivity(s: Scenario, gas: Gas): DiffusivityChoice {
  if (s.effective_diffusivity_m2_s !== undefined) {
    return { value: s.effective_diffusivity_m2_s, basis: 'effective_diffusivity_m2_s given in the scenario' }
  }
  let vSum = 0, dSum = 0
  for (const r of s.rooms) {
    const v = polygonArea(r.polygon_m) * s.ceiling_m
    vSum += v
    dSum += v * chengEddyDiffusivity(r.ventilation.air_changes_per_hour, v)
  }
  const raw = dSum / vSum
  const eddy = Math.min(Math.max(raw, CHENG_RANGE_M2_S[0]), CHENG_RANGE_M2_S[1])
  const value = eddy + gas.diffusivity_m2_s
  const clamped = eddy !== raw ? ` (raw ${raw.toPrecision(3)} m²/s clamped to the 0.001–0.013 m²/s range measured)` : ''
  return {
    value,
    basis: `molecular ${gas.diffusivity_m2_s.toPrecision(3)} m²/s (${gas.diffusivity_method}) + eddy ${eddy.toPrecision(3)} m²/s from Cheng et al. (2011) ` +
      `D = (0.52·ACH + 0.19)·V^(2/3) m²/h, volume-weighted over rooms${clamped}. Near-source ppm scale about 1/D: run sensitivity cases (×0.3, ×3).`,
  }
}
