import { z } from 'zod'
import { Plan } from '../floorplan/plan-schema'
import { DbId, Name, PathId, Role } from './common'

/** Largest floor-plan image accepted, bytes (10 MB). */
export const MAX_FLOOR_IMAGE_BYTES = 10 * 1024 * 1024
export const FLOOR_IMAGE_TYPES = ['image/png', 'image/jpeg'] as const

export const Site = z.object({
  id: z.number().int(),
  name: z.string(),
  address: z.string(),
  floorCount: z.number().int(),
  createdAt: z.string(),
})
export type Site = z.infer<typeof Site>
export const SiteList = z.object({ sites: z.array(Site) })

export const SiteInput = z.object({
  name: Name(120),
  address: z.string().trim().max(300, 'At most 300 characters').default(''),
})
export type SiteInput = z.input<typeof SiteInput>
/** A partial update changes only the fields sent: no defaults here (issue 14: a rename blanked the address). */
export const SiteUpdate = z.object({
  name: Name(120).optional(),
  address: z.string().trim().max(300, 'At most 300 characters').optional(),
})

const UserIds = z.array(DbId).max(200).default([])

/** Ceiling height, metres: the engine's domain height. */
export const CeilingHeightM = z.number().finite().min(1.8, 'At least 1.8 m').max(30, 'At most 30 m')

export const FloorInput = z.object({
  name: Name(120),
  ceilingHeightM: CeilingHeightM,
  /** Lab managers responsible for the floor. */
  managerIds: UserIds,
  /** Staff assigned to the floor. */
  memberIds: UserIds,
})
export type FloorInput = z.input<typeof FloorInput>
/** Only the fields sent change: no defaults (issue 14: a rename emptied managerIds and memberIds). */
const UserIdsPatch = z.array(DbId).max(200)
export const FloorUpdate = z.object({
  name: Name(120).optional(),
  ceilingHeightM: CeilingHeightM.optional(),
  managerIds: UserIdsPatch.optional(),
  memberIds: UserIdsPatch.optional(),
  /** The floor's updatedAt as read: when given and someone changed the floor since, 409 stale_version (issue 14). */
  updatedAt: z.iso.datetime({ offset: true, message: 'A date-time as the floor gave it (updatedAt)' }).optional(),
})
export type FloorUpdate = z.input<typeof FloorUpdate>

/** One problem of the plan checks (shared/floorplan/checks.ts). */
export const PlanProblemSchema = z.object({
  code: z.string(),
  severity: z.enum(['error', 'warning']),
  message: z.string(),
  path: z.string(),
  elementIds: z.array(z.string()),
})

export const FloorSummary = z.object({
  id: z.number().int(),
  siteId: z.number().int(),
  siteName: z.string(),
  name: z.string(),
  ceilingHeightM: z.number(),
  version: z.number().int(),
  planValid: z.boolean(),
  roomCount: z.number().int(),
  sourceCount: z.number().int(),
  updatedAt: z.string(),
})
export type FloorSummary = z.infer<typeof FloorSummary>
export const FloorList = z.object({ floors: z.array(FloorSummary) })

export const FloorDetail = FloorSummary.extend({
  managerIds: z.array(z.number().int()),
  memberIds: z.array(z.number().int()),
  plan: Plan,
  problems: z.array(PlanProblemSchema),
  /** Whether the caller may edit (admins and EHS officers). */
  canEdit: z.boolean(),
})
export type FloorDetail = z.infer<typeof FloorDetail>

/** Corners of all rooms of one plan together, and the largest side of the plan's extent (issue 14: bounded work per save). */
export const MAX_PLAN_CORNERS = 5000
export const MAX_PLAN_EXTENT_M = 2000

/** A plan as saved: per-element bounds from the plan schema, plus totals a building can have. */
export const SavablePlan = Plan.superRefine((plan, ctx) => {
  const corners = plan.rooms.reduce((n, r) => n + r.polygon.length, 0)
  if (corners > MAX_PLAN_CORNERS) ctx.addIssue({ code: 'custom', path: ['rooms'], message: `At most ${MAX_PLAN_CORNERS} room corners in all (this plan has ${corners})` })
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity
  for (const r of plan.rooms) for (const [x, y] of r.polygon) { x0 = Math.min(x0, x); x1 = Math.max(x1, x); y0 = Math.min(y0, y); y1 = Math.max(y1, y) }
  if (corners && Math.max(x1 - x0, y1 - y0) > MAX_PLAN_EXTENT_M) {
    ctx.addIssue({ code: 'custom', path: ['rooms'], message: `The rooms must fit within ${MAX_PLAN_EXTENT_M} m × ${MAX_PLAN_EXTENT_M} m` })
  }
})

export const SavePlanInput = z.object({
  /** The version the edit started from; a different current version answers 409 stale_version. */
  version: DbId,
  plan: SavablePlan,
})
export type SavePlanInput = z.input<typeof SavePlanInput>
export const SavePlanResult = z.object({
  version: z.number().int(),
  planValid: z.boolean(),
  problems: z.array(PlanProblemSchema),
  updatedAt: z.string(),
})
export type SavePlanResult = z.infer<typeof SavePlanResult>

export const ScenarioExportQuery = z.object({
  /** Gas to simulate; only sources of this gas are exported. Default: the gas of the first source. */
  gasId: z.string().trim().min(1).max(32).optional(),
  durationS: z.coerce.number().positive().max(86400).default(900),
  cellM: z.coerce.number().min(0.05).max(2).default(0.2),
})

export const Person = z.object({ id: z.number().int(), name: z.string(), role: Role })
export const PeopleList = z.object({ people: z.array(Person) })
export type Person = z.infer<typeof Person>

export const FloorImage = z.object({
  id: z.number().int(),
  floorId: z.number().int(),
  mime: z.enum(FLOOR_IMAGE_TYPES),
  byteSize: z.number().int(),
  fileName: z.string(),
  createdAt: z.string(),
})
export type FloorImage = z.infer<typeof FloorImage>

export const FloorImageParams = z.object({
  id: PathId,
  imageId: PathId,
})
