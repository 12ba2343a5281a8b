import { Kysely, PostgresDialect } from 'kysely'
import pg from 'pg'
import type { Database } from './schema'

// int8 (count(*), bigserial) as numbers: our counts and ids stay far below 2^53.
pg.types.setTypeParser(pg.types.builtins.INT8, Number)
pg.types.setTypeParser(pg.types.builtins.NUMERIC, Number)

export type Db = Kysely<Database>

export interface DbHandle {
  db: Db
  pool: pg.Pool
  close(): Promise<void>
}

/** One pool + Kysely per process. Errors on idle clients (e.g. PostgreSQL restarting) must not crash the server. */
export function openDatabase(url: string, max = 10): DbHandle {
  const pool = new pg.Pool({ connectionString: url, max, connectionTimeoutMillis: 5000 })
  pool.on('error', (err) => console.warn('[db] idle client error:', err.message))
  const db = new Kysely<Database>({ dialect: new PostgresDialect({ pool }) })
  return { db, pool, close: () => db.destroy() }
}
