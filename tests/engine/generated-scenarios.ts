// Generated scenarios for the property tests of issue 12 (step control, error estimate).
import type { simulate } from '../../shared/engine/simulate'
import type { ScenarioInput } from '../../shared/engine/scenario-schema'
import { rect } from './helpers'

/** Mulberry32: a small seeded generator, so a failure names a reproducible scenario. */
export function rng(seed: number) {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** A two-room floor (source room a, neighbour b) with a random mix of the terms that challenge the stepper. */
export function generated(seed: number): ScenarioInput {
  const r = rng(seed)
  const pick = <T>(xs: T[]) => xs[Math.floor(r() * xs.length)]!
  const wa = 3 + Math.round(r() * 2), wb = 3 + Math.round(r() * 3), depth = 3 + Math.round(r() * 2)
  const cell = pick([0.25, 0.3, 0.4]), layers = pick([4, 6, 8])
  const door = pick(['undercut', 'open', 'open-transfer', 'undercut-transfer'] as const)
  const down = r() < 0.4
  const exhaust = r() < 0.6
  const srcX = 0.6 + r() * (wa - 1.2), srcY = 0.6 + r() * (depth - 1.2), srcZ = 0.3 + r() * 2.2
  const kind = pick(['constant', 'instant', 'steady'] as const)
  const duration = kind === 'steady' ? 3600 : pick([900, 1800, 3600])
  const release: ScenarioInput['sources'][number]['release'] =
    kind === 'instant' ? { kind: 'instant', volume_m3: 0.005 + r() * 0.02, at_s: 0 }
      : kind === 'steady' ? { kind: 'constant', rate_m3_s: 2e-5 + r() * 1e-4 }
        : { kind: 'constant', rate_m3_s: 2e-5 + r() * 1e-4, start_s: 0, end_s: Math.round(duration * (0.3 + 0.4 * r())) }
  const yd = Math.min(depth - 1.2, 1 + r())
  const maxStep = pick([60, 60, 300])
  const transfer = door.endsWith('transfer') ? { flow_m3_s: 0.02 + r() * 0.1, into: 'b' } : undefined
  return {
    format: 'driftwarden-scenario/1',
    duration_s: duration,
    output_interval_s: 30,
    grid: { cell_m: cell, layers },
    ceiling_m: 3,
    rooms: [
      { id: 'a', polygon_m: rect(0, 0, wa, depth), ventilation: down ? { air_changes_per_hour: 0, downflow: { speed_m_s: 0.2 + r() * 0.25, exhaust_fraction: 0.05 + r() * 0.2 } } : { air_changes_per_hour: Math.round(r() * 20) } },
      { id: 'b', polygon_m: rect(wa, 0, wa + wb, depth), ventilation: { air_changes_per_hour: Math.round(2 + r() * 10) } },
    ],
    openings: [{ id: 'd', segment_m: [[wa, yd - 0.45], [wa, yd + 0.45]], open: door.startsWith('open'), ...(door.startsWith('undercut') ? { undercut_m: 0.01 + r() * 0.02 } : {}), ...(transfer ? { transfer } : {}) }],
    local_exhausts: exhaust ? [{ id: 'x', kind: 'gas_cabinet', position_m: [Math.min(wa - 0.2, srcX + 0.5), srcY, Math.min(2.8, srcZ + 0.2)], flow_m3_s: 0.05 + r() * 0.25 }] : [],
    gas: { id: 'NH3' },
    effective_diffusivity_m2_s: 0.002 + r() * 0.01,
    sources: [{ id: 's', position_m: [srcX, srcY, srcZ], release }],
    numerics: { max_time_step_s: maxStep },
    probes: [
      { id: 'near', position_m: [Math.max(0.2, srcX - 0.8), srcY, 1.5] },
      { id: 'room', position_m: [wa * 0.8, depth * 0.8, 1.2] },
      { id: 'door', position_m: [wa + 0.3, yd, 0.3] },
      { id: 'far', position_m: [wa + wb - 0.5, depth - 0.5, 1.5] },
    ],
  }
}

/** Worst probe error of `run` against `ref`: max over probes of max_t |Δ| / max(peak, 1 ppm) (as a fraction). */
export function worstProbeError(run: ReturnType<typeof simulate>, ref: ReturnType<typeof simulate>): { rel: number; probe: string } {
  let rel = 0, probe = ''
  for (const p of ref.probes) {
    const q = run.probes.find((x) => x.id === p.id)!
    let peak = 0, err = 0
    for (let k = 0; k < p.ppm.length; k++) { peak = Math.max(peak, p.ppm[k]!); err = Math.max(err, Math.abs(q.ppm[k]! - p.ppm[k]!)) }
    const e = peak >= 1 ? err / peak : err / 1 // below 1 ppm peak: relative to 1 ppm (0.01 ppm allowed)
    if (e > rel) { rel = e; probe = p.id }
  }
  return { rel, probe }
}

