import PgBoss from 'pg-boss'

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
