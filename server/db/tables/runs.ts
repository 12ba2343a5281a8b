import type { ColumnType, Generated } from 'kysely'

/** jsonb read as a value, written as its JSON text. */
type Json<T> = ColumnType<T, string, string>
type Stamp = ColumnType<Date, Date | string | undefined, Date | string>
type NullableStamp = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>

export interface ScenariosTable {
  id: Generated<number>
  org_id: number
  floor_id: number
  name: string
  /** shared/schemas/runs.ts ScenarioConfig */
  config: Json<unknown>
  /** Bumped by each edit (shared by the staleness check). */
  version: Generated<number>
  created_by: number | null
  created_at: Generated<Date>
  updated_at: Stamp
}

export interface RunBatchesTable {
  id: Generated<number>
  org_id: number
  floor_id: number
  kind: 'sweep'
  label: string
  config: Json<unknown>
  created_by: number | null
  created_at: Generated<Date>
}

export interface RunsTable {
  id: Generated<number>
  org_id: number
  floor_id: number
  scenario_id: number | null
  batch_id: number | null
  label: string
  /** The ScenarioConfig this run used (one source for a sweep member). */
  config: Json<unknown>
  floor_version: number
  status: ColumnType<'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled', string | undefined, string>
  progress: Generated<number>
  message: string | null
  job_id: string | null
  /** Token of the job attempt that owns the row now. */
  holder: string | null
  attempts: Generated<number>
  cancel_requested: Generated<boolean>
  heartbeat_at: NullableStamp
  created_by: number | null
  created_at: Generated<Date>
  started_at: NullableStamp
  finished_at: NullableStamp
}

export interface RunResultsTable {
  run_id: number
  summary: Json<unknown>
  meta: Json<unknown>
  series: Json<unknown>
  frames: Buffer
  fronts: Buffer
  peak: Buffer
  byte_size: number
  /** What the result was computed with (migrations/2026120203_staleness.ts). */
  engine_version: Generated<number>
  gas_library_version: Generated<number>
  gas_id: string | null
  gas_entry_hash: string | null
  scenario_version: number | null
  created_at: Generated<Date>
}

export interface RunTables {
  scenarios: ScenariosTable
  run_batches: RunBatchesTable
  runs: RunsTable
  run_results: RunResultsTable
}
