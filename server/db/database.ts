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

/**
 * One pool + Kysely per process. A connection dropped by PostgreSQL (a restart, an admin
 * terminating backends) must not crash the server: idle clients report through the pool's
 * 'error'; a checked-out client between two queries (Kysely holds one across a transaction)
 * emits 'error' on itself, so every client gets a listener too. The pool discards a broken
 * client when it is released, and the waiting query fails with an error the API maps to 503.
 */
export function openDatabase(url: string, max = 10): DbHandle {
  const pool = new pg.Pool({ connectionString: url, max, connectionTimeoutMillis: 5000 })
  pool.on('connect', (client) => client.on('error', (err) => console.warn('[db] connection lost:', err.message)))
  pool.on('error', () => {}) // already logged by the client's own listener above
  const db = new Kysely<Database>({ dialect: new PostgresDialect({ pool }) })
  return { db, pool, close: () => db.destroy() }
}
