import type { ColumnType, Generated } from 'kysely'

type Stamp = ColumnType<Date, Date | string | undefined, Date | string>
type NullableStamp = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>
/** jsonb read as a value, written as its JSON text. */
type Json<T> = ColumnType<T, string, string>

export interface DrillsTable {
  id: Generated<number>
  org_id: number
  plan_id: number
  plan_version_id: number
  floor_id: number | null
  site_id: number | null
  floor_name: string
  site_name: string
  title: string
  scenario: string
  location: string
  starts_at: Stamp
  time_zone: string
  duration_minutes: number
  reminder_minutes: number
  reminder_sent_at: NullableStamp
  officer_id: number | null
  checklist: Json<unknown>
  predicted: Json<unknown>
  status: Generated<'scheduled' | 'completed' | 'cancelled'>
  sequence: Generated<number>
  cancel_reason: string | null
  step_results: ColumnType<unknown, string | undefined, string>
  measured: ColumnType<unknown, string | undefined, string>
  observations: Generated<string>
  recorded_at: NullableStamp
  recorded_by: number | null
  created_by: number | null
  created_at: Generated<Date>
  updated_at: Stamp
}

export interface DrillParticipantsTable {
  id: Generated<number>
  drill_id: number
  user_id: number | null
  name: string
  email: string
  source: string
  nonce_hash: string | null
  token_expires_at: NullableStamp
  token_used_at: NullableStamp
  confirmed_at: NullableStamp
  confirmed_sequence: number | null
  created_at: Generated<Date>
}

export interface DrillFindingsTable {
  id: Generated<number>
  org_id: number
  drill_id: number
  finding: string
  action: string
  owner_id: number | null
  owner_name: string
  due_date: ColumnType<string, string, string>
  status: Generated<'open' | 'closed'>
  note: Generated<string>
  closed_at: NullableStamp
  closed_by: number | null
  created_at: Generated<Date>
}

/** Sites gain a drill frequency in this feature's migration. */
export interface DrillTables {
  drills: DrillsTable
  drill_participants: DrillParticipantsTable
  drill_findings: DrillFindingsTable
}
