import type { Gas } from '../gases/gas-schema'
import { ppmForOxygenPercent } from '../gases/units'

/** A concentration level whose first crossing time is tracked. */
export interface Threshold {
  /** e.g. "REL-TWA", "IDLH", "25% LEL", "O2 19.5%", "requested". */
  label: string
  /** ppm by volume */
  ppm: number
}

/**
 * The gas's limits as thresholds (REL TWA/STEL/ceiling, PEL TWA/ceiling, IDLH), 10/25/100 % LEL,
 * oxygen 19.5 % and 18 % for asphyxiants, plus requested levels; sorted ascending, duplicates merged.
 */
export function thresholdsFor(gas: Gas, extraPpm: readonly number[]): Threshold[] {
  const L = gas.limits
  const out: Threshold[] = []
  const add = (label: string, ppm: number | null) => { if (ppm !== null && ppm > 0) out.push({ label, ppm }) }
  add('REL-TWA', L.rel_twa_ppm)
  add('REL-STEL', L.rel_stel_ppm)
  add('REL-C', L.rel_ceiling_ppm)
  add('PEL-TWA', L.pel_twa_ppm)
  add('PEL-C', L.pel_ceiling_ppm)
  add('IDLH', L.idlh_ppm)
  if (gas.lel_pct !== null) {
    add('10% LEL', gas.lel_pct * 1e3)
    add('25% LEL', gas.lel_pct * 2.5e3)
    add('LEL', gas.lel_pct * 1e4)
  }
  if (gas.asphyxiant) {
    add('O2 19.5%', ppmForOxygenPercent(19.5))
    add('O2 18%', ppmForOxygenPercent(18))
  }
  for (const p of extraPpm) add(`${p} ppm`, p)
  out.sort((a, b) => a.ppm - b.ppm)
  const merged: Threshold[] = []
  for (const t of out) {
    const last = merged[merged.length - 1]
    if (last && Math.abs(last.ppm - t.ppm) <= 1e-12 * t.ppm) last.label += `, ${t.label}`
    else merged.push({ ...t })
  }
  return merged
}
