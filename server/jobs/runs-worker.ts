import { randomUUID } from 'node:crypto'
import { hostname } from 'node:os'
import type PgBoss from 'pg-boss'
import { Plan } from '../../shared/floorplan/plan-schema'
import { applySourceOffset } from '../../shared/runs/bundle'
import { buildRunScenario } from '../../shared/runs/build-scenario'
import { summarizeRun } from '../../shared/runs/summarize'
import { ScenarioConfig } from '../../shared/schemas/runs'
import type { Db } from '../db/database'
import { findFloorInOrg } from '../repositories/floors.repo'
import {
  adoptRunForResult, claimRun, findRunById, findStaleRuns, finishRun, hasResult, heartbeatRun, insertResultOnce, lockHeldRun, releaseLostRun, replaceRunJob, setRunJob,
} from '../repositories/runs.repo'
import { ScenarioError, SimulationCancelled } from '../../shared/engine/errors'
import { runSimulationInWorker } from '../engine-thread/run-in-worker'
import type { JobQueue } from './queue'
import { stampResult } from '../services/staleness.service'

/** The pg-boss queue of engine runs. Job data: { runId }. */
/** Wraps what the engine thread rejected with, to tell it apart from database trouble after the run. */
class EngineStopped extends Error {
  constructor(readonly cause: unknown) {
    super(cause instanceof Error ? cause.message : String(cause))
  }
}

export const RUNS_QUEUE = 'engine-runs'
/** Attempts of one run before it is failed for good (first try + retries). */
export const MAX_ATTEMPTS = 4

export async function ensureRunsQueue(jobs: JobQueue) {
  // Dead workers are noticed by the heartbeat reaper within seconds; pg-boss's own expiry is only the last resort.
  await jobs.ensureQueue(RUNS_QUEUE, { retryLimit: MAX_ATTEMPTS - 1, retryDelay: 1, retryBackoff: false, expireInSeconds: 6 * 3600 })
}

/** `priority` below 0 lets every ordinary run go first (a bundle's sensitivity cases: issue 17). */
export async function enqueueRun(db: Db, jobs: JobQueue, runId: number, priority = 0): Promise<string> {
  await ensureRunsQueue(jobs)
  const jobId = await jobs.boss.send(RUNS_QUEUE, { runId }, { retryLimit: MAX_ATTEMPTS - 1, retryDelay: 1, expireInSeconds: 6 * 3600, ...(priority ? { priority } : {}) })
  if (!jobId) throw new Error('the job queue refused the run')
  await setRunJob(db, runId, jobId)
  return jobId
}

export interface RunWorkerOptions {
  /** Parallel runs in this process (each in its own thread). */
  concurrency: number
  /** Heartbeat and progress write interval, ms. @default 500 */
  heartbeatMs?: number
  /** A running run whose holder has not beaten for this long is handed to another worker, s. @default env RUN_STALE_S or 20 */
  staleAfterS?: number
  /** Name in logs. */
  name?: string
  /** How long a finished result is kept in memory and its store retried while the database is unreachable, s. @default 900 */
  storeRetryS?: number
}

export interface RunWorkers {
  /** Stops taking jobs, cancels nothing: in-flight runs finish (or are retried elsewhere after a timeout). */
  stop(): Promise<void>
  readonly holderPrefix: string
}

