import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  // What each stored result was computed with. Results stored before these columns existed count as engine and
  // gas library version 1 (the versions in force until now); their gas entry fingerprint is unknown (null).
  await db.schema.alterTable('run_results')
    .addColumn('engine_version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('gas_library_version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('gas_id', 'text')
    .addColumn('gas_entry_hash', 'text')
    .addColumn('scenario_version', 'integer')
    .execute()

  // A scenario's edits are numbered, so a result knows which edit it ran.
  await db.schema.alterTable('scenarios').addColumn('version', 'integer', (c) => c.notNull().defaultTo(1)).execute()

  // The versions a plan version was built on (floor, scenarios, engine, gas library), recorded before it is frozen.
  await db.schema.alterTable('plan_versions').addColumn('basis', 'jsonb').execute()

  // How often a site's plans must be acknowledged again even when nothing changed (days; common practice: yearly).
  await db.schema.alterTable('sites')
    .addColumn('review_interval_days', 'integer', (c) => c.notNull().defaultTo(365).check(sql`review_interval_days between 7 and 1825`))
    .execute()

  // Why a plan is stale: one open row per change it is built on; cleared when the plan is brought up to date.
  await db.schema
    .createTable('plan_stale_reasons')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('plan_id', 'integer', (c) => c.notNull().references('plans.id').onDelete('cascade'))
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ('floor','scenario','gas','engine')`))
    /** Identifies the change (e.g. "floor:3:v7"): the same change is recorded once per plan. */
    .addColumn('ref', 'text', (c) => c.notNull())
    .addColumn('reason', 'text', (c) => c.notNull())
    .addColumn('changed_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('cleared_at', 'timestamptz')
    .addColumn('cleared_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .execute()
  await sql`CREATE UNIQUE INDEX plan_stale_reasons_open ON plan_stale_reasons (plan_id, ref) WHERE cleared_at IS NULL`.execute(db)
  await db.schema.createIndex('plan_stale_reasons_org_index').on('plan_stale_reasons').columns(['org_id', 'plan_id']).execute()

  // "Bring up to date": the re-runs one plan waits for before its draft is refreshed (and, if asked, published).
  await db.schema
    .createTable('plan_updates')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('plan_id', 'integer', (c) => c.notNull().references('plans.id').onDelete('cascade'))
    .addColumn('requested_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('old_run_ids', sql`integer[]`, (c) => c.notNull())
    .addColumn('run_ids', sql`integer[]`, (c) => c.notNull())
    .addColumn('publish', 'boolean', (c) => c.notNull())
    .addColumn('ack_due_days', 'integer', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('waiting').check(sql`status in ('waiting','refreshed','published','failed')`))
    .addColumn('message', 'text')
    .addColumn('changes', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('finished_at', 'timestamptz')
    .execute()
  await sql`CREATE UNIQUE INDEX plan_updates_one_waiting ON plan_updates (plan_id) WHERE status = 'waiting'`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('plan_updates').execute()
  await db.schema.dropTable('plan_stale_reasons').execute()
  await db.schema.alterTable('sites').dropColumn('review_interval_days').execute()
  await db.schema.alterTable('plan_versions').dropColumn('basis').execute()
  await db.schema.alterTable('scenarios').dropColumn('version').execute()
  await db.schema.alterTable('run_results')
    .dropColumn('engine_version').dropColumn('gas_library_version').dropColumn('gas_id').dropColumn('gas_entry_hash').dropColumn('scenario_version')
    .execute()
}
