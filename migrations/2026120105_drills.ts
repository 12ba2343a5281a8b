import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  // How often each site must drill; 90 days (quarterly) is the default, as common for hazardous-production occupancies.
  await sql`ALTER TABLE sites ADD COLUMN drill_frequency_days integer NOT NULL DEFAULT 90 CHECK (drill_frequency_days > 0)`.execute(db)

  await db.schema
    .createTable('drills')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('plan_id', 'integer', (c) => c.notNull().references('plans.id'))
    .addColumn('plan_version_id', 'integer', (c) => c.notNull().references('plan_versions.id'))
    .addColumn('floor_id', 'integer', (c) => c.references('floors.id').onDelete('set null'))
    .addColumn('site_id', 'integer', (c) => c.references('sites.id').onDelete('set null'))
    .addColumn('floor_name', 'text', (c) => c.notNull())
    .addColumn('site_name', 'text', (c) => c.notNull())
    .addColumn('title', 'text', (c) => c.notNull())
    .addColumn('scenario', 'text', (c) => c.notNull())
    .addColumn('location', 'text', (c) => c.notNull())
    .addColumn('starts_at', 'timestamptz', (c) => c.notNull())
    .addColumn('time_zone', 'text', (c) => c.notNull())
    .addColumn('duration_minutes', 'integer', (c) => c.notNull())
    .addColumn('reminder_minutes', 'integer', (c) => c.notNull())
    .addColumn('reminder_sent_at', 'timestamptz')
    .addColumn('officer_id', 'integer', (c) => c.references('users.id').onDelete('set null'))
    // The plan version's checklist and predicted times, copied when scheduled (the version is frozen anyway).
    .addColumn('checklist', 'jsonb', (c) => c.notNull())
    .addColumn('predicted', 'jsonb', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('scheduled').check(sql`status in ('scheduled','completed','cancelled')`))
    // iCalendar SEQUENCE: 0 at the invitation, +1 for each move or the cancellation.
    .addColumn('sequence', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('cancel_reason', 'text')
    .addColumn('step_results', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn('measured', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn('observations', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('recorded_at', 'timestamptz')
    .addColumn('recorded_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('drills_org_floor_index').on('drills').columns(['org_id', 'floor_id']).execute()
  await sql`CREATE INDEX drills_reminder_due_index ON drills (starts_at) WHERE status = 'scheduled' AND reminder_sent_at IS NULL`.execute(db)

  // Who is invited. The receipt link is a signed token whose nonce hash is stored here; a new notice rotates it.
  await db.schema
    .createTable('drill_participants')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('drill_id', 'integer', (c) => c.notNull().references('drills.id').onDelete('cascade'))
    .addColumn('user_id', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('source', 'text', (c) => c.notNull())
    .addColumn('nonce_hash', 'text')
    .addColumn('token_expires_at', 'timestamptz')
    .addColumn('token_used_at', 'timestamptz')
    .addColumn('confirmed_at', 'timestamptz')
    .addColumn('confirmed_sequence', 'integer')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('drill_participants_once', ['drill_id', 'email'])
    .execute()
  await db.schema.createIndex('drill_participants_user_index').on('drill_participants').column('user_id').execute()

  // Findings and their corrective actions, followed up until closed.
  await db.schema
    .createTable('drill_findings')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('drill_id', 'integer', (c) => c.notNull().references('drills.id').onDelete('cascade'))
    .addColumn('finding', 'text', (c) => c.notNull())
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('owner_id', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('owner_name', 'text', (c) => c.notNull())
    .addColumn('due_date', 'date', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('open').check(sql`status in ('open','closed')`))
    .addColumn('note', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('closed_at', 'timestamptz')
    .addColumn('closed_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('drill_findings_org_status_index').on('drill_findings').columns(['org_id', 'status']).execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('drill_findings').execute()
  await db.schema.dropTable('drill_participants').execute()
  await db.schema.dropTable('drills').execute()
  await sql`ALTER TABLE sites DROP COLUMN drill_frequency_days`.execute(db)
}