/** Works the runs queue: claims the run, runs the engine in a thread, stores the result once. */
export async function startRunWorkers(db: Db, jobs: JobQueue, opts: RunWorkerOptions): Promise<RunWorkers> {
  await ensureRunsQueue(jobs)
  const heartbeatMs = opts.heartbeatMs ?? 500
  const staleAfterS = opts.staleAfterS ?? Number(process.env.RUN_STALE_S ?? 20)
  const storeRetryS = opts.storeRetryS ?? 900
  const holderPrefix = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`
  const log = (msg: string) => { if (process.env.RUN_WORKER_LOG !== '0') console.log(`[runs ${opts.name ?? holderPrefix}] ${msg}`) }
  const active = new Set<Promise<unknown>>()
  let stopping = false

  const handle = async (job: PgBoss.Job<{ runId: number }>) => {
    const runId = job.data.runId
    const holder = `${holderPrefix}:${randomUUID().slice(0, 8)}`
    const run = await claimRun(db, runId, holder, job.id)
    if (!run) return { skipped: 'not claimable (finished, cancelled or held by a live worker)' }
    log(`run ${runId} attempt ${run.attempts}`)
    if (run.cancel_requested) { await finishRun(db, runId, holder, 'cancelled', 'Cancelled'); return { cancelled: true } }
    // A previous attempt stored the result and died before marking the run: finish it without running again.
    if (await hasResult(db, runId)) { await finishRun(db, runId, holder, 'succeeded', null); return { stored: 'earlier' } }

    const floor = await findFloorInOrg(db, run.org_id, run.floor_id)
    const fail = async (message: string) => { await finishRun(db, runId, holder, 'failed', message); return { failed: message } }
    if (!floor) return fail('The floor no longer exists')
    const plan = Plan.safeParse(floor.plan)
    const config = ScenarioConfig.safeParse(run.config)
    if (!plan.success || !config.success) return fail('The stored plan or scenario is not valid any more')
    const built = buildRunScenario(plan.data, floor.ceiling_height_m, config.data, run.label)
    if (!built.ok) return fail(`The scenario cannot run on the current plan: ${Object.entries(built.fields).map(([k, v]) => `${k}: ${v}`).join('; ')}`)

    let progress = 0
    // A bundle's position case moves the leak (issue 17); every other case differs only in its ScenarioConfig.
    if (config.data.sourceOffsetM) built.scenario = applySourceOffset(built.scenario, config.data)
    const engine = runSimulationInWorker(built.scenario, { onProgress: (f) => { progress = f } })
    let lost = false
    const beat = setInterval(() => {
      heartbeatRun(db, runId, holder, Math.min(progress, 0.99)).then((r) => {
        if (!r) { lost = true; engine.cancel() } else if (r.cancel_requested) engine.cancel()
      }).catch((e) => log(`heartbeat failed: ${(e as Error).message}`))
    }, heartbeatMs)
    try {
      const result = await engine.result.catch((e: unknown) => { throw new EngineStopped(e) })
      clearInterval(beat)
      const stored = summarizeRun(result, plan.data, config.data, built.scenario, built.notes)
      const buf = (a: Float32Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength)
      // The result is kept and its store retried until the database answers again (issue 14): a run that
      // finishes during an outage is not computed twice, nor lost.
      const t0 = Date.now()
      for (let attempt = 1; ; attempt++) {
        try {
          await db.transaction().execute(async (trx) => {
            // Only the holder may store and finish; the primary key on run_id makes the insert happen once. A holder
            // declared lost during the outage takes its run back while it is still running.
            const still = (await lockHeldRun(trx, runId, holder)) ?? (attempt > 1 ? await adoptRunForResult(trx, runId, holder) : undefined)
            if (!still) return
            await insertResultOnce(trx, { runId, summary: stored.summary, meta: stored.meta, series: stored.series, frames: buf(stored.frames), fronts: buf(stored.fronts), peak: buf(stored.peak) })
            await stampResult(trx, runId, built.gasId) // engine and gas library versions (issue 17)
            await finishRun(trx, runId, holder, 'succeeded', null)
          })
          break
        } catch (e) {
          if (Date.now() - t0 > storeRetryS * 1000 || stopping) throw e
          if (attempt === 1) log(`run ${runId}: result not stored yet (${(e as Error).message}); retrying`)
          await new Promise((r) => setTimeout(r, Math.min(5000, 250 * 2 ** Math.min(attempt, 5))))
        }
      }
      log(`run ${runId} stored (${(result.stats.wall_s).toFixed(1)} s engine)`)
      return { ok: true }
    } catch (e) {
      clearInterval(beat)
      if (e instanceof EngineStopped && e.cause instanceof SimulationCancelled) {
        if (lost) return { lost: true }
        await finishRun(db, runId, holder, 'cancelled', 'Cancelled while running')
        return { cancelled: true }
      }
      if (e instanceof EngineStopped && e.cause instanceof ScenarioError) return fail(`The engine refused the scenario: ${e.message}`)
      if (e instanceof EngineStopped) return fail(`The engine stopped: ${e.message}`)
      // Database trouble and the like: let pg-boss retry; give the run back first.
      await releaseLostRun(db, runId, holder, false).catch(() => undefined)
      throw e
    }
  }

  const workerIds: string[] = []
  for (let i = 0; i < Math.max(0, opts.concurrency); i++) {
    workerIds.push(await jobs.boss.work<{ runId: number }>(RUNS_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
      const p = handle(job!)
      active.add(p)
      try { return await p } finally { active.delete(p) }
    }))
  }

  // The reaper: a holder that stopped beating (process killed, machine lost) gives its run back to the queue.
  const reap = async () => {
    for (const r of await findStaleRuns(db, staleAfterS)) {
      const giveUp = r.attempts >= MAX_ATTEMPTS
      const released = await releaseLostRun(db, r.id, r.holder!, giveUp)
      if (!released.numUpdatedRows) continue
      log(`run ${r.id}: holder ${r.holder} lost${giveUp ? '; giving up' : '; re-queued'}`)
      if (r.job_id) await jobs.boss.fail(RUNS_QUEUE, r.job_id, { message: 'worker lost' }).catch(() => undefined)
      if (!giveUp) {
        const fresh = await findRunById(db, r.id)
        if (fresh?.status === 'running' && fresh.holder === null) {
          const jobId = await jobs.boss.send(RUNS_QUEUE, { runId: r.id }, { retryLimit: MAX_ATTEMPTS - 1, retryDelay: 1, expireInSeconds: 6 * 3600 })
          if (jobId) await replaceRunJob(db, r.id, jobId)
        }
      }
    }
  }
  const reaper = setInterval(() => { if (!stopping) reap().catch((e) => log(`reaper: ${(e as Error).message}`)) }, Math.max(1000, (staleAfterS * 1000) / 3))

  return {
    holderPrefix,
    stop: async () => {
      stopping = true
      clearInterval(reaper)
      for (const id of workerIds) await jobs.boss.offWork(id).catch(() => undefined)
      await Promise.allSettled([...active])
    },
  }
}
