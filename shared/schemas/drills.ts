import { z } from 'zod'
import { DbId, Email } from './common'
import { ChecklistStep } from './plans'

/** Drills: scheduled for a published plan version, noticed by e-mail with a calendar file, recorded, followed up. */

const Text = (max = 2000) => z.string().trim().max(max, `At most ${max} characters`)
const ReqText = (max = 200) => z.string().trim().min(1, 'Required').max(max, `At most ${max} characters`)
const Seconds = z.number().finite().min(0, 'Cannot be negative').max(24 * 3600, 'At most 24 hours')

export const isTimeZone = (tz: string) => {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz })
    return tz.includes('/') || tz === 'UTC'
  } catch {
    return false
  }
}
export const TimeZone = z.string().trim().refine(isTimeZone, 'Not an IANA time zone, e.g. Europe/Berlin')
export const LocalDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'A date as YYYY-MM-DD')
  .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s), 'Not a real date')
  // PostgreSQL has no year 0 ("0000-01-01" answered 500, issue 14); drills and due dates live in this range.
  .refine((s) => Number(s.slice(0, 4)) >= 1900 && Number(s.slice(0, 4)) <= 2999, 'A date between the years 1900 and 2999')
export const LocalTime = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'A time as HH:MM (24 h)')

export const PARTICIPANT_GROUPS = ['floor_staff', 'floor_managers'] as const
export const ParticipantGroup = z.enum(PARTICIPANT_GROUPS)
export const PARTICIPANT_GROUP_LABELS: Record<(typeof PARTICIPANT_GROUPS)[number], string> = {
  floor_staff: 'All staff of the floor',
  floor_managers: 'The lab managers of the floor',
}

export const DrillParticipantsInput = z.object({
  userIds: z.array(DbId).max(500).default([]),
  groups: z.array(ParticipantGroup).max(2).default([]),
  /** People without an account (contractors, visitors): name and e-mail. */
  guests: z.array(z.object({ name: ReqText(120), email: Email })).max(100).default([]),
})

export const NewDrill = z.object({
  planId: DbId,
  /** A published version of the plan. */
  planVersion: DbId,
  title: ReqText(200),
  date: LocalDate,
  time: LocalTime,
  timeZone: TimeZone,
  durationMinutes: z.number().int().min(5, 'At least 5 minutes').max(8 * 60, 'At most 8 hours').default(60),
  location: ReqText(300),
  scenario: ReqText(2000),
  officerId: DbId,
  /** Minutes before the start when the reminder goes out. */
  reminderMinutes: z.number().int().min(5).max(14 * 24 * 60).default(24 * 60),
  participants: DrillParticipantsInput,
})
export type NewDrill = z.infer<typeof NewDrill>

/** Moving a drill: new date/time/place; the notice goes out with the next SEQUENCE. */
export const DrillChange = z.object({
  date: LocalDate.optional(),
  time: LocalTime.optional(),
  timeZone: TimeZone.optional(),
  durationMinutes: z.number().int().min(5).max(8 * 60).optional(),
  location: ReqText(300).optional(),
  title: ReqText(200).optional(),
  scenario: ReqText(2000).optional(),
  reason: Text(500).default(''),
}).refine((v) => Object.keys(v).some((k) => k !== 'reason'), { message: 'Change at least one field', path: ['date'] })
export type DrillChange = z.infer<typeof DrillChange>

export const CancelDrill = z.object({ reason: ReqText(500) })

export const StepResult = z.object({
  stepId: ReqText(64),
  done: z.boolean(),
  /** Seconds after the alarm when the step was done. */
  atS: Seconds.nullable().default(null),
  note: Text(500).default(''),
})
export type StepResult = z.infer<typeof StepResult>

export const Measured = z.object({
  alarmToEvacuatedS: Seconds.nullable().default(null),
  alarmToIsolationS: Seconds.nullable().default(null),
  alarmToHeadcountS: Seconds.nullable().default(null),
})
export type Measured = z.infer<typeof Measured>

export const DrillRecordInput = z.object({
  steps: z.array(StepResult).max(100),
  measured: Measured,
  observations: Text(4000).default(''),
  /** Marks the drill held (recorded); it can still be corrected afterwards by an officer. */
  completed: z.boolean().default(true),
})
export type DrillRecordInput = z.infer<typeof DrillRecordInput>

export const NewFinding = z.object({
  finding: ReqText(1000),
  action: ReqText(1000),
  ownerId: DbId,
  dueDate: LocalDate,
})
export const FindingUpdate = z.object({
  status: z.enum(['open', 'closed']),
  /** Absent: the note is kept (a partial update changes only what is sent). */
  note: Text(1000).optional(),
})

