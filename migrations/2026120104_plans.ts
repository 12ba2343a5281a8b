import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  // A response plan of one floor. The floor may be deleted later; the plan and its acknowledgments stay on record.
  await db.schema
    .createTable('plans')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('floor_id', 'integer', (c) => c.references('floors.id').onDelete('set null'))
    .addColumn('floor_name', 'text', (c) => c.notNull())
    .addColumn('site_name', 'text', (c) => c.notNull())
    .addColumn('run_ids', sql`integer[]`, (c) => c.notNull())
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('plans_org_floor_index').on('plans').columns(['org_id', 'floor_id']).execute()

  // Versions: at most one draft (the next number) per plan; published versions are frozen with their content hash.
  await db.schema
    .createTable('plan_versions')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('plan_id', 'integer', (c) => c.notNull().references('plans.id').onDelete('cascade'))
    .addColumn('version', 'integer', (c) => c.notNull().check(sql`version > 0`))
    .addColumn('status', 'text', (c) => c.notNull().check(sql`status in ('draft','published')`))
    .addColumn('content', 'jsonb', (c) => c.notNull())
    .addColumn('content_hash', 'text')
    .addColumn('ack_due_at', 'timestamptz')
    .addColumn('published_at', 'timestamptz')
    .addColumn('published_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('updated_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('plan_versions_plan_version_unique', ['plan_id', 'version'])
    .addCheckConstraint('plan_versions_published_hash', sql`status = 'draft' or (content_hash is not null and published_at is not null)`)
    .execute()
  await sql`CREATE UNIQUE INDEX plan_versions_one_draft ON plan_versions (plan_id) WHERE status = 'draft'`.execute(db)

  // A published version is frozen: its content, hash and number can never change, and it cannot be deleted alone.
  await sql`CREATE FUNCTION plan_versions_frozen() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'UPDATE' AND OLD.status = 'published' THEN
        RAISE EXCEPTION 'published plan version % of plan % is frozen', OLD.version, OLD.plan_id USING ERRCODE = 'P0001';
      END IF;
      RETURN NEW;
    END $$`.execute(db)
  await sql`CREATE TRIGGER plan_versions_frozen BEFORE UPDATE ON plan_versions FOR EACH ROW EXECUTE FUNCTION plan_versions_frozen()`.execute(db)

  // Acknowledgments of one published version by one lab manager; append-only.
  await db.schema
    .createTable('plan_acknowledgments')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id'))
    .addColumn('plan_version_id', 'integer', (c) => c.notNull().references('plan_versions.id'))
    .addColumn('user_id', 'integer', (c) => c.notNull().references('users.id'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('comment', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('content_hash', 'text', (c) => c.notNull())
    .addColumn('acknowledged_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('plan_acknowledgments_once', ['plan_version_id', 'user_id'])
    .execute()
  await sql`CREATE FUNCTION plan_acknowledgments_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'plan acknowledgments cannot be changed or deleted (% refused)', TG_OP USING ERRCODE = 'P0001';
    END $$`.execute(db)
  await sql`CREATE TRIGGER plan_acknowledgments_append_only BEFORE UPDATE OR DELETE ON plan_acknowledgments
    FOR EACH ROW EXECUTE FUNCTION plan_acknowledgments_append_only()`.execute(db)
  await sql`CREATE TRIGGER plan_acknowledgments_no_truncate BEFORE TRUNCATE ON plan_acknowledgments
    FOR EACH STATEMENT EXECUTE FUNCTION plan_acknowledgments_append_only()`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('plan_acknowledgments').execute()
  await sql`DROP FUNCTION IF EXISTS plan_acknowledgments_append_only()`.execute(db)
  await db.schema.dropTable('plan_versions').execute()
  await sql`DROP FUNCTION IF EXISTS plan_versions_frozen()`.execute(db)
  await db.schema.dropTable('plans').execute()
}
