import type { ScenarioInput } from '../../shared/engine/scenario-schema'

/** Complementary error function, |error| < 1.2e-7 (Numerical Recipes erfcc, Chebyshev fit). */
export function erfc(x: number): number {
  const z = Math.abs(x)
  const t = 1 / (1 + 0.5 * z)
  const r = t * Math.exp(-z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 +
    t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))))
  return x >= 0 ? r : 2 - r
}

/** A rectangular room [x0, y0]–[x1, y1]. */
export function rect(x0: number, y0: number, x1: number, y1: number): [number, number][] {
  return [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]
}

/** A one-room scenario with the given overrides. */
export function oneRoom(over: Partial<ScenarioInput> & { size: [number, number]; ach?: number }): ScenarioInput {
  const { size, ach, ...rest } = over
  return {
    format: 'driftwarden-scenario/1',
    duration_s: 600,
    output_interval_s: 60,
    grid: { cell_m: 0.25, layers: 10 },
    ceiling_m: 3,
    rooms: [{ id: 'room', polygon_m: rect(0, 0, size[0], size[1]), ventilation: { air_changes_per_hour: ach ?? 0 } }],
    gas: { id: 'CO' },
    effective_diffusivity_m2_s: 0.005,
    sources: [{ id: 's', position_m: [1, 1, 1], release: { kind: 'instant', volume_m3: 0.01, at_s: 0 } }],
    probes: [],
    ...rest,
  }
}

/** Value of a probe's series at output time t (s). */
export function at(result: { times_s: Float64Array; probes: { id: string; ppm: Float64Array }[] }, id: string, t: number): number {
  const k = Array.from(result.times_s).findIndex((x) => Math.abs(x - t) < 1e-9)
  const p = result.probes.find((q) => q.id === id)
  if (k < 0 || !p) throw new Error(`no output ${id} at ${t}`)
  return p.ppm[k]!
}
