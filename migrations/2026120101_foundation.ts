import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('organizations')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  await db.schema
    .createTable('users')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('email', 'text', (c) => c.notNull().unique())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('admin','ehs_officer','lab_manager','staff')`))
    .addColumn('status', 'text', (c) => c.notNull().check(sql`status in ('invited','active','deactivated')`))
    .addColumn('password_hash', 'text')
    .addColumn('unit_system', 'text', (c) => c.notNull().defaultTo('metric'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('users_org_id_index').on('users').column('org_id').execute()

  await db.schema
    .createTable('auth_tokens')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('user_id', 'integer', (c) => c.notNull().references('users.id').onDelete('cascade'))
    .addColumn('purpose', 'text', (c) => c.notNull())
    .addColumn('nonce_hash', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('used_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  await db.schema
    .createTable('app_secrets')
    .addColumn('name', 'text', (c) => c.primaryKey())
    .addColumn('value', 'text', (c) => c.notNull())
    .execute()

  // The table connect-pg-simple expects (its table.sql).
  await sql`CREATE TABLE "session" ("sid" varchar NOT NULL COLLATE "default", "sess" json NOT NULL,
    "expire" timestamp(6) NOT NULL, CONSTRAINT "session_pkey" PRIMARY KEY ("sid") NOT DEFERRABLE INITIALLY IMMEDIATE)`.execute(db)
  await sql`CREATE INDEX "IDX_session_expire" ON "session" ("expire")`.execute(db)

  await db.schema
    .createTable('outgoing_mail')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.references('organizations.id').onDelete('cascade'))
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('ref', 'text')
    .addColumn('to_address', 'text', (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('text_body', 'text', (c) => c.notNull())
    .addColumn('html_body', 'text', (c) => c.notNull())
    .addColumn('ics', 'text')
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('pending'))
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('next_attempt_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('last_error', 'text')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('sent_at', 'timestamptz')
    .execute()
  await db.schema.createIndex('outgoing_mail_due_index').on('outgoing_mail').columns(['status', 'next_attempt_at']).execute()

  await db.schema
    .createTable('captured_mail')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer')
    .addColumn('received_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('envelope_from', 'text', (c) => c.notNull())
    .addColumn('envelope_to', sql`text[]`, (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('text_body', 'text', (c) => c.notNull())
    .addColumn('html_body', 'text')
    .addColumn('attachments', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn('raw', 'text', (c) => c.notNull())
    .execute()

  await db.schema
    .createTable('audit_log')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('actor_id', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('target_type', 'text', (c) => c.notNull())
    .addColumn('target_id', 'text')
    .addColumn('detail', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('audit_log_org_id_index').on('audit_log').columns(['org_id', 'at']).execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['audit_log', 'captured_mail', 'outgoing_mail', 'session', 'app_secrets', 'auth_tokens', 'users', 'organizations']) {
    await db.schema.dropTable(t).ifExists().execute()
  }
}
