import type { ColumnType, Generated } from 'kysely'

type NullableStamp = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>

/** One reason a plan is stale (a change to something it is built on); open while cleared_at is null. */
export interface PlanStaleReasonsTable {
  id: Generated<number>
  org_id: number
  plan_id: number
  kind: 'floor' | 'scenario' | 'gas' | 'engine'
  ref: string
  reason: string
  changed_by: number | null
  created_at: Generated<Date>
  cleared_at: NullableStamp
  cleared_by: number | null
}

/** A "bring up to date" request waiting for its re-runs. */
export interface PlanUpdatesTable {
  id: Generated<number>
  org_id: number
  plan_id: number
  requested_by: number | null
  old_run_ids: number[]
  run_ids: number[]
  publish: boolean
  ack_due_days: number
  status: ColumnType<'waiting' | 'refreshed' | 'published' | 'failed', string | undefined, string>
  message: string | null
  /** Old-vs-new lines (shared/plans/stale-changes.ts timeChangeText). */
  changes: ColumnType<string[], string | undefined, string>
  created_at: Generated<Date>
  finished_at: NullableStamp
}

export interface StalenessTables {
  plan_stale_reasons: PlanStaleReasonsTable
  plan_updates: PlanUpdatesTable
}
