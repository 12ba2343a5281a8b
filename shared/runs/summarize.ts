import { releaseHistory } from '../engine/releases'
import { ScenarioSchema, type ScenarioInput } from '../engine/scenario-schema'
import type { SimulationResult } from '../engine/simulate'
import type { Plan } from '../floorplan/plan-schema'
import { pointInPolygon } from '../geometry/polygon'
import type { LimitLine, ReceptorSummary, RoomSummary, RunFieldsMeta, RunSeries, RunSummary, ScenarioConfig } from '../schemas/runs'
import { limitIndexAt, limitLines } from './limits'

/** What a worker stores for one run: the summary JSON, the fields' layout, probe series and the Float32 planes. */
export interface StoredResult {
  summary: RunSummary
  meta: RunFieldsMeta
  series: RunSeries
  /** Breathing-height ppm, one nx·ny plane per output time, concatenated. */
  frames: Float32Array
  /** First-crossing time per limit (same order as meta.limits), concatenated. */
  fronts: Float32Array
  peak: Float32Array
}

const finiteOrNull = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : v)

function describeRelease(src: Plan['sources'][number], release: ReturnType<typeof ScenarioSchema.parse>['sources'][number]['release']): string {
  const r = release
  if (r.kind === 'constant') return `Constant ${r.rate_m3_s} m³/s${r.inventory_m3 ? ` until ${r.inventory_m3.toPrecision(3)} m³ are used` : ''}`
  if (r.kind === 'cylinder') {
    const dia = (r.rfo_diameter_m ?? r.orifice_diameter_m) * 1000
    const bar = ((r.pressure_pa - 101325) / 1e5).toFixed(1)
    return `Blow-down of ${src.kind === 'line' ? 'the line' : src.liquefied ? `${src.inventoryKg ?? '?'} kg liquefied gas` : 'the cylinder'} at ${bar} bar(g) through a ${dia.toPrecision(2)} mm ${r.rfo_diameter_m ? 'restrictive flow orifice' : 'orifice'}`
  }
  return r.kind
}

