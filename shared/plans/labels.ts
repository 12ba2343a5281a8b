import type { AlarmLevel } from '../schemas/plans'

/** Display wording for plan states (pure; used by pages, PDFs and e-mails). */
export const ALARM_LEVEL_LABELS: Record<AlarmLevel, string> = {
  low: 'Leave at the first (low) alarm',
  high: 'Leave at the high alarm',
  none: 'No evacuation predicted',
}

export const ACK_STATE_LABELS = { done: 'Acknowledged', pending: 'Waiting', overdue: 'Overdue' } as const

export const AUDIT_ACTION_LABELS: Record<string, string> = {
  'plan.generated': 'Generated the plan from results',
  'plan.draft_saved': 'Saved the draft',
  'plan.refreshed': 'Rebuilt the draft from newer results',
  'plan.published': 'Published a version',
  'plan.acknowledged': 'Acknowledged a version',
  'plan.pdf_downloaded': 'Downloaded the PDF',
}

let counter = 0
/** A fresh id for a line an officer adds by hand. */
export const newLineId = (prefix: string) => `${prefix}-${Date.now().toString(36)}-${(++counter).toString(36)}`
