import type { Threshold } from '../engine/thresholds'
import type { Gas } from '../gases/gas-schema'
import { defaultAlarmSetPoints } from '../gases/alarm-setpoints'
import type { LimitLine } from '../schemas/runs'

const KEY_OF: Record<string, { key: string; name: string; source: string }> = {
  'REL-TWA': { key: 'rel_twa', name: 'NIOSH REL (TWA)', source: 'NIOSH Pocket Guide' },
  'REL-STEL': { key: 'rel_stel', name: 'NIOSH REL (STEL)', source: 'NIOSH Pocket Guide' },
  'REL-C': { key: 'ceiling', name: 'NIOSH REL (ceiling)', source: 'NIOSH Pocket Guide' },
  'PEL-TWA': { key: 'pel_twa', name: 'OSHA PEL (TWA)', source: 'OSHA 29 CFR 1910.1000 Z-1' },
  'PEL-C': { key: 'pel_ceiling', name: 'OSHA PEL (ceiling)', source: 'OSHA 29 CFR 1910.1000 Z-1' },
  IDLH: { key: 'idlh', name: 'IDLH', source: 'NIOSH IDLH values' },
  '10% LEL': { key: 'lel_10', name: '10 % LEL', source: 'Common practice (first flammable alarm)' },
  '25% LEL': { key: 'lel_25', name: '25 % LEL', source: 'IBC 415.11 / common practice' },
  LEL: { key: 'lel_100', name: 'LEL', source: 'Gas library (lower explosive limit)' },
  'O2 19.5%': { key: 'o2_19_5', name: 'O2 19.5 %', source: '29 CFR 1910.134 (oxygen-deficient)' },
  'O2 18%': { key: 'o2_18', name: 'O2 18 %', source: 'Common practice (some sites)' },
}

/**
 * The engine's thresholds (ascending, merged where equal) as named limit lines. Set points we asked for
 * become "alarm_<ppm>" lines named after the default alarm level they match, or the detector set point.
 */
export function limitLines(thresholds: readonly Threshold[], gas: Gas): LimitLine[] {
  const defaults = defaultAlarmSetPoints(gas)
  const used = new Set<string>()
  return thresholds.map((t) => {
    const parts = t.label.split(', ')
    const known = parts.map((p) => KEY_OF[p]).filter((x): x is NonNullable<typeof x> => !!x)
    const alarm = defaults.find((a) => Math.abs(a.ppm - t.ppm) <= 1e-9 * t.ppm)
    let key: string
    let label: string
    let source: string
    if (known.length) {
      key = known[0]!.key
      label = known.map((k) => k.name).join(' = ')
      source = known.map((k) => k.source).join('; ')
      if (alarm) label += ` (default ${alarm.level === 'alarm1' ? 'alarm 1' : 'alarm 2'})`
    } else if (alarm) {
      key = `alarm_${fmtKey(t.ppm)}`
      label = `Default ${alarm.level === 'alarm1' ? 'alarm 1' : 'alarm 2'} set point (${alarm.hazard})`
      source = alarm.basis
    } else {
      key = `setpoint_${fmtKey(t.ppm)}`
      label = `Detector set point ${t.ppm < 1 ? t.ppm.toPrecision(2) : Math.round(t.ppm * 100) / 100} ppm`
      source = "The floor's detector set points"
    }
    while (used.has(key)) key += '_'
    used.add(key)
    return { key, label, ppm: t.ppm, source }
  })
}

function fmtKey(ppm: number) {
  return String(Number(ppm.toPrecision(6))).replace('.', '_')
}

/** Index of the limit line at exactly this concentration (the set points are tracked exactly). */
export function limitIndexAt(limits: readonly LimitLine[], ppm: number): number {
  return limits.findIndex((l) => Math.abs(l.ppm - ppm) <= 1e-9 * Math.max(ppm, 1e-12))
}
