import { z } from 'zod'
import { PlanStaleness, PlanUpdateState } from './staleness'
import { DbId, PathId } from './common'

/**
 * Response plans: the document an officer generates from scenario results, edits, publishes as a frozen
 * version, and lab managers acknowledge. Every rule-derived line says where it came from (`from`).
 */

const Text = (max = 2000) => z.string().trim().max(max, `At most ${max} characters`)
const ReqText = (max = 2000) => z.string().trim().min(1, 'Required').max(max, `At most ${max} characters`)
const Seconds = z.number().finite().min(0, 'Cannot be negative').max(10 * 24 * 3600)

/** Which result a line was derived from: the run, and the receptor, room, source or detector inside it. */
export const DerivedFrom = z.object({
  runId: z.number().int(),
  runLabel: Text(200),
  subjectKind: z.enum(['run', 'receptor', 'room', 'source', 'detector']),
  subjectId: Text(64).nullable(),
  subjectName: Text(200).nullable(),
  /** The rule id in shared/plans/rules.ts (e.g. "R3"). */
  rule: Text(16),
})
export type DerivedFrom = z.infer<typeof DerivedFrom>

/** A line of text that a rule produced or an officer typed (from = null). */
export const PlanLine = z.object({
  id: ReqText(64),
  text: ReqText(1000),
  who: Text(200).default(''),
  from: DerivedFrom.nullable().default(null),
})
export type PlanLine = z.infer<typeof PlanLine>

export const HazardLimit = z.object({ key: Text(32), label: Text(200), ppm: z.number().finite(), source: Text(300) })

export const HazardItem = z.object({
  id: ReqText(64),
  gasId: Text(32),
  gasName: ReqText(120),
  properties: z.array(Text(60)).max(10),
  sources: z.array(z.object({
    name: Text(200), roomName: Text(200), inventoryM3: z.number().finite().nullable(), releasedM3: z.number().finite(), description: Text(500),
  })).max(50),
  release: Text(500),
  limits: z.array(HazardLimit).max(30),
  from: DerivedFrom.nullable().default(null),
})
export type HazardItem = z.infer<typeof HazardItem>

export const TIMELINE_KINDS = ['first_alarm', 'detector_alarm', 'receptor_limit', 'room_limit', 'egress'] as const
export const TimelineRow = z.object({
  id: ReqText(64),
  kind: z.enum(TIMELINE_KINDS),
  /** What happens, e.g. "IDLH exceeded". */
  event: ReqText(300),
  /** Where or at whom: detector, workstation or room name. */
  where: Text(200),
  limitKey: Text(32).nullable().default(null),
  /** Seconds from the start of the release (for egress: seconds left between the alarm being heard and the critical level); null = not within the run. */
  timeS: Seconds.nullable(),
  from: DerivedFrom.nullable().default(null),
})
export type TimelineRow = z.infer<typeof TimelineRow>

export const ALARM_LEVELS = ['low', 'high', 'none'] as const
export const AlarmLevel = z.enum(ALARM_LEVELS)
export type AlarmLevel = z.infer<typeof AlarmLevel>

export const EvacuationRoom = z.object({
  roomId: ReqText(64),
  roomName: Text(200),
  /** Leave at the first (low, warning) alarm, at the high alarm, or no evacuation predicted (none). */
  alarmLevel: AlarmLevel,
  reason: Text(500),
  doors: z.array(z.object({ openingId: Text(64), name: Text(200), note: Text(300).default('') })).max(50),
  /** The computed way out (shared/egress) or why there is none; absent in plans made before routes were computed. */
  route: Text(2000).optional(),
  /** Doors not to use: they lead into a room that reaches a critical level in a result. */
  avoid: Text(1000).optional(),
  from: DerivedFrom.nullable().default(null),
})
export type EvacuationRoom = z.infer<typeof EvacuationRoom>

export const PlanRole = z.object({
  id: ReqText(64),
  /** The duty, e.g. "Incident lead". */
  duty: ReqText(120),
  person: Text(120).default(''),
  phone: Text(40).default(''),
  email: Text(254).default(''),
})
export type PlanRole = z.infer<typeof PlanRole>

export const PlanContact = z.object({
  id: ReqText(64),
  name: ReqText(120),
  organization: Text(120).default(''),
  phone: Text(40).default(''),
  note: Text(300).default(''),
})

export const ChecklistStep = z.object({
  id: ReqText(64),
  who: ReqText(200),
  what: ReqText(500),
  /** Seconds after the first alarm by which the step should be done, per the results; null = no time from the results. */
  targetS: Seconds.nullable(),
  /** How the target was set, e.g. "earliest critical level at a workstation minus 30 s detector lag". */
  basis: Text(500).default(''),
  /** Which measured drill time this step is compared with (if any). */
  measure: z.enum(['alarm_to_evacuated', 'alarm_to_isolation', 'alarm_to_headcount', 'none']).default('none'),
  from: DerivedFrom.nullable().default(null),
})
export type ChecklistStep = z.infer<typeof ChecklistStep>

