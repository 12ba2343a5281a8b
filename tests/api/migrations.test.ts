import { NO_MIGRATIONS } from 'kysely'
import pg from 'pg'
import { describe, expect, it } from 'vitest'
import { openDatabase } from '../../server/db/database'
import { makeMigrator } from '../../server/db/migrator'
import { databaseUrl } from '../support/test-runtime'

describe('migrations', () => {
  it('apply to a throwaway database, roll back to nothing, and apply again', async () => {
    const url = new URL(databaseUrl())
    const name = `dw_migration_check_${process.pid}`
    const admin = new pg.Client({ connectionString: databaseUrl() })
    await admin.connect()
    await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
    await admin.query(`CREATE DATABASE ${name}`)
    url.pathname = `/${name}`
    const { db, close } = openDatabase(url.toString(), 2)
    try {
      const m = makeMigrator(db)
      const up = await m.migrateToLatest()
      expect(up.error).toBeUndefined()
      const applied = up.results!.length
      expect(applied).toBeGreaterThan(0)
      const down = await m.migrateTo(NO_MIGRATIONS)
      expect(down.error).toBeUndefined()
      expect(down.results!.length).toBe(applied)
      const tables = await db.introspection.getTables()
      expect(tables.filter((t) => !t.schema || t.schema === 'public').map((t) => t.name).filter((n) => !n.startsWith('kysely_'))).toEqual([])
      expect((await m.migrateToLatest()).error).toBeUndefined()
    } finally {
      await close()
      await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
      await admin.end()
    }
  })
})
