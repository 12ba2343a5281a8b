import { sql } from 'kysely'
import { afterAll, describe, expect, it } from 'vitest'
import { openDatabase } from '../../server/db/database'
import { databaseUrl } from '../support/test-runtime'

// A connection PostgreSQL drops while the app holds it between two queries (inside a
// transaction) emits 'error' on the client itself, outside any query. Without a listener
// that is an uncaught exception that takes the whole server down.
describe('a connection dropped while checked out', () => {
  const handle = openDatabase(databaseUrl(), 3)
  const observer = openDatabase(databaseUrl(), 1)
  afterAll(async () => {
    await handle.close()
    await observer.close()
  })

  it('fails only the transaction that held it; the process and the pool carry on', async () => {
    const uncaught: unknown[] = []
    const onUncaught = (e: unknown) => uncaught.push(e)
    process.on('uncaughtException', onUncaught)
    try {
      const outcome = await handle.db.transaction().execute(async (trx) => {
        const { rows } = await sql<{ pid: number }>`select pg_backend_pid() as pid`.execute(trx)
        await sql`select pg_terminate_backend(${rows[0].pid})`.execute(observer.db)
        await new Promise((r) => setTimeout(r, 300)) // the FATAL arrives while no query runs
        return sql`select 1`.execute(trx)
      }).then(() => 'committed', (e: Error) => e.message)

      expect(outcome).not.toBe('committed')
      expect(uncaught).toEqual([])
      const { rows } = await sql<{ one: number }>`select 1 as one`.execute(handle.db)
      expect(rows[0].one).toBe(1)
    } finally {
      process.off('uncaughtException', onUncaught)
    }
  })
})
