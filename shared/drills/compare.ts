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
