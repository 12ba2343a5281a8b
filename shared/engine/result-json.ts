import type { SimulationResult } from './simulate'

const round = (v: number, sig = 6) => (v === 0 || !Number.isFinite(v) ? v : Number(v.toPrecision(sig)))

/** Options of {@link resultToJson}. */
export interface ResultJsonOptions {
  /** Include the plan fields (snapshots, fronts, peaks): large. Non-air cells are -1, "never" is null. */
  fields?: boolean
}

/**
 * The CLI result (shared/scenario-format.md) plus documented extras. Plain JSON: no typed arrays,
 * no NaN or Infinity.
 */
export function resultToJson(r: SimulationResult, opts: ResultJsonOptions = {}) {
  const lel = r.gas.lel_pct
  const probes: Record<string, unknown> = {}
  for (const p of r.probes) {
    const ppm = Array.from(p.ppm, (v) => round(v))
    probes[p.id] = {
      ppm,
      peak_ppm: round(p.peak_ppm),
      peak_time_s: round(p.peak_time_s),
      max_twa15_ppm: round(p.max_twa15_ppm),
      ...(p.grid_sensitivity_pct !== null ? { grid_sensitivity_pct: round(p.grid_sensitivity_pct, 3) } : {}),
      first_exceed_s: Object.fromEntries(r.thresholds.map((t, k) => [t.label, p.first_exceed_s[k] === null ? null : round(p.first_exceed_s[k]!)])),
      o2_percent: ppm.map((v) => round(20.9 * (1 - Math.min(v, 1e6) / 1e6), 5)),
      ...(lel !== null ? { percent_lel: ppm.map((v) => round(v / (lel * 100), 5)) } : {}),
    }
  }
  const mb = r.mass_balance
  const out: Record<string, unknown> = {
    times_s: Array.from(r.times_s),
    probes,
    mass_balance: {
      released_m3: round(mb.released_m3, 10), in_air_m3: round(mb.in_air_m3, 10), removed_m3: round(mb.removed_m3, 10),
      removed_by: { ventilation_m3: round(mb.removed_by.ventilation_m3, 10), local_exhaust_m3: round(mb.removed_by.local_exhaust_m3, 10), downflow_exhaust_m3: round(mb.removed_by.downflow_exhaust_m3, 10) },
      closure_error: mb.closure_error,
    },
    diffusivity_m2_s: round(r.diffusivity_m2_s),
    diffusivity_basis: r.diffusivity_basis,
    gas: { id: r.gas.id, name: r.gas.name },
    thresholds: r.thresholds.map((t) => ({ label: t.label, ppm: round(t.ppm) })),
    grid: { nx: r.grid.nx, ny: r.grid.ny, nz: r.grid.nz, cell_m: r.grid.cell_m, layer_m: round(r.grid.layer_m), origin_m: r.grid.origin_m },
    error_control: r.error_control,
    error_estimate: r.error_estimate.grid ? { grid: { ...r.error_estimate.grid, worst_probe_pct: r.error_estimate.grid.worst_probe_pct === null ? null : round(r.error_estimate.grid.worst_probe_pct, 3) } } : { grid: null },
    stats: { ...r.stats, wall_s: round(r.stats.wall_s, 4) },
  }
  if (opts.fields) {
    const plain = (a: Float32Array) => Array.from(a, (v) => (Number.isNaN(v) ? -1 : Number.isFinite(v) ? round(v, 5) : null))
    out.fields = {
      breathing_ppm: r.breathing_ppm.map(plain), column_max_ppm: r.column_max_ppm.map(plain),
      fronts_s: Object.fromEntries(r.thresholds.map((t, k) => [t.label, plain(r.fronts_s[k]!)])),
      peak_ppm: plain(r.peak_ppm), max_twa15_ppm: plain(r.max_twa15_ppm),
    }
  }
  return out
}
