import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  // Invitations live apart from accounts (issue 14): an invited address shows in the inviting organization's list
  // whether or not it has an account elsewhere. The id comes from the users' sequence, so an invitation and an
  // account never share an id and the account made on acceptance keeps the invitation's id.
  await db.schema
    .createTable('invitations')
    .addColumn('id', 'integer', (c) => c.primaryKey().defaultTo(sql`nextval('users_id_seq')`))
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('role', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('pending').check(sql`status IN ('pending', 'revoked', 'accepted')`))
    // Null when no link was sent (the address has an account with another organization).
    .addColumn('nonce_hash', 'text')
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('used_at', 'timestamptz')
    .addColumn('invited_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await sql`CREATE UNIQUE INDEX invitations_org_email ON invitations (org_id, email)`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('invitations').execute()
}
