import type { Gas } from './gas-schema'
import { ppmForOxygenPercent } from './units'

/** One default detector set point. */
export interface AlarmSetPoint {
  level: 'alarm1' | 'alarm2'
  hazard: 'toxic' | 'flammable' | 'oxygen'
  /** Gas concentration that triggers the alarm, ppm by volume. */
  ppm: number
  /** Why this value (always common practice; sites must use their own set points). */
  basis: string
}

const CP = 'common practice, not a code requirement; show the site\'s actual set points'

/**
 * Default alarm set points for a gas following common practice: toxic ½ TWA / TWA (or STEL where one
 * exists), ceiling gases ½ C / C, flammables 10 % / 25 % LEL, asphyxiants O2 19.5 % / 18 %. Arsine's
 * REL is below detector range, so it uses ½ and 1× the OSHA PEL. CO2 uses 5,000 / 30,000 ppm.
 */
export function defaultAlarmSetPoints(gas: Gas): AlarmSetPoint[] {
  const out: AlarmSetPoint[] = []
  const L = gas.limits
  const minOf = (...v: (number | null)[]) => {
    const f = v.filter((x): x is number => x !== null)
    return f.length ? Math.min(...f) : null
  }
  if (gas.id === 'CO2') {
    out.push({ level: 'alarm1', hazard: 'toxic', ppm: 5000, basis: `CO2 detection at 5,000 ppm (IFC 5307, from memory); ${CP}` })
    out.push({ level: 'alarm2', hazard: 'toxic', ppm: 30000, basis: `CO2 detection at 30,000 ppm (IFC 5307, from memory); ${CP}` })
  } else if (gas.id === 'AsH3' && L.pel_twa_ppm) {
    out.push({ level: 'alarm1', hazard: 'toxic', ppm: L.pel_twa_ppm / 2, basis: `½ × OSHA PEL (REL below detector range); ${CP}` })
    out.push({ level: 'alarm2', hazard: 'toxic', ppm: L.pel_twa_ppm, basis: `OSHA PEL; ${CP}` })
  } else {
    const twa = minOf(L.rel_twa_ppm, L.pel_twa_ppm)
    const ceiling = minOf(L.rel_ceiling_ppm, L.pel_ceiling_ppm)
    if (twa !== null) {
      out.push({ level: 'alarm1', hazard: 'toxic', ppm: twa / 2, basis: `½ × TWA (lower of REL and PEL); ${CP}` })
      const a2 = L.rel_stel_ppm ?? twa
      out.push({ level: 'alarm2', hazard: 'toxic', ppm: a2, basis: `${L.rel_stel_ppm ? 'STEL' : 'TWA'}; ${CP}` })
    } else {
      // Short-term limits only: the lower of ceiling and STEL drives both levels.
      const short = minOf(ceiling, L.rel_stel_ppm)
      if (short !== null) {
        const what = short === ceiling ? 'ceiling' : 'STEL'
        out.push({ level: 'alarm1', hazard: 'toxic', ppm: short / 2, basis: `½ × ${what}; ${CP}` })
        out.push({ level: 'alarm2', hazard: 'toxic', ppm: short, basis: `${what}; ${CP}` })
      }
    }
  }
  if (gas.lel_pct !== null) {
    const lelPpm = gas.lel_pct * 1e4
    out.push({ level: 'alarm1', hazard: 'flammable', ppm: 0.1 * lelPpm, basis: `10 % LEL; ${CP}` })
    out.push({ level: 'alarm2', hazard: 'flammable', ppm: 0.25 * lelPpm, basis: `25 % LEL (codes cite 25 % LFL; some sites use 20 %); ${CP}` })
  }
  if (gas.asphyxiant) {
    out.push({ level: 'alarm1', hazard: 'oxygen', ppm: ppmForOxygenPercent(19.5), basis: `O2 below 19.5 % (29 CFR 1910.134 oxygen-deficient, from memory); ${CP}` })
    out.push({ level: 'alarm2', hazard: 'oxygen', ppm: ppmForOxygenPercent(18), basis: `O2 below 18 % (some sites); ${CP}` })
  }
  return out
}
