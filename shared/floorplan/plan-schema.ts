import { z } from 'zod'

/**
 * The floor-plan document: everything drawn on one floor, stored as one JSON value (floors.plan).
 *
 * Conventions: x to the east, y to the north, z up from the floor, all in metres; every quantity SI
 * (m³/s, m/s, Pa gauge, m³, kg) except air change rates, which are per hour as every standard quotes them.
 * Every element has a stable string id that survives edits, undo and export.
 */

const finite = z.number().finite()
const nonNegative = finite.min(0, 'Cannot be negative')
const positive = finite.positive('Must be more than zero')

/** Plan coordinates stay within this distance of the origin, metres (issue 14: a room at 1e300 m was saved). */
export const PLAN_COORD_LIMIT_M = 5000
const coord = finite.min(-PLAN_COORD_LIMIT_M, `Within ${PLAN_COORD_LIMIT_M} m of the plan origin`).max(PLAN_COORD_LIMIT_M, `Within ${PLAN_COORD_LIMIT_M} m of the plan origin`)
/** A plan point [x, y] in metres. */
export const PlanPoint = z.tuple([coord, coord])
export type PlanPoint = z.infer<typeof PlanPoint>

export const ElementId = z.string().trim().min(1, 'Required').max(64, 'At most 64 characters')
const Label = z.string().trim().max(120, 'At most 120 characters')

export const ROOM_KINDS = ['gas_room', 'lab', 'corridor', 'cleanroom_bay', 'other'] as const
export const RoomKind = z.enum(ROOM_KINDS)
export type RoomKind = z.infer<typeof RoomKind>
export const ROOM_KIND_LABELS: Record<RoomKind, string> = {
  gas_room: 'Gas room',
  lab: 'Lab',
  corridor: 'Corridor',
  cleanroom_bay: 'Cleanroom bay',
  other: 'Other',
}

/**
 * How a room is ventilated. `ach`: dilution at a number of air changes per hour.
 * `downflow`: a cleanroom bay with laminar downflow (m/s) of which `exhaustFraction` (0–1) of the
 * recirculated air is exhausted rather than returned.
 */
export const Ventilation = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('ach'), airChangesPerHour: nonNegative.max(1000, 'At most 1000 per hour') }),
  z.object({
    mode: z.literal('downflow'),
    downflowSpeedMS: positive.max(2, 'At most 2 m/s'),
    exhaustFraction: nonNegative.max(1, 'A fraction between 0 and 1'),
  }),
])
export type Ventilation = z.infer<typeof Ventilation>

export const Room = z.object({
  id: ElementId,
  name: Label,
  kind: RoomKind,
  /** Outline vertices in metres, without the closing repeat. */
  polygon: z.array(PlanPoint).min(3, 'A room needs at least 3 corners').max(200, 'At most 200 corners'),
  ventilation: Ventilation,
})
export type Room = z.infer<typeof Room>

export const OPENING_KINDS = ['door', 'pass_through'] as const

/** Where an exit door leads: outdoors, a protected stair, or a protected (separately ventilated) corridor. */
export const EXIT_KINDS = ['outdoors', 'stair', 'protected_corridor'] as const
export const ExitKind = z.enum(EXIT_KINDS)
export type ExitKind = z.infer<typeof ExitKind>
export const EXIT_KIND_LABELS: Record<ExitKind, string> = {
  outdoors: 'Exit to outdoors',
  stair: 'Exit to a stair',
  protected_corridor: 'Exit to a protected corridor',
}

export const Opening = z.object({
  id: ElementId,
  name: Label,
  kind: z.enum(OPENING_KINDS),
  /** End points of the opening on a wall, metres. */
  segment: z.tuple([PlanPoint, PlanPoint]),
  /** Open by default (a door held open, an open hatch), or closed. */
  open: z.boolean(),
  /** Set on a door that is an exit of the floor (egress routes end there); absent or null: not an exit. */
  exit: ExitKind.nullable().optional(),
})
export type Opening = z.infer<typeof Opening>

export const SOURCE_KINDS = ['cylinder', 'gas_cabinet', 'line'] as const
export const SOURCE_KIND_LABELS: Record<(typeof SOURCE_KINDS)[number], string> = {
  cylinder: 'Cylinder',
  gas_cabinet: 'Gas cabinet',
  line: 'Gas line',
}

/** The flow restriction a release passes through: a plain orifice or a restrictive flow orifice (RFO). */
export const Restriction = z.object({
  kind: z.enum(['orifice', 'rfo']),
  /** Diameter, metres. */
  diameterM: positive.max(0.1, 'At most 100 mm'),
})

