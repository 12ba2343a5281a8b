import { z } from 'zod'
import { DbId } from './common'

/**
 * Scenarios, runs and their summaries. The summary is what plans, drills and the results page read;
 * the bulky per-cell data (snapshots, fronts) is stored separately as Float32 frames.
 */

/** The ventilation condition a scenario assumes, so the same leak can be compared under several. */
export const VENTILATION_STATES = ['normal', 'exhaust_failed', 'door_propped_open', 'downflow_off'] as const
export const VentilationState = z.enum(VENTILATION_STATES)
export type VentilationState = z.infer<typeof VentilationState>
export const VENTILATION_STATE_LABELS: Record<VentilationState, string> = {
  normal: 'Normal ventilation',
  exhaust_failed: 'Exhaust failed (local exhausts and room extract off)',
  door_propped_open: 'Door propped open',
  downflow_off: 'Cleanroom downflow off',
}

/** What an officer saves as a scenario on a floor. */
export const ScenarioConfig = z.object({
  name: z.string().trim().min(1, 'Required').max(120),
  /** Plan source ids that leak together (a sweep runs each of them alone instead). */
  sourceIds: z.array(z.string().min(1)).min(1, 'Pick at least one source').max(50),
  /** Release basis: the whole contents blowing down through the valve orifice or capped by the RFO. */
  release: z.enum(['blowdown', 'constant']).default('blowdown'),
  /** For release = constant: pure-gas flow, m³/s at 25 °C and 1 atm. */
  constantRateM3S: z.number().positive().max(10).optional(),
  durationS: z.number().int().min(60, 'At least 60 s').max(4 * 3600, 'At most 4 hours'),
  outputIntervalS: z.number().int().min(1).max(600).default(10),
  ventilationState: VentilationState.default('normal'),
  /** For door_propped_open: the opening ids held open. */
  proppedOpeningIds: z.array(z.string()).max(50).default([]),
  /** Overrides the engine's documented eddy-diffusivity estimate, m²/s. */
  diffusivityM2S: z.number().positive().max(1).optional(),
  cellM: z.number().min(0.1).max(2).default(0.25),
  layers: z.number().int().min(1).max(30).default(6),
  /**
   * Sensitivity bundle (issue 17): with `enabled`, a run of this scenario also queues D ×0.3 and ×3, the named
   * ventilation failure and the leak at nearby positions as separate runs (shared/runs/bundle.ts). Absent: off.
   */
  sensitivity: z.object({
    enabled: z.boolean().default(true),
    /** The ventilation failure to test beside the scenario's own state (none: no ventilation case). */
    ventilationFailure: z.enum(['exhaust_failed', 'door_propped_open', 'downflow_off']).nullable().default(null),
    /** Also move the leak by 1 m each way (inside its room) and keep the worst. */
    positions: z.boolean().default(true),
  }).optional(),
  /** Set by a bundle's position case: every leaking source moved by this much in plan x and y, m. */
  sourceOffsetM: z.tuple([z.number().min(-5).max(5), z.number().min(-5).max(5)]).optional(),
})
export type ScenarioConfig = z.infer<typeof ScenarioConfig>

/** PUT /api/scenarios/:id: the settings plus, optionally, the scenario's updatedAt as read (409 stale_version when changed since, issue 14). */
export const ScenarioChange = ScenarioConfig.extend({
  updatedAt: z.iso.datetime({ offset: true, message: 'A date-time as the scenario gave it (updatedAt)' }).optional(),
})
export type ScenarioChange = z.infer<typeof ScenarioChange>

export const RUN_STATUSES = ['queued', 'running', 'succeeded', 'failed', 'cancelled'] as const
export const RunStatus = z.enum(RUN_STATUSES)
export type RunStatus = z.infer<typeof RunStatus>

/** One limit line: its key, a label naming it and its source, and the level in the display unit. */
export const LimitLine = z.object({
  /** e.g. "rel_twa", "rel_stel", "ceiling", "idlh", "lel_10", "lel_25", "o2_19_5", "alarm_low", "alarm_high". */
  key: z.string(),
  label: z.string(),
  /** Concentration of the released gas at this limit, ppm (for oxygen: the ppm that brings O2 to the level). */
  ppm: z.number(),
  /** Where the value comes from (NIOSH Pocket Guide, OSHA Z-1, 29 CFR 1910.134, common practice...). */
  source: z.string(),
})
export type LimitLine = z.infer<typeof LimitLine>

