import { execFileSync } from 'node:child_process'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import { openDatabase } from './db/database'
import { migrateToLatest } from './db/migrator'
import { JobQueue } from './jobs/queue'
import { startRunWorkers } from './jobs/runs-worker'

/**
 * A separate engine worker process (`npm run worker`), for other machines against the same database:
 * DATABASE_URL, or the project-local cluster like server/main.ts. WORKERS = parallel runs (default 1).
 * SIGTERM/SIGINT: stop taking jobs, let the running one finish (or be retried elsewhere), exit 0.
 */
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..')

function databaseUrl(): string {
  if (process.env.DATABASE_URL) return process.env.DATABASE_URL
  const out = execFileSync('bash', [path.join(root, 'server/cli/pg.sh'), 'start', 'driftwarden'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'] })
  return out.trim().split('\n').pop()!
}

async function main() {
  const url = databaseUrl()
  const handle = openDatabase(url, 4)
  await migrateToLatest(handle.db)
  const jobs = await JobQueue.start(url)
  const concurrency = Math.max(1, Number(process.env.WORKERS ?? 1) || 1)
  const workers = await startRunWorkers(handle.db, jobs, { concurrency, name: `worker ${process.pid}` })
  let closing = false
  const stop = async (signal: string) => {
    if (closing) return
    closing = true
    console.log(`[worker] ${signal}: finishing the current run, then exiting`)
    try {
      await workers.stop()
      await jobs.stop()
      await handle.close()
    } catch (e) {
      console.error('[worker] error while stopping:', e instanceof Error ? e.message : e)
    }
    process.exit(0)
  }
  process.on('SIGTERM', () => void stop('SIGTERM'))
  process.on('SIGINT', () => void stop('SIGINT'))
  // Announced only once the signal handlers are in place, so a supervisor may stop us right after.
  console.log(`[worker] ${workers.holderPrefix} working the engine-runs queue with ${concurrency} thread(s)`)
}

main().catch((e) => {
  console.error('Driftwarden worker failed to start:', e instanceof Error ? e.message : e)
  process.exit(1)
})
