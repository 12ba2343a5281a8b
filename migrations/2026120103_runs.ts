import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  // A saved scenario: one floor, the sources that leak, the release basis, duration and the ventilation state assumed.
  await db.schema
    .createTable('scenarios')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('floor_id', 'integer', (c) => c.notNull().references('floors.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('config', 'jsonb', (c) => c.notNull())
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('scenarios_floor_id_index').on('scenarios').column('floor_id').execute()
  await db.schema.createIndex('scenarios_floor_name_unique').on('scenarios').columns(['floor_id', 'name']).unique().execute()

  // A batch of runs started together (a sweep: the same leak at each of several sources).
  await db.schema
    .createTable('run_batches')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('floor_id', 'integer', (c) => c.notNull().references('floors.id').onDelete('cascade'))
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ('sweep')`))
    .addColumn('label', 'text', (c) => c.notNull())
    .addColumn('config', 'jsonb', (c) => c.notNull())
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  // One engine run. The pg-boss job is the unit of work; `holder` is the attempt that currently owns the row:
  // every update from a worker is conditional on it, so a worker presumed dead cannot overwrite its successor.
  await db.schema
    .createTable('runs')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('floor_id', 'integer', (c) => c.notNull().references('floors.id').onDelete('cascade'))
    .addColumn('scenario_id', 'integer', (c) => c.references('scenarios.id').onDelete('set null'))
    .addColumn('batch_id', 'integer', (c) => c.references('run_batches.id').onDelete('cascade'))
    .addColumn('label', 'text', (c) => c.notNull())
    .addColumn('config', 'jsonb', (c) => c.notNull())
    .addColumn('floor_version', 'integer', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('queued').check(sql`status in ('queued','running','succeeded','failed','cancelled')`))
    .addColumn('progress', 'double precision', (c) => c.notNull().defaultTo(0))
    .addColumn('message', 'text')
    .addColumn('job_id', 'uuid')
    .addColumn('holder', 'text')
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('cancel_requested', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('heartbeat_at', 'timestamptz')
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('started_at', 'timestamptz')
    .addColumn('finished_at', 'timestamptz')
    .execute()
  await db.schema.createIndex('runs_floor_id_index').on('runs').column('floor_id').execute()
  await db.schema.createIndex('runs_batch_id_index').on('runs').column('batch_id').execute()
  await db.schema.createIndex('runs_scenario_id_index').on('runs').column('scenario_id').execute()
  await db.schema.createIndex('runs_running_index').on('runs').column('heartbeat_at').where(sql.ref('status'), '=', 'running').execute()

  // The stored result, at most one per run (primary key = run id; workers insert with ON CONFLICT DO NOTHING).
  // Binary columns are little-endian Float32 planes of nx·ny cells (index i + nx·j): see shared/runs/fields.ts.
  await db.schema
    .createTable('run_results')
    .addColumn('run_id', 'integer', (c) => c.primaryKey().references('runs.id').onDelete('cascade'))
    .addColumn('summary', 'jsonb', (c) => c.notNull())
    .addColumn('meta', 'jsonb', (c) => c.notNull())
    .addColumn('series', 'jsonb', (c) => c.notNull())
    .addColumn('frames', 'bytea', (c) => c.notNull())
    .addColumn('fronts', 'bytea', (c) => c.notNull())
    .addColumn('peak', 'bytea', (c) => c.notNull())
    .addColumn('byte_size', 'integer', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('run_results').execute()
  await db.schema.dropTable('runs').execute()
  await db.schema.dropTable('run_batches').execute()
  await db.schema.dropTable('scenarios').execute()
}