/** A detector or workstation's predicted exposure. Times are seconds from the start of the release; null = never within the run. */
export const ReceptorSummary = z.object({
  id: z.string(),
  kind: z.enum(['detector', 'workstation']),
  name: z.string(),
  roomId: z.string().nullable(),
  roomName: z.string().nullable(),
  peakPpm: z.number(),
  peakTimeS: z.number(),
  /** Highest 15-minute average, ppm. */
  maxStelPpm: z.number(),
  /** Time at which each limit (LimitLine.key) is first exceeded. */
  firstExceedS: z.record(z.string(), z.number().nullable()),
  /** Detectors only: their own set points and when they trip. */
  alarmLowPpm: z.number().nullable(),
  alarmHighPpm: z.number().nullable(),
  alarmLowS: z.number().nullable(),
  alarmHighS: z.number().nullable(),
})
export type ReceptorSummary = z.infer<typeof ReceptorSummary>

/** Per room: the first time any breathing-height cell of the room crosses a critical level. */
export const RoomSummary = z.object({
  id: z.string(),
  name: z.string(),
  kind: z.string(),
  peakPpm: z.number(),
  firstExceedS: z.record(z.string(), z.number().nullable()),
  /** Room-average concentration at the end of the run, ppm. */
  finalMeanPpm: z.number(),
})
export type RoomSummary = z.infer<typeof RoomSummary>

/** The compact result every downstream feature (plans, drills, PDFs) reads. */
export const RunSummary = z.object({
  gas: z.object({ id: z.string(), name: z.string(), asphyxiant: z.boolean(), flammable: z.boolean(), pyrophoric: z.boolean(), molarMassGMol: z.number() }),
  limits: z.array(LimitLine),
  sources: z.array(z.object({ id: z.string(), name: z.string(), roomId: z.string().nullable(), releasedM3: z.number(), inventoryM3: z.number().nullable(), description: z.string() })),
  durationS: z.number(),
  outputIntervalS: z.number(),
  ventilationState: VentilationState,
  diffusivityM2S: z.number(),
  diffusivityBasis: z.string(),
  massBalance: z.object({ releasedM3: z.number(), inAirM3: z.number(), removedM3: z.number(), closureError: z.number() }),
  receptors: z.array(ReceptorSummary),
  rooms: z.array(RoomSummary),
  /** The first detector to reach its low (warning) alarm, if any. */
  firstAlarm: z.object({ detectorId: z.string(), level: z.enum(['low', 'high']), timeS: z.number() }).nullable(),
  cells: z.number(),
  wallS: z.number(),
  notes: z.array(z.string()),
})
export type RunSummary = z.infer<typeof RunSummary>