export const Comparison = z.object({
  measure: z.string(),
  label: z.string(),
  predictedS: z.number().nullable(),
  measuredS: z.number().nullable(),
  deltaS: z.number().nullable(),
  verdict: z.enum(['within', 'over', 'no_prediction', 'not_measured']),
})
export type Comparison = z.infer<typeof Comparison>

export const RosterEntry = z.object({
  id: z.number().int(),
  userId: z.number().int().nullable(),
  name: z.string(),
  email: z.string(),
  source: z.string(),
  confirmedAt: z.string().nullable(),
  /** Delivery of the latest notice: queued (pending), sent, bounced (refused by the server), or none. */
  mail: z.enum(['pending', 'sent', 'bounced', 'none']),
  mailAttempts: z.number().int(),
  mailError: z.string().nullable(),
})
export type RosterEntry = z.infer<typeof RosterEntry>

export const Finding = z.object({
  id: z.number().int(),
  drillId: z.number().int(),
  drillTitle: z.string(),
  finding: z.string(),
  action: z.string(),
  ownerId: z.number().int().nullable(),
  ownerName: z.string(),
  dueDate: z.string(),
  status: z.enum(['open', 'closed']),
  overdue: z.boolean(),
  closedAt: z.string().nullable(),
  note: z.string(),
})
export type Finding = z.infer<typeof Finding>

export const DRILL_STATUSES = ['scheduled', 'completed', 'cancelled'] as const
export const DrillStatus = z.enum(DRILL_STATUSES)

export const DrillSummary = z.object({
  id: z.number().int(),
  title: z.string(),
  status: DrillStatus,
  startsAt: z.string(),
  timeZone: z.string(),
  localStart: z.string(),
  location: z.string(),
  planId: z.number().int(),
  planVersion: z.number().int(),
  floorId: z.number().int().nullable(),
  floorName: z.string(),
  siteId: z.number().int().nullable(),
  siteName: z.string(),
  officerName: z.string(),
  confirmed: z.number().int(),
  participants: z.number().int(),
  openFindings: z.number().int(),
})
export type DrillSummary = z.infer<typeof DrillSummary>
export const DrillList = z.object({ drills: z.array(DrillSummary) })

export const DrillDetail = DrillSummary.extend({
  scenario: z.string(),
  durationMinutes: z.number().int(),
  reminderMinutes: z.number().int(),
  reminderSentAt: z.string().nullable(),
  sequence: z.number().int(),
  officerId: z.number().int().nullable(),
  planTitle: z.string(),
  planHash: z.string(),
  checklist: z.array(ChecklistStep),
  predicted: z.object({ egressMarginS: z.number().nullable(), isolationByS: z.number().nullable(), firstAlarmS: z.number().nullable() }),
  roster: z.array(RosterEntry),
  record: z.object({ steps: z.array(StepResult), measured: Measured, observations: z.string(), recordedAt: z.string().nullable(), recordedBy: z.string().nullable() }),
  comparison: z.array(Comparison),
  stepComparison: z.array(z.object({ stepId: z.string(), what: z.string(), who: z.string(), targetS: z.number().nullable(), atS: z.number().nullable(), done: z.boolean(), verdict: Comparison.shape.verdict })),
  findings: z.array(Finding),
  canManage: z.boolean(),
  /** The caller is a participant (staff see only these drills). */
  mine: z.boolean(),
  /** The start time has passed by the server's clock, so the record can be completed. */
  hasStarted: z.boolean().optional(),
})
export type DrillDetail = z.infer<typeof DrillDetail>

export const SiteDrillStatus = z.object({
  siteId: z.number().int(),
  siteName: z.string(),
  frequencyDays: z.number().int(),
  lastHeldAt: z.string().nullable(),
  nextDueAt: z.string(),
  overdue: z.boolean(),
  nextScheduledAt: z.string().nullable(),
  floors: z.array(z.object({ floorId: z.number().int(), floorName: z.string(), held: z.number().int(), lastHeldAt: z.string().nullable(), scheduled: z.number().int() })),
})
export const DrillOverview = z.object({ sites: z.array(SiteDrillStatus), openFindings: z.array(Finding) })
export type DrillOverview = z.infer<typeof DrillOverview>

export const SiteFrequency = z.object({ drillFrequencyDays: z.number().int().min(7, 'At least 7 days').max(730, 'At most 730 days') })

export const ConfirmToken = z.object({ token: z.string().min(10, 'Missing or malformed token').max(400) })
export const ConfirmInfo = z.object({
  drillTitle: z.string(), localStart: z.string(), location: z.string(), name: z.string(), status: DrillStatus, alreadyConfirmed: z.boolean(),
})

