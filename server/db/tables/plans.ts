import type { ColumnType, Generated } from 'kysely'

type Stamp = ColumnType<Date, Date | string | undefined, Date | string>
type NullableStamp = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>
/** jsonb read as a value, written as its JSON text. */
type Json<T> = ColumnType<T, string, string>

export interface PlansTable {
  id: Generated<number>
  org_id: number
  floor_id: number | null
  floor_name: string
  site_name: string
  run_ids: number[]
  created_by: number | null
  created_at: Generated<Date>
}

export interface PlanVersionsTable {
  id: Generated<number>
  org_id: number
  plan_id: number
  version: number
  status: 'draft' | 'published'
  /** shared/schemas/plans.ts PlanContent */
  content: Json<unknown>
  content_hash: string | null
  /** The versions this plan version was built on (shared/schemas/staleness.ts PlanBasis), or null before recording. */
  basis: ColumnType<unknown, string | null | undefined, string | null>
  ack_due_at: NullableStamp
  published_at: NullableStamp
  published_by: number | null
  updated_by: number | null
  created_at: Generated<Date>
  updated_at: Stamp
}

export interface PlanAcknowledgmentsTable {
  id: Generated<number>
  org_id: number
  plan_version_id: number
  user_id: number
  name: string
  comment: Generated<string>
  content_hash: string
  acknowledged_at: Generated<Date>
}

export interface PlanTables {
  plans: PlansTable
  plan_versions: PlanVersionsTable
  plan_acknowledgments: PlanAcknowledgmentsTable
}
