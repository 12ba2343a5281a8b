import { type Kysely, sql } from 'kysely'

// Frozen in time: never import application code here.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('sites')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('address', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('sites_org_id_index').on('sites').column('org_id').execute()

  await db.schema
    .createTable('floors')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    // org_id repeats the site's organization so every floor query can filter by the caller's org directly.
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('site_id', 'integer', (c) => c.notNull().references('sites.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('ceiling_height_m', 'double precision', (c) => c.notNull().check(sql`ceiling_height_m > 0`))
    .addColumn('plan', 'jsonb', (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('plan_valid', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('problems', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn('updated_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('floors_site_id_index').on('floors').column('site_id').execute()
  await db.schema.createIndex('floors_org_id_index').on('floors').column('org_id').execute()

  // Who belongs to a floor: lab managers responsible for it ('manager') and staff assigned to it ('member').
  await db.schema
    .createTable('floor_members')
    .addColumn('floor_id', 'integer', (c) => c.notNull().references('floors.id').onDelete('cascade'))
    .addColumn('user_id', 'integer', (c) => c.notNull().references('users.id').onDelete('cascade'))
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ('manager','member')`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('floor_members_pkey', ['floor_id', 'user_id', 'kind'])
    .execute()
  await db.schema.createIndex('floor_members_user_id_index').on('floor_members').column('user_id').execute()

  // Traced floor-plan images (PNG/JPEG, checked by content), kept in the database with the plan.
  await db.schema
    .createTable('floor_images')
    .addColumn('id', 'serial', (c) => c.primaryKey())
    .addColumn('org_id', 'integer', (c) => c.notNull().references('organizations.id').onDelete('cascade'))
    .addColumn('floor_id', 'integer', (c) => c.notNull().references('floors.id').onDelete('cascade'))
    .addColumn('mime', 'text', (c) => c.notNull().check(sql`mime in ('image/png','image/jpeg')`))
    .addColumn('byte_size', 'integer', (c) => c.notNull())
    .addColumn('bytes', 'bytea', (c) => c.notNull())
    .addColumn('file_name', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex('floor_images_floor_id_index').on('floor_images').column('floor_id').execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('floor_images').execute()
  await db.schema.dropTable('floor_members').execute()
  await db.schema.dropTable('floors').execute()
  await db.schema.dropTable('sites').execute()
}
