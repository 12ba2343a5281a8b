import { z } from 'zod'

/** GET /api/runs/:id/egress query: the officer's stated assumptions (each optional, defaults in shared/egress/walking.ts). */
export const EgressQuery = z.object({
  /** Seconds from the release to someone noticing the gas, used when no detector alarms. */
  discoveryS: z.coerce.number().finite().min(0, 'Cannot be negative').max(86400, 'At most 86 400 s').optional(),
  /** Seconds from a detector set-point crossing to people starting to walk. */
  reactionS: z.coerce.number().finite().min(0, 'Cannot be negative').max(3600, 'At most 3600 s').optional(),
  /** Walk at the reduced-mobility speed instead of the unimpeded one. */
  mobility: z.enum(['unimpeded', 'reduced']).optional(),
  /** The limit a route must never cross (a limit key of the run); by default the lowest critical level (IDLH, 25 % LEL, O2 19.5 %). */
  limitKey: z.string().trim().min(1).max(64).optional(),
})
export type EgressQuery = z.infer<typeof EgressQuery>

export const EgressRoute = z.object({
  fromRoomId: z.string(),
  fromWorkstationId: z.string().nullable(),
  /** The exit door the route ends at; null when the room has no route to any marked exit. */
  exitOpeningId: z.string().nullable(),
  /** Rooms walked through after the start room, in order. */
  viaRoomIds: z.array(z.string()),
  /** Doors passed in order, the exit door last. */
  doorIds: z.array(z.string()),
  /** Seconds after the release when people start walking. */
  startS: z.number(),
  walkS: z.number(),
  distanceM: z.number(),
  /** Highest concentration met along the walk (breathing height, at the walker's place and time), ppm. */
  peakPpm: z.number(),
  /** Integrated exposure along the walk, ∫C dt, ppm·s. */
  doseppmS: z.number(),
  /** The dose spread over 15 minutes (no other exposure assumed), ppm: compare with a STEL. */
  stelEquivalentPpm: z.number(),
  /** Seconds of the walk spent above each limit (key → s). */
  timeAboveS: z.record(z.string(), z.number()),
  /** The walk passes a room (other than the start room) that is above the critical limit anywhere while the walker is in it, or meets that limit on the way. */
  crossesCriticalRoom: z.boolean(),
  criticalRoomIds: z.array(z.string()),
  /** Chosen and never crossing the critical limit. False: there is no safe route from here under these conditions. */
  safe: z.boolean(),
  /** The earliest start time at which this route is no longer safe (null: stays safe for the whole run). */
  closesS: z.number().nullable(),
  /** The walk ends after the end of the run: the concentrations after it are the run's last ones. */
  beyondRun: z.boolean(),
  reason: z.string(),
  /** The walked path, plan metres, for drawing. */
  path: z.array(z.tuple([z.number(), z.number()])),
})
export type EgressRoute = z.infer<typeof EgressRoute>

export const EgressResult = z.object({
  runId: z.number().int(),
  speedMS: z.number(),
  speedBasis: z.string(),
  startS: z.number(),
  startBasis: z.string(),
  criticalLimit: z.object({ key: z.string(), label: z.string(), ppm: z.number() }).nullable(),
  exitIds: z.array(z.string()),
  assemblyPoints: z.array(z.object({ id: z.string(), name: z.string(), position: z.tuple([z.number(), z.number()]) })),
  routes: z.array(EgressRoute),
  /** The run's exposure and critical limits (set points left out), for comparing the dose along a route. */
  limits: z.array(z.object({ key: z.string(), label: z.string(), ppm: z.number() })).optional(),
  /** Rooms that reach the critical limit at some time in the run (drawn as rooms to keep out of). */
  roomsReachingCriticalIds: z.array(z.string()).optional(),
  notes: z.array(z.string()),
  caution: z.string(),
})
export type EgressResult = z.infer<typeof EgressResult>
