import type { ColumnType, Generated } from 'kysely'

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>
/** jsonb read as a value, written as its JSON text. */
type Json<T> = ColumnType<T, string, string>

export interface SitesTable {
  id: Generated<number>
  org_id: number
  name: string
  address: Generated<string>
  /** Days after which a plan's acknowledgments are due again even without a change. */
  review_interval_days: Generated<number>
  created_at: Generated<Date>
  updated_at: Timestamp
}

export interface FloorsTable {
  id: Generated<number>
  org_id: number
  site_id: number
  name: string
  ceiling_height_m: number
  /** The plan document (shared/floorplan/plan-schema.ts). */
  plan: Json<unknown>
  version: Generated<number>
  plan_valid: Generated<boolean>
  /** The plan checks' findings at the last save (shared/floorplan/checks.ts PlanProblem[]). */
  problems: Json<unknown[]>
  updated_by: number | null
  created_at: Generated<Date>
  updated_at: Timestamp
}

export interface FloorMembersTable {
  floor_id: number
  user_id: number
  kind: 'manager' | 'member'
  created_at: Generated<Date>
}

export interface FloorImagesTable {
  id: Generated<number>
  org_id: number
  floor_id: number
  mime: 'image/png' | 'image/jpeg'
  byte_size: number
  bytes: Buffer
  file_name: Generated<string>
  created_by: number | null
  created_at: Generated<Date>
}

/** The tables of this feature, merged into the Database interface (server/db/schema.ts). */
export interface FloorTables {
  sites: SitesTable
  floors: FloorsTable
  floor_members: FloorMembersTable
  floor_images: FloorImagesTable
}
