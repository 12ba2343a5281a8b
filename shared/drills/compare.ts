import type { ChecklistStep, PlanContent } from '../schemas/plans'
import type { Comparison, Measured, StepResult } from '../schemas/drills'

/**
 * Measured drill times against the times the plan predicted (all counted from the alarm being heard).
 * "within" when the measured time is at most the predicted one; "over" when it is longer.
 */
export const MEASURES = [
  { measure: 'alarm_to_evacuated', key: 'alarmToEvacuatedS', label: 'Alarm to evacuation complete', predicted: (p: PlanContent['predicted']) => p.egressMarginS },
  { measure: 'alarm_to_isolation', key: 'alarmToIsolationS', label: 'Alarm to source isolated', predicted: (p: PlanContent['predicted']) => p.isolationByS },
  { measure: 'alarm_to_headcount', key: 'alarmToHeadcountS', label: 'Alarm to head count complete', predicted: () => null },
] as const

const verdict = (predicted: number | null, measured: number | null): Comparison['verdict'] =>
  measured === null ? 'not_measured' : predicted === null ? 'no_prediction' : measured <= predicted ? 'within' : 'over'

export function compareMeasured(predicted: PlanContent['predicted'], measured: Measured): Comparison[] {
  return MEASURES.map((m) => {
    const p = m.predicted(predicted)
    const v = measured[m.key]
    return { measure: m.measure, label: m.label, predictedS: p, measuredS: v, deltaS: p !== null && v !== null ? v - p : null, verdict: verdict(p, v) }
  })
}

export function compareSteps(checklist: ChecklistStep[], results: StepResult[]) {
  return checklist.map((s) => {
    const r = results.find((x) => x.stepId === s.id)
    const at = r?.done ? r.atS : null
    return { stepId: s.id, what: s.what, who: s.who, targetS: s.targetS, atS: at, done: !!r?.done, verdict: r?.done ? verdict(s.targetS, at) : 'not_measured' as const }
  })
}

export const VERDICT_LABELS: Record<Comparison['verdict'], string> = {
  within: 'Within the predicted time',
  over: 'Slower than predicted',
  no_prediction: 'No prediction from the results',
  not_measured: 'Not measured',
}

/** When a site's next drill is due: the last held drill plus the site's frequency (or now, if none was ever held). */
export function nextDrillDue(lastHeldAt: Date | null, frequencyDays: number, now: Date): { nextDueAt: Date; overdue: boolean } {
  const next = lastHeldAt ? new Date(lastHeldAt.getTime() + frequencyDays * 86_400_000) : now
  return { nextDueAt: next, overdue: !lastHeldAt || next.getTime() < now.getTime() }
}

/** The plan predicted no time at all (the critical level comes before the alarm is heard): a drill cannot be "slower". */
export const TOO_LATE_LABEL = 'Detection too late to evacuate in time'
export const TOO_LATE_FINDING =
  'The plan predicts no time left for this step: the critical level is reached before the alarm is heard, so no drill can finish in time. ' +
  'This is a finding to act on at the detection side (detector position or set points, a faster shut-off, fewer people near the source), not a slow drill.'

/** The verdict in words; a zero prediction is about detection, not about the people drilling. */
export function verdictLabel(verdict: Comparison['verdict'], predictedS: number | null): string {
  return verdict === 'over' && predictedS === 0 ? TOO_LATE_LABEL : VERDICT_LABELS[verdict]
}
/** Only evacuation is judged this way: a zero evacuation target means the critical level comes before the alarm is heard. */
export const isTooLate = (c: { verdict: Comparison['verdict']; measure: string; predictedS?: number | null; targetS?: number | null }) =>
  c.verdict === 'over' && c.measure === 'alarm_to_evacuated' && (c.predictedS ?? c.targetS) === 0

/** A verdict in words for a comparison row or a checklist step (with its measure). */
export const verdictText = (c: { verdict: Comparison['verdict']; measure: string; predictedS?: number | null; targetS?: number | null }) =>
  isTooLate(c) ? TOO_LATE_LABEL : VERDICT_LABELS[c.verdict]

/** A step's verdict while the record is typed: the measured time against the step's target. */
export function stepVerdict(targetS: number | null, atS: number | null, done: boolean): Comparison['verdict'] {
  return done ? verdict(targetS, atS) : 'not_measured'
}

/** Participant sources in words for the roster. */
export const PARTICIPANT_SOURCE_LABELS: Record<string, string> = { person: 'by name', floor_staff: 'as floor staff', floor_managers: 'as lab manager', guest: 'as guest' }

/** The notice version people see (the calendar SEQUENCE counts from 0). */
export const noticeVersion = (sequence: number) => `notice version ${sequence + 1}`

/** The title proposed for a drill of a plan: the plan's title (notices and calendar entries add "Drill" themselves). */
export const defaultDrillTitle = (planTitle: string) => planTitle
/** A drill title for notice subjects and calendar entries that add "Drill" themselves: a leading "Drill:" is not repeated. */
export const titleWithoutDrillPrefix = (title: string) => title.replace(/^\s*drill\s*:\s*/i, '').trim() || title
