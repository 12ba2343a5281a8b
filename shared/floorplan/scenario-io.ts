import { defaultAlarmSetPoints } from '../gases/alarm-setpoints'
import { findGas } from '../gases/library'
import { ScenarioSchema, type ScenarioInput } from '../engine/scenario-schema'
import { checkPlan, isPlanValid, type CheckContext, type PlanProblem } from './checks'
import { emptyPlan, type Exhaust, type Plan, type Room, type Source } from './plan-schema'

/**
 * Conversion between a floor's plan and the engine's scenario file (shared/scenario-format.md,
 * zod schema in shared/engine/scenario-schema.ts). The export refuses an invalid plan with the
 * reasons; the import keeps what the plan can hold and reports what it could not.
 */

/** Standard atmosphere, Pa: plan pressures are gauge, the scenario's are absolute. */
export const ATMOSPHERE_PA = 101325

/** A gas line has no cylinder: it is exported as a large reservoir at the line pressure. */
export const LINE_RESERVOIR_M3 = 10

const EXHAUST_KIND_TO_SCENARIO = { hood: 'hood', cabinet: 'gas_cabinet', enclosure: 'exhausted_enclosure' } as const
const PROBE_PREFIX = { detector: 'detector:', workstation: 'workstation:' } as const

export interface ExportOptions extends CheckContext {
  name?: string
  /** Gas simulated; only its sources are exported. Default: the first source's gas. */
  gasId?: string
  /** @default 900 */
  durationS?: number
  /** @default 30 */
  outputIntervalS?: number
  /** @default 0.2 */
  cellM?: number
  /** @default 10 */
  layers?: number
}

export type ExportResult =
  | { ok: true; scenario: ScenarioInput; notes: string[] }
  | { ok: false; problems: PlanProblem[] }

function roomToScenario(room: Room) {
  const v = room.ventilation
  return {
    id: room.id,
    name: room.name || undefined,
    polygon_m: room.polygon.map(([x, y]) => [x, y] as [number, number]),
    ventilation: v.mode === 'ach'
      ? { air_changes_per_hour: v.airChangesPerHour }
      : { air_changes_per_hour: 0, downflow: { speed_m_s: v.downflowSpeedMS, exhaust_fraction: v.exhaustFraction } },
  }
}

function sourceToScenario(s: Source) {
  const pressure = s.pressurePa + ATMOSPHERE_PA
  const release = {
    kind: 'cylinder' as const,
    water_volume_m3: s.kind === 'line' || s.waterVolumeM3 === null ? LINE_RESERVOIR_M3 : s.waterVolumeM3,
    pressure_pa: pressure,
    orifice_diameter_m: s.restriction.diameterM,
    discharge_coefficient: s.dischargeCoefficient,
    // A restrictive flow orifice caps the flow whatever breaks downstream of it.
    ...(s.restriction.kind === 'rfo'
      ? { rfo_diameter_m: s.restriction.diameterM, rfo_discharge_coefficient: s.dischargeCoefficient }
      : {}),
    ...(s.liquefied && s.inventoryKg ? { liquefied: { vapour_pressure_pa: pressure, contents_kg: s.inventoryKg } } : {}),
  }
  return { id: s.id, position_m: [s.position[0], s.position[1], s.releaseHeightM] as [number, number, number], release }
}

function exhaustToScenario(e: Exhaust) {
  return {
    id: e.id,
    kind: EXHAUST_KIND_TO_SCENARIO[e.kind],
    position_m: [e.position[0], e.position[1], e.heightM] as [number, number, number],
    flow_m3_s: e.flowM3S,
  }
}

/**
 * Build the scenario file of a floor. Refused (ok: false) when the plan checks find errors, or when
 * there is no source of the chosen gas.
 */
export function planToScenario(plan: Plan, options: ExportOptions): ExportResult {
  const problems = checkPlan(plan, options)
  const gasId = options.gasId ?? plan.sources[0]?.gasId
  const sources = plan.sources.filter((s) => s.gasId === gasId)
  if (sources.length === 0 && plan.sources.length > 0) {
    problems.push({ code: 'no_sources', severity: 'error', path: 'sources', elementIds: [], message: `No source releases ${gasId}` })
  }
  if (!isPlanValid(problems)) return { ok: false, problems: problems.filter((p) => p.severity === 'error') }

  const notes: string[] = []
  const others = plan.sources.length - sources.length
  if (others > 0) notes.push(`${others} source(s) of other gases left out: the engine simulates one gas at a time`)
  if (plan.sources.some((s) => s.kind === 'line' && s.gasId === gasId)) {
    notes.push(`Gas lines are modelled as a ${LINE_RESERVOIR_M3} m³ reservoir at the line pressure`)
  }
  const scenario: ScenarioInput = {
    format: 'driftwarden-scenario/1',
    name: options.name,
    duration_s: options.durationS ?? 900,
    output_interval_s: options.outputIntervalS ?? 30,
    grid: { cell_m: options.cellM ?? 0.2, layers: options.layers ?? 10 },
    ceiling_m: options.ceilingM,
    rooms: plan.rooms.map(roomToScenario),
    openings: plan.openings.map((o) => ({ id: o.id, segment_m: [[...o.segment[0]], [...o.segment[1]]] as [[number, number], [number, number]], open: o.open })),
    local_exhausts: plan.exhausts.map(exhaustToScenario),
    gas: { id: gasId! },
    sources: sources.map(sourceToScenario),
    probes: [
      ...plan.detectors.map((d) => ({ id: PROBE_PREFIX.detector + d.id, position_m: [d.position[0], d.position[1], d.mountingHeightM] as [number, number, number] })),
      ...plan.workstations.map((w) => ({ id: PROBE_PREFIX.workstation + w.id, position_m: [w.position[0], w.position[1], w.breathingHeightM] as [number, number, number] })),
    ],
  }
  // The engine's own schema has the last word on bounds (e.g. a grid too fine for the floor).
  const parsed = ScenarioSchema.safeParse(scenario)
  if (!parsed.success) {
    return { ok: false, problems: parsed.error.issues.map((i) => ({ code: 'engine_input', severity: 'error' as const,
      message: `Scenario field ${i.path.join('.')}: ${i.message}`, path: i.path.join('.'), elementIds: [] })) }
  }
  return { ok: true, scenario, notes }
}