export function summarizeRun(r: SimulationResult, plan: Plan, config: ScenarioConfig, scenarioIn: ScenarioInput, notes: string[]): StoredResult {
  const scenario = ScenarioSchema.parse(scenarioIn)
  const { nx, ny } = r.grid
  const nPlan = nx * ny
  const limits = limitLines(r.thresholds, r.gas)
  const gasOrifice = { molarMass: r.gas.molar_mass_g_mol / 1000, gamma: r.gas.gamma }
  const roomOf = (x: number, y: number) => plan.rooms.find((room) => pointInPolygon([x, y], room.polygon)) ?? null

  const sources = scenario.sources.map((s) => {
    const planSrc = plan.sources.find((p) => p.id === s.id)!
    const h = releaseHistory(s.release, gasOrifice, scenario.duration_s)
    const room = roomOf(s.position_m[0], s.position_m[1])
    return {
      id: s.id, name: planSrc.name || s.id, roomId: room?.id ?? null, releasedM3: h.cumulative(scenario.duration_s),
      inventoryM3: finiteOrNull(h.total), description: describeRelease(planSrc, s.release),
    }
  })

  const byKey = (vals: (number | null)[]) => Object.fromEntries(limits.map((l, k) => [l.key, finiteOrNull(vals[k])]))
  const receptors: ReceptorSummary[] = []
  for (const p of r.probes) {
    const [kind, id] = p.id.startsWith('detector:') ? ['detector', p.id.slice(9)] as const : ['workstation', p.id.slice(12)] as const
    const el = kind === 'detector' ? plan.detectors.find((d) => d.id === id) : plan.workstations.find((w) => w.id === id)
    if (!el) continue
    const room = roomOf(el.position[0], el.position[1])
    const det = kind === 'detector' ? plan.detectors.find((d) => d.id === id)! : null
    const at = (ppm: number) => { const k = limitIndexAt(limits, ppm); return k < 0 ? null : finiteOrNull(p.first_exceed_s[k]) }
    receptors.push({
      id, kind, name: el.name || id, roomId: room?.id ?? null, roomName: room?.name ?? null,
      peakPpm: p.peak_ppm, peakTimeS: p.peak_time_s, maxStelPpm: p.max_twa15_ppm, firstExceedS: byKey(p.first_exceed_s),
      alarmLowPpm: det?.alarmLowPpm ?? null, alarmHighPpm: det?.alarmHighPpm ?? null,
      alarmLowS: det ? at(det.alarmLowPpm) : null, alarmHighS: det ? at(det.alarmHighPpm) : null,
    })
  }

  const last = r.breathing_ppm[r.breathing_ppm.length - 1]!
  const rooms: RoomSummary[] = r.grid.room_ids.map((roomId, ri) => {
    const planRoom = plan.rooms.find((x) => x.id === roomId)
    let peak = 0, sum = 0, n = 0
    const first = new Array<number>(limits.length).fill(Infinity)
    for (let pp = 0; pp < nPlan; pp++) {
      if (r.grid.room_of_cell[pp] !== ri) continue
      const pk = r.peak_ppm[pp]!
      if (pk > peak) peak = pk
      sum += last[pp]!
      n++
      for (let k = 0; k < limits.length; k++) { const t = r.fronts_s[k]![pp]!; if (t < first[k]!) first[k] = t }
    }
    return { id: roomId, name: planRoom?.name || roomId, kind: planRoom?.kind ?? 'other', peakPpm: peak, firstExceedS: byKey(first), finalMeanPpm: n ? sum / n : 0 }
  })

  let firstAlarm: RunSummary['firstAlarm'] = null
  for (const rc of receptors) {
    if (rc.kind !== 'detector') continue
    for (const [level, t] of [['low', rc.alarmLowS], ['high', rc.alarmHighS]] as const) {
      if (t !== null && (firstAlarm === null || t < firstAlarm.timeS || (t === firstAlarm.timeS && level === 'low' && firstAlarm.level === 'high'))) {
        firstAlarm = { detectorId: rc.id, level, timeS: t }
      }
    }
  }

  const mb = r.mass_balance
  const summary: RunSummary = {
    gas: { id: r.gas.id, name: r.gas.name, asphyxiant: r.gas.asphyxiant, flammable: r.gas.lel_pct !== null, pyrophoric: r.gas.pyrophoric, molarMassGMol: r.gas.molar_mass_g_mol },
    limits,
    sources,
    durationS: scenario.duration_s,
    outputIntervalS: scenario.output_interval_s,
    ventilationState: config.ventilationState,
    diffusivityM2S: r.diffusivity_m2_s,
    diffusivityBasis: r.diffusivity_basis,
    massBalance: { releasedM3: mb.released_m3, inAirM3: mb.in_air_m3, removedM3: mb.removed_m3, closureError: mb.closure_error },
    receptors,
    rooms,
    firstAlarm,
    cells: r.stats.cells,
    wallS: r.stats.wall_s,
    notes: [...notes, `Grid ${nx} × ${r.grid.ny} × ${r.grid.nz} cells of ${r.grid.cell_m} m; ${r.stats.steps} time steps (${r.stats.solver})`],
  }

  const frames = new Float32Array(r.breathing_ppm.length * nPlan)
  r.breathing_ppm.forEach((f, k) => frames.set(f, k * nPlan))
  const fronts = new Float32Array(limits.length * nPlan)
  r.fronts_s.forEach((f, k) => fronts.set(f, k * nPlan))
  const times = Array.from(r.times_s)
  const series: RunSeries = { timesS: times, series: {} }
  for (const p of r.probes) series.series[p.id.replace(/^(detector|workstation):/, '')] = Array.from(p.ppm, (v) => Number(v.toPrecision(5)))

  return {
    summary,
    meta: { nx, ny, cellM: r.grid.cell_m, originM: [r.grid.origin_m[0], r.grid.origin_m[1]], breathingHeightM: scenario.breathing_height_m, timesS: times, limits, roomIds: r.grid.room_ids },
    series, frames, fronts, peak: Float32Array.from(r.peak_ppm),
  }
}

/** Concentration at a plan point from one plane (nearest cell; NaN outside the air). */
export function sampleAt(meta: Pick<RunFieldsMeta, 'nx' | 'ny' | 'cellM' | 'originM'>, plane: Float32Array | ArrayLike<number>, x: number, y: number): number {
  const i = Math.floor((x - meta.originM[0]) / meta.cellM)
  const j = Math.floor((y - meta.originM[1]) / meta.cellM)
  if (i < 0 || j < 0 || i >= meta.nx || j >= meta.ny) return NaN
  return plane[i + meta.nx * j]!
}

export type { LimitLine }
