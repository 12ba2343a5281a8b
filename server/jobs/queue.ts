import { createRequire } from 'node:module'
import PgBoss from 'pg-boss'

/**
 * pg-boss 10 calls `complete()` / `fail()` after a handler without awaiting them: when the database is down at that
 * moment the rejection is unhandled and Node ends the process. Both keep rejecting for callers that await them;
 * the extra handler only stops the unawaited call from crashing (pg-boss retries the job after its expiry, and our
 * handlers store results themselves, so nothing is lost).
 */
function guardCompletions() {
  const Manager = createRequire(import.meta.url)('pg-boss/src/manager.js') as { prototype: Record<string, unknown> }
  const proto = Manager.prototype as Record<string, ((...a: unknown[]) => Promise<unknown>) & { guarded?: true }>
  for (const name of ['complete', 'fail'] as const) {
    const orig = proto[name]!
    if (orig.guarded) continue
    const guarded = Object.assign(function (this: unknown, ...args: unknown[]) {
      const p = orig.apply(this, args)
      p.catch((e: Error) => console.warn(`[queue] ${name} of job ${String(args[1])} not recorded: ${e.message}`))
      return p
    }, { guarded: true as const })
    // PgBoss exposes the manager's methods under func.name: keep the name, or boss.fail/complete disappear.
    Object.defineProperty(guarded, 'name', { value: name })
    proto[name] = guarded
  }
}
guardCompletions()

/**
 * The PostgreSQL job queue (pg-boss 10, the last line for Node 20). One instance per process; features create
 * their queues with `ensureQueue` before sending or working. Handlers receive arrays of jobs (pg-boss 10 API).
 */
export class JobQueue {
  private readonly created = new Set<string>()
  private started = false
  constructor(readonly boss: PgBoss) {}

  static async start(databaseUrl: string): Promise<JobQueue> {
    const boss = new PgBoss({ connectionString: databaseUrl, schema: 'pgboss', max: 4, supervise: true, maintenanceIntervalSeconds: 30 })
    boss.on('error', (e) => console.warn('[queue]', e.message))
    await boss.start()
    const q = new JobQueue(boss)
    q.started = true
    return q
  }

  async ensureQueue(name: string, options: Omit<PgBoss.Queue, 'name'> = {}) {
    if (this.created.has(name)) return
    const existing = await this.boss.getQueue(name)
    if (!existing) await this.boss.createQueue(name, { name, ...options })
    this.created.add(name)
  }

  async stop() {
    if (!this.started) return
    this.started = false
    await this.boss.stop({ graceful: true, wait: true, timeout: 10_000 })
  }
}
