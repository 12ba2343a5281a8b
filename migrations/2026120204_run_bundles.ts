import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  // Sensitivity bundles (issue 17): the extra cases of a run are ordinary runs (own job, own result), each tied to
  // the nominal run it brackets with the case it is (e.g. "d_x0.3", "vent_exhaust_failed", "pos_east").
  await db.schema
    .createTable('run_bundle_members')
    .addColumn('run_id', 'integer', (c) => c.primaryKey().references('runs.id').onDelete('cascade'))
    .addColumn('nominal_run_id', 'integer', (c) => c.notNull().references('runs.id').onDelete('cascade'))
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('case_key', 'text', (c) => c.notNull())
    .addColumn('case_label', 'text', (c) => c.notNull())
    .execute()
  await sql`CREATE UNIQUE INDEX run_bundle_members_case ON run_bundle_members (nominal_run_id, case_key)`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('run_bundle_members').execute()
}
