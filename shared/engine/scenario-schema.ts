import { z } from 'zod'
import { GasSchema } from '../gases/gas-schema'

// The scenario file, version 1 (see shared/scenario-format.md), plus the documented Driftwarden
// extensions (shared/engine/README.md). Bounds reject absurd values before any work starts.

const finite = z.number().refine(Number.isFinite, 'must be a finite number')
const nonNeg = (max: number) => finite.min(0).max(max)
const pos = (max: number) => finite.gt(0).max(max)
const id = z.string().min(1).max(80)
const point2 = z.tuple([finite.min(-1e4).max(1e4), finite.min(-1e4).max(1e4)])
const point3 = z.tuple([finite.min(-1e4).max(1e4), finite.min(-1e4).max(1e4), finite.min(0).max(100)])
const DAY = 86400

/** Cleanroom unidirectional downflow through a raised floor into a recirculating return. */
export const DownflowSchema = z.object({
  /** Downward air speed, m/s. */
  speed_m_s: pos(2),
  /** Fraction of the recirculated air that is exhausted and replaced by clean make-up air (0–1). */
  exhaust_fraction: nonNeg(1),
}).strict()

export const VentilationSchema = z.object({
  /** Dilution ventilation (supply air clean), 1/h. Removal rate k = ACH/3600 s⁻¹. */
  air_changes_per_hour: nonNeg(2000).default(0),
  downflow: DownflowSchema.optional(),
}).strict()

export const RoomSchema = z.object({
  id,
  name: z.string().optional(),
  polygon_m: z.array(point2).min(3).max(1000),
  ventilation: VentilationSchema.default({ air_changes_per_hour: 0 }),
}).strict()

export const OpeningSchema = z.object({
  id,
  segment_m: z.tuple([point2, point2]),
  open: z.boolean(),
  /** Gap under a closed door, m: it leaks over the bottom layer (fraction gap/layer height). */
  undercut_m: nonNeg(0.1).optional(),
  /** Net transfer air through the opening from the pressure cascade. */
  transfer: z.object({
    /** Air flow, m³/s. */
    flow_m3_s: nonNeg(50),
    /** Id of the room the air flows into. */
    into: id,
  }).strict().optional(),
}).strict()

export const LocalExhaustSchema = z.object({
  id,
  kind: z.enum(['hood', 'gas_cabinet', 'exhausted_enclosure', 'other']).default('other'),
  position_m: point3,
  /** Air flow removed, m³/s. */
  flow_m3_s: pos(50),
  /** Radius of the capture zone, m (cells whose centre is within it share the flow). Default: 0.75 × cell. */
  capture_radius_m: pos(10).optional(),
}).strict()

const ConstantRelease = z.object({
  kind: z.literal('constant'),
  rate_m3_s: nonNeg(100),
  start_s: nonNeg(30 * DAY).default(0),
  end_s: nonNeg(30 * DAY).optional(),
  /** Total gas available, m³ (25 °C, 1 atm); the release stops when it is used up. */
  inventory_m3: pos(1e6).optional(),
}).strict()

const InstantRelease = z.object({
  kind: z.literal('instant'),
  volume_m3: pos(1e5),
  at_s: nonNeg(30 * DAY).default(0),
}).strict()

const ScheduleRelease = z.object({
  kind: z.literal('schedule'),
  /** [time_s, rate_m3_s] points; times strictly increasing. */
  points: z.array(z.tuple([nonNeg(30 * DAY), nonNeg(100)])).min(1).max(100000),
  /** "step": rate held until the next point; "linear": interpolated. After the last point the rate is 0. */
  interpolation: z.enum(['step', 'linear']).default('step'),
  inventory_m3: pos(1e6).optional(),
}).strict()

const CylinderRelease = z.object({
  kind: z.literal('cylinder'),
  /** Internal (water) volume of the cylinder, m³. */
  water_volume_m3: pos(10),
  /** Initial absolute pressure, Pa. */
  pressure_pa: finite.gt(0).max(1e8),
  temperature_k: finite.min(150).max(500).default(293.15),
  /** Leak orifice diameter, m. */
  orifice_diameter_m: pos(0.1),
  discharge_coefficient: finite.gt(0).max(1).default(1),
  /** Restrictive flow orifice in the cylinder valve, m; the flow is capped by the smaller of the two. */
  rfo_diameter_m: pos(0.05).optional(),
  rfo_discharge_coefficient: finite.gt(0).max(1).default(1),
  ambient_pressure_pa: finite.min(5e4).max(2e5).default(101325),
  start_s: nonNeg(30 * DAY).default(0),
  /** Liquefied gas: the vapour stays at this absolute pressure while liquid remains. */
  liquefied: z.object({ vapour_pressure_pa: finite.gt(0).max(1e8), contents_kg: pos(1e5) }).strict().optional(),
}).strict()

export const ReleaseSchema = z.discriminatedUnion('kind', [ConstantRelease, InstantRelease, ScheduleRelease, CylinderRelease])

export const SourceSchema = z.object({ id, position_m: point3, release: ReleaseSchema }).strict()
export const ProbeSchema = z.object({ id, position_m: point3 }).strict()

export const GasRefSchema = z.union([z.object({ id: z.string().min(1) }).strict(), GasSchema])

export const NumericsSchema = z.object({
  /** Fixed time step, s (disables the accuracy control). */
  time_step_s: pos(3600).optional(),
  /** Target local error per step of the accuracy control (relative). @default 0.00025 */
  tolerance: finite.min(1e-7).max(0.5).default(0.00025),
  /** Largest time step allowed, s. @default 60 */
  max_time_step_s: pos(3600).default(60),
  /** Implicitness of the transport terms: 1 = backward Euler, 0.5 = Crank-Nicolson (sinks stay backward Euler). @default 0.5 */
  theta: finite.min(0.5).max(1).default(0.5),
  /** First step after a release event, s (rounded down to the step ladder). @default 2 */
  initial_time_step_s: pos(600).default(2),
}).strict()

export const ScenarioSchema = z.object({
  format: z.literal('driftwarden-scenario/1'),
  name: z.string().optional(),
  duration_s: pos(30 * DAY),
  output_interval_s: pos(30 * DAY),
  grid: z.object({ cell_m: finite.min(0.01).max(10), layers: z.number().int().min(1).max(200) }).strict(),
  ceiling_m: pos(100),
  rooms: z.array(RoomSchema).min(1).max(500),
  openings: z.array(OpeningSchema).max(5000).default([]),
  local_exhausts: z.array(LocalExhaustSchema).max(1000).default([]),
  gas: GasRefSchema,
  effective_diffusivity_m2_s: pos(100).optional(),
  sources: z.array(SourceSchema).min(1).max(1000),
  probes: z.array(ProbeSchema).max(1000).default([]),
  /** Extra thresholds for the arrival fronts, ppm. */
  thresholds_ppm: z.array(pos(1e6)).max(20).default([]),
  /** Height of the breathing-zone snapshot and of the fronts, m. @default 1.5 */
  breathing_height_m: nonNeg(100).default(1.5),
  numerics: NumericsSchema.default({ tolerance: 0.00025, max_time_step_s: 60, initial_time_step_s: 2, theta: 0.5 }),
}).strict()

/** A scenario file as written (before defaults). */
export type ScenarioInput = z.input<typeof ScenarioSchema>
/** A parsed scenario with defaults filled in. */
export type Scenario = z.output<typeof ScenarioSchema>
export type Release = z.output<typeof ReleaseSchema>
export type Room = z.output<typeof RoomSchema>
export type Opening = z.output<typeof OpeningSchema>