export const Run = z.object({
  id: z.number().int(),
  scenarioId: z.number().int().nullable(),
  floorId: z.number().int(),
  batchId: z.number().int().nullable(),
  label: z.string(),
  status: RunStatus,
  progress: z.number().min(0).max(1),
  message: z.string().nullable(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
  summary: RunSummary.nullable(),
})
export type Run = z.infer<typeof Run>

// ---------------------------------------------------------------------------------------------------------------
// Additions for scenarios, stored fields, sweeps and the detector advisor (all new shapes; the ones above are fixed).

/** A saved scenario as the API returns it. */
export const ScenarioRecord = z.object({
  id: z.number().int(),
  floorId: z.number().int(),
  name: z.string(),
  config: ScenarioConfig,
  createdAt: z.string(),
  updatedAt: z.string(),
  lastRun: z.object({ id: z.number().int(), status: RunStatus, progress: z.number(), createdAt: z.string() }).nullable(),
})
export type ScenarioRecord = z.infer<typeof ScenarioRecord>
export const ScenarioList = z.object({ scenarios: z.array(ScenarioRecord) })

/** A run in a list (no summary). */
export const RunListItem = Run.omit({ summary: true }).extend({
  gasId: z.string().nullable().optional(),
  ventilationState: VentilationState.optional(),
})
export type RunListItem = z.infer<typeof RunListItem>
export const RunList = z.object({ runs: z.array(RunListItem) })

/**
 * Layout of the binary fields of a run (GET /api/runs/:id/fields, application/octet-stream): little-endian
 * Float32 planes of nx·ny values (index i + nx·j, cell centre at origin + (i + ½, j + ½)·cell). NaN = not air.
 * The body is: `frames` planes of breathing-height ppm (one per time), then one front plane per limit
 * (first time, s, the place reaches the limit; +Infinity = never within the run), then one peak-ppm plane.
 */
export const RunFieldsMeta = z.object({
  nx: z.number().int(),
  ny: z.number().int(),
  cellM: z.number(),
  originM: z.tuple([z.number(), z.number()]),
  breathingHeightM: z.number(),
  timesS: z.array(z.number()),
  /** Same order as the front planes. */
  limits: z.array(LimitLine),
  roomIds: z.array(z.string()),
})
export type RunFieldsMeta = z.infer<typeof RunFieldsMeta>

/** Time series at each detector and workstation (ppm at each output time). */
export const RunSeries = z.object({ timesS: z.array(z.number()), series: z.record(z.string(), z.array(z.number())) })
export type RunSeries = z.infer<typeof RunSeries>

export const RunDetail = Run.extend({
  meta: RunFieldsMeta.nullable(),
  config: ScenarioConfig,
  floorVersion: z.number().int(),
  attempts: z.number().int(),
  canRun: z.boolean(),
})
export type RunDetail = z.infer<typeof RunDetail>

export const SweepInput = z.object({
  /** The leak and conditions; sourceIds here are the sources swept, each run alone. */
  config: ScenarioConfig,
})
export type SweepInput = z.infer<typeof SweepInput>

/** Per workstation: the worst source (earliest crossing of each limit, highest peak) over a sweep. */
export const SweepWorstCase = z.object({
  workstationId: z.string(),
  name: z.string(),
  peakPpm: z.number(),
  peakSourceId: z.string().nullable(),
  firstExceed: z.record(z.string(), z.object({ timeS: z.number().nullable(), sourceId: z.string().nullable() })),
})
export type SweepWorstCase = z.infer<typeof SweepWorstCase>

export const SweepDetail = z.object({
  id: z.number().int(),
  floorId: z.number().int(),
  label: z.string(),
  createdAt: z.string(),
  runs: z.array(RunListItem.extend({ sourceId: z.string() })),
  limits: z.array(LimitLine),
  worstCase: z.array(SweepWorstCase),
  complete: z.boolean(),
})
export type SweepDetail = z.infer<typeof SweepDetail>

const Point = z.tuple([z.number().min(-1e4).max(1e4), z.number().min(-1e4).max(1e4)])

export const AdvisorRequest = z.object({
  /** Finished runs (leak scenarios) of this floor to cover. */
  runIds: z.array(DbId).min(1, 'Pick at least one run').max(50),
  /** Candidate mounting points picked on the plan; or give gridSpacingM for a grid over the rooms. */
  candidates: z.array(Point).max(2000).default([]),
  gridSpacingM: z.number().min(0.25, 'At least 0.25 m').max(20).optional(),
  count: z.number().int().min(1, 'At least 1').max(20, 'At most 20'),
  /** Limit key (of the runs' limits) used as the alarm set point; default: the gas's default alarm 1. */
  limitKey: z.string().optional(),
  /** Coverage deadline: a scenario counts as covered when some detector alarms within this time. */
  deadlineS: z.number().positive().max(86400).default(120),
})
export type AdvisorRequest = z.infer<typeof AdvisorRequest>

export const AdvisorProposal = z.object({
  method: z.enum(['exhaustive', 'greedy']),
  guarantee: z.string(),
  limit: LimitLine,
  setPointBasis: z.string(),
  deadlineS: z.number(),
  mountingHeightM: z.number(),
  mountingBasis: z.string(),
  chosen: z.array(z.object({ position: Point, roomId: z.string().nullable(), roomName: z.string().nullable() })),
  /** Worst case over the scenarios of the time to first alarm (s); null = some scenario never alarms. */
  worstTimeS: z.number().nullable(),
  coverage: z.number(),
  perRun: z.array(z.object({ runId: z.number().int(), label: z.string(), timeS: z.number().nullable(), byIndex: z.number().int().nullable() })),
  /** Coverage-maximising greedy choice for the same count (the (1 − 1/e) bound applies to it). */
  coverageChoice: z.object({ positions: z.array(Point), covered: z.number() }),
  candidatesEvaluated: z.number().int(),
  notes: z.array(z.string()),
  gasId: z.string(),
  /** Set points proposed for the new detectors (the gas's defaults: common practice, to be set by the site). */
  alarmLowPpm: z.number(),
  alarmHighPpm: z.number(),
})
export type AdvisorProposal = z.infer<typeof AdvisorProposal>

export const AdvisorAccept = z.object({
  /** The floor version the officer saw; a newer save answers 409. */
  version: DbId,
  gasId: z.string().min(1),
  positions: z.array(Point).min(1).max(20),
  mountingHeightM: z.number().min(0).max(20),
  alarmLowPpm: z.number().positive().max(1e6),
  alarmHighPpm: z.number().positive().max(1e6),
})
export type AdvisorAccept = z.infer<typeof AdvisorAccept>