/** The whole editable plan document (what a version freezes and hashes). */
export const PlanContent = z.object({
  title: ReqText(200),
  summary: Text(4000).default(''),
  hazard: z.object({ items: z.array(HazardItem).max(20), notes: Text(4000).default('') }),
  timeline: z.object({ rows: z.array(TimelineRow).max(500), notes: Text(4000).default('') }),
  evacuation: z.object({ rooms: z.array(EvacuationRoom).max(200), assemblyPoint: Text(500).default(''), notes: Text(4000).default('') }),
  actions: z.object({ items: z.array(PlanLine).max(100), notes: Text(4000).default('') }),
  protection: z.object({ ppe: z.array(PlanLine).max(100), reentry: z.array(PlanLine).max(100), notes: Text(4000).default('') }),
  afterIncident: z.object({ items: z.array(PlanLine).max(100), notes: Text(4000).default('') }),
  roles: z.array(PlanRole).max(50),
  contacts: z.array(PlanContact).max(50),
  checklist: z.array(ChecklistStep).max(100),
  /** The predicted times a drill is measured against (seconds after the first alarm). */
  predicted: z.object({
    egressMarginS: Seconds.nullable(),
    isolationByS: Seconds.nullable(),
    firstAlarmS: Seconds.nullable(),
  }),
})
export type PlanContent = z.infer<typeof PlanContent>

export const PlanStatus = z.enum(['draft', 'published'])

export const AckRecord = z.object({
  id: z.number().int(),
  userId: z.number().int(),
  name: z.string(),
  at: z.string(),
  comment: z.string(),
  version: z.number().int(),
})
export type AckRecord = z.infer<typeof AckRecord>

export const VersionSummary = z.object({
  version: z.number().int(),
  status: PlanStatus,
  contentHash: z.string().nullable(),
  publishedAt: z.string().nullable(),
  publishedBy: z.string().nullable(),
  ackDueAt: z.string().nullable(),
  updatedAt: z.string(),
})
export type VersionSummary = z.infer<typeof VersionSummary>

export const ManagerAckState = z.object({
  userId: z.number().int(),
  name: z.string(),
  email: z.string(),
  state: z.enum(['done', 'pending', 'overdue']),
  ack: AckRecord.nullable(),
})

export const PlanDetail = z.object({
  id: z.number().int(),
  floorId: z.number().int().nullable(),
  floorName: z.string(),
  siteName: z.string(),
  runIds: z.array(z.number().int()),
  createdAt: z.string(),
  versions: z.array(VersionSummary),
  /** The version shown: the draft for officers when one exists, else the latest published. */
  current: z.object({ version: z.number().int(), status: PlanStatus, contentHash: z.string().nullable(), content: PlanContent }),
  latestPublished: z.number().int().nullable(),
  /** The lab managers of the floor and their acknowledgment of the latest published version. */
  managers: z.array(ManagerAckState),
  acknowledgments: z.array(AckRecord),
  canEdit: z.boolean(),
  /** True when the caller is a lab manager of the floor who has not acknowledged the latest published version. */
  canAcknowledge: z.boolean(),
  /** Why the plan is out of date with its floor, scenarios, gas library or engine; null when up to date. */
  staleness: PlanStaleness,
  /** The latest "bring up to date" request (re-runs, refresh, publish), if any. */
  update: PlanUpdateState,
})
export type PlanDetail = z.infer<typeof PlanDetail>

export const PlanListItem = z.object({
  id: z.number().int(),
  title: z.string(),
  floorId: z.number().int().nullable(),
  floorName: z.string(),
  siteName: z.string(),
  latestVersion: z.number().int(),
  latestPublished: z.number().int().nullable(),
  hasDraft: z.boolean(),
  publishedAt: z.string().nullable(),
  ackDueAt: z.string().nullable(),
  acks: z.object({ done: z.number().int(), pending: z.number().int(), overdue: z.number().int() }),
  /** The caller's own state as a lab manager of the floor (null for others). */
  mine: z.enum(['done', 'pending', 'overdue']).nullable(),
  staleness: PlanStaleness,
})
export type PlanListItem = z.infer<typeof PlanListItem>
export const PlanList = z.object({ plans: z.array(PlanListItem) })

const PlanRunIds = z.array(DbId).min(1, 'Pick at least one result').max(20, 'At most 20 results')

export const NewPlan = z.object({
  floorId: DbId,
  runIds: PlanRunIds,
  title: Text(200).optional(),
})
export type NewPlan = z.infer<typeof NewPlan>

/** Rebuild the rule-derived content from these results of the plan's floor (officers' own text is kept). */
export const RefreshPlan = z.object({ runIds: PlanRunIds })
export type RefreshPlan = z.infer<typeof RefreshPlan>

export const SaveDraft = z.object({
  content: PlanContent,
  /**
   * The updatedAt of the version the edit started from (versions[] entry of `current`): when given and the draft
   * was saved, refreshed or published since, 409 stale_version (issue 14). Absent: saves as before.
   */
  updatedAt: z.iso.datetime({ offset: true, message: 'A date-time as the plan gave it (updatedAt)' }).optional(),
})
export type SaveDraft = z.infer<typeof SaveDraft>

export const PublishInput = z.object({
  /** Days the lab managers have to acknowledge. */
  ackDueDays: z.number().int().min(1, 'At least 1 day').max(90, 'At most 90 days').default(14),
})

export const AckInput = z.object({ comment: Text(1000).default('') })
export type AckInput = z.infer<typeof AckInput>

export const PlanVersionParams = z.object({ id: PathId, version: PathId })

export const AuditItem = z.object({ at: z.string(), actor: z.string().nullable(), action: z.string(), detail: z.record(z.string(), z.unknown()) })
export const AuditList = z.object({ entries: z.array(AuditItem) })

export const RunChoice = z.object({
  id: z.number().int(), label: z.string(), finishedAt: z.string().nullable(), gasName: z.string(),
  /** Detectors on the floor when the run was computed, and whether the floor plan has been saved since. */
  detectorCount: z.number().int().optional(), floorChanged: z.boolean().optional(),
})
export const RunChoiceList = z.object({ runs: z.array(RunChoice) })