export interface ImportResult {
  plan: Plan
  ceilingM: number
  /** What could not be carried over exactly. */
  notes: string[]
}

/**
 * Read a scenario file into a plan. Throws the zod error when the file is not a valid scenario.
 * Probes become detectors (for the scenario's gas) or workstations, by the id prefix the export writes.
 */
export function scenarioToPlan(input: unknown): ImportResult {
  const s = ScenarioSchema.parse(input)
  const gasId = s.gas.id
  const notes: string[] = []
  const plan = emptyPlan()
  plan.rooms = s.rooms.map((r) => ({
    id: r.id,
    name: r.name ?? r.id,
    kind: r.ventilation.downflow ? 'cleanroom_bay' : 'other',
    polygon: r.polygon_m.map(([x, y]) => [x, y] as [number, number]),
    ventilation: r.ventilation.downflow
      ? { mode: 'downflow', downflowSpeedMS: r.ventilation.downflow.speed_m_s, exhaustFraction: r.ventilation.downflow.exhaust_fraction }
      : { mode: 'ach', airChangesPerHour: r.ventilation.air_changes_per_hour },
  }))
  plan.openings = s.openings.map((o) => ({ id: o.id, name: '', kind: 'door', open: o.open,
    segment: [[...o.segment_m[0]], [...o.segment_m[1]]] as [[number, number], [number, number]] }))
  plan.exhausts = s.local_exhausts.map((e) => ({
    id: e.id, name: '', position: [e.position_m[0], e.position_m[1]], heightM: e.position_m[2], flowM3S: e.flow_m3_s,
    kind: e.kind === 'hood' ? 'hood' : e.kind === 'gas_cabinet' ? 'cabinet' : 'enclosure',
  }))
  for (const src of s.sources) {
    const base = { id: src.id, name: '', gasId, position: [src.position_m[0], src.position_m[1]] as [number, number],
      releaseHeightM: src.position_m[2] }
    const r = src.release
    if (r.kind === 'cylinder') {
      plan.sources.push({ ...base, kind: r.water_volume_m3 >= LINE_RESERVOIR_M3 ? 'line' : 'cylinder',
        liquefied: Boolean(r.liquefied), inventoryKg: r.liquefied?.contents_kg ?? null,
        pressurePa: Math.max(0, r.pressure_pa - ATMOSPHERE_PA), waterVolumeM3: r.water_volume_m3 >= LINE_RESERVOIR_M3 ? null : r.water_volume_m3,
        restriction: { kind: r.rfo_diameter_m ? 'rfo' : 'orifice', diameterM: r.rfo_diameter_m ?? r.orifice_diameter_m },
        dischargeCoefficient: r.discharge_coefficient })
    } else {
      notes.push(`Source ${src.id}: a “${r.kind}” release has no place in a floor plan; it was imported as a cylinder with default values`)
      plan.sources.push({ ...base, kind: 'cylinder', liquefied: false, inventoryKg: null, pressurePa: 1e7, waterVolumeM3: 0.044,
        restriction: { kind: 'orifice', diameterM: 0.001 }, dischargeCoefficient: 0.62 })
    }
  }
  for (const p of s.probes) {
    const [x, y, z] = p.position_m
    if (p.id.startsWith(PROBE_PREFIX.workstation)) {
      plan.workstations.push({ id: p.id.slice(PROBE_PREFIX.workstation.length), name: '', position: [x, y], breathingHeightM: z })
    } else {
      const id = p.id.startsWith(PROBE_PREFIX.detector) ? p.id.slice(PROBE_PREFIX.detector.length) : p.id
      const gas = findGas(gasId)
      const [low, high] = gas ? defaultAlarmSetPoints(gas).map((a) => a.ppm) : []
      plan.detectors.push({ id, name: '', gasId, position: [x, y], mountingHeightM: z, alarmLowPpm: low ?? 1, alarmHighPpm: high ?? low ?? 2 })
      if (!p.id.startsWith(PROBE_PREFIX.detector)) notes.push(`Probe ${p.id} became a detector; set its alarm set points`)
    }
  }
  if ('name' in s.gas) notes.push(`The scenario defines gas ${gasId} inline; the plan refers to it by id only`)
  return { plan, ceilingM: s.ceiling_m, notes }
}