export const Source = z.object({
  id: ElementId,
  name: Label,
  kind: z.enum(SOURCE_KINDS),
  /** Gas library id, e.g. "NH3". Checked against the library by the plan checks, not here. */
  gasId: z.string().trim().min(1, 'Choose a gas').max(32),
  position: PlanPoint,
  /** Height of the release above the floor, metres. */
  releaseHeightM: nonNegative.max(20, 'At most 20 m'),
  /** Gas inventory, kg (null when unknown, e.g. a line fed from elsewhere). */
  inventoryKg: nonNegative.nullable(),
  /** Liquefied gas (ammonia, chlorine…): the pressure is the vapour pressure, held while liquid remains. */
  liquefied: z.boolean(),
  /** Gauge pressure upstream of the restriction, Pa. */
  pressurePa: nonNegative.max(1e8, 'At most 1000 bar'),
  /** Internal (water) volume of the cylinder, m³ (null for lines). */
  waterVolumeM3: positive.max(10, 'At most 10 m³').nullable(),
  restriction: Restriction,
  /** Discharge coefficient of the restriction (0–1]. */
  dischargeCoefficient: positive.max(1, 'At most 1'),
})
export type Source = z.infer<typeof Source>

export const Detector = z.object({
  id: ElementId,
  name: Label,
  gasId: z.string().trim().min(1, 'Choose a gas').max(32),
  position: PlanPoint,
  mountingHeightM: nonNegative.max(20, 'At most 20 m'),
  /** First (warning) alarm set point, ppm by volume. */
  alarmLowPpm: positive.max(1e6, 'At most 1 000 000 ppm'),
  /** Second (evacuation) alarm set point, ppm by volume. */
  alarmHighPpm: positive.max(1e6, 'At most 1 000 000 ppm'),
})
export type Detector = z.infer<typeof Detector>

export const EXHAUST_KINDS = ['hood', 'cabinet', 'enclosure'] as const
export const Exhaust = z.object({
  id: ElementId,
  name: Label,
  kind: z.enum(EXHAUST_KINDS),
  position: PlanPoint,
  /** Height of the capture point above the floor, metres. */
  heightM: nonNegative.max(20, 'At most 20 m'),
  /** Extracted flow, m³/s. */
  flowM3S: positive.max(50, 'At most 50 m³/s'),
})
export type Exhaust = z.infer<typeof Exhaust>

export const Workstation = z.object({
  id: ElementId,
  name: Label,
  position: PlanPoint,
  /** Breathing-zone height of the person working here, metres (1.5 m standing, 1.1 m seated). */
  breathingHeightM: nonNegative.max(5, 'At most 5 m'),
})
export type Workstation = z.infer<typeof Workstation>

/**
 * A traced image under the drawing: `originM` is where the image's top-left corner sits on the plan
 * and `metresPerPixel` its scale (set by calibration). Image y grows downwards, plan y northwards.
 */
export const Underlay = z.object({
  imageId: z.number().int().positive(),
  originM: PlanPoint,
  metresPerPixel: positive.max(10),
  opacity: nonNegative.max(1),
})
export type Underlay = z.infer<typeof Underlay>

/** Where people gather after leaving (outside the drawn rooms as a rule); drawn on the plan and named in the plan's Evacuation section. */
export const AssemblyPoint = z.object({
  id: ElementId,
  name: Label,
  position: PlanPoint,
})
export type AssemblyPoint = z.infer<typeof AssemblyPoint>

export const Plan = z.object({
  rooms: z.array(Room).max(500),
  openings: z.array(Opening).max(2000),
  sources: z.array(Source).max(500),
  detectors: z.array(Detector).max(2000),
  exhausts: z.array(Exhaust).max(1000),
  workstations: z.array(Workstation).max(2000),
  underlay: Underlay.nullable().default(null),
  /** Optional so that plans saved before assembly points existed keep parsing unchanged. */
  assemblyPoints: z.array(AssemblyPoint).max(50).optional(),
})
export type Plan = z.infer<typeof Plan>

/** The element collections of a plan, in the order they are listed and checked. */
export const PLAN_COLLECTIONS = ['rooms', 'openings', 'sources', 'detectors', 'exhausts', 'workstations'] as const
export type PlanCollection = (typeof PLAN_COLLECTIONS)[number]

/** A new, empty plan. */
export function emptyPlan(): Plan {
  return { rooms: [], openings: [], sources: [], detectors: [], exhausts: [], workstations: [], underlay: null }
}
