import { execFileSync } from 'node:child_process'
import pg from 'pg'
import type { TestProject } from 'vitest/node'
import { Kysely, PostgresDialect } from 'kysely'
import { migrateToLatest } from '../../server/db/migrator'

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string
  }
}

/** Starts the project cluster and gives each test project a freshly created, migrated database. */
export default async function setup(project: TestProject) {
  const out = execFileSync('bash', ['server/cli/pg.sh', 'start', 'postgres'], { encoding: 'utf8' }).trim().split('\n')
  const adminUrl = out[out.length - 1]!
  // The pid keeps parallel runs (several developers' terminals) from dropping each other's database.
  const name = `driftwarden_test_${project.name}_${process.pid}`
  const admin = new pg.Client({ connectionString: adminUrl })
  await admin.connect()
  await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
  await admin.query(`CREATE DATABASE ${name}`)
  await admin.end()
  const url = adminUrl.replace(/\/postgres$/, `/${name}`)
  const db = new Kysely<any>({ dialect: new PostgresDialect({ pool: new pg.Pool({ connectionString: url, max: 2 }) }) })
  await migrateToLatest(db)
  await db.destroy()
  project.provide('databaseUrl', url)
  return async () => {
    const c = new pg.Client({ connectionString: adminUrl })
    await c.connect()
    await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`).catch(() => undefined)
    await c.end()
  }
}
