import { sql } from 'kysely'
import type { Db } from '../db/database'

/** Run columns without the bulky config, for lists. */
const LIST_COLUMNS = [
  'runs.id', 'runs.org_id', 'runs.floor_id', 'runs.scenario_id', 'runs.batch_id', 'runs.label', 'runs.status', 'runs.progress',
  'runs.message', 'runs.created_at', 'runs.finished_at', 'runs.config', 'runs.attempts',
] as const

export const insertRun = (
  db: Db,
  r: { orgId: number; floorId: number; scenarioId: number | null; batchId: number | null; label: string; config: unknown; floorVersion: number; userId: number | null },
) =>
  db.insertInto('runs')
    .values({
      org_id: r.orgId, floor_id: r.floorId, scenario_id: r.scenarioId, batch_id: r.batchId, label: r.label, config: JSON.stringify(r.config),
      floor_version: r.floorVersion, created_by: r.userId, status: 'queued',
    })
    .returningAll().executeTakeFirstOrThrow()

export const setRunJob = (db: Db, id: number, jobId: string) =>
  db.updateTable('runs').set({ job_id: jobId }).where('id', '=', id).where('job_id', 'is', null).execute()

export const findRunInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('runs').selectAll().where('org_id', '=', orgId).where('id', '=', id).executeTakeFirst()

export const findRunById = (db: Db, id: number) => db.selectFrom('runs').selectAll().where('id', '=', id).executeTakeFirst()

/** A sensitivity case of a bundle (not a run the officer started): lists show the nominal run only. */
export const NOT_A_BUNDLE_CASE = sql<boolean>`not exists (select 1 from run_bundle_members m where m.run_id = runs.id)`

export const listRuns = (db: Db, orgId: number, opts: { floorIds?: number[]; scenarioId?: number; batchId?: number; limit?: number }) => {
  let q = db.selectFrom('runs').select(LIST_COLUMNS).where('org_id', '=', orgId).where(NOT_A_BUNDLE_CASE).orderBy('id', 'desc').limit(opts.limit ?? 200)
  if (opts.floorIds) q = q.where('floor_id', 'in', opts.floorIds.length ? opts.floorIds : [-1])
  if (opts.scenarioId !== undefined) q = q.where('scenario_id', '=', opts.scenarioId)
  if (opts.batchId !== undefined) q = q.where('batch_id', '=', opts.batchId)
  return q.execute()
}

/** Latest run of each scenario among `ids`. */
export const latestRunsOfScenarios = (db: Db, ids: number[]) =>
  ids.length
    ? db.selectFrom('runs').select(['id', 'scenario_id', 'status', 'progress', 'created_at']).distinctOn('scenario_id')
      .where('scenario_id', 'in', ids).where(NOT_A_BUNDLE_CASE).orderBy('scenario_id').orderBy('id', 'desc').execute()
    : Promise.resolve([])

/**
 * A job attempt takes the run: it becomes the holder. Only a queued run, or a running one whose holder was
 * declared lost (holder null), can be claimed; a finished or cancelled run is left alone.
 */
export const claimRun = (db: Db, id: number, holder: string, jobId: string) =>
  db.updateTable('runs')
    .set({ holder, job_id: jobId, status: 'running', attempts: sql`attempts + 1`, started_at: sql`coalesce(started_at, now())`, heartbeat_at: sql`now()`, message: null })
    .where('id', '=', id)
    .where((eb) => eb.or([eb('status', '=', 'queued'), eb.and([eb('status', '=', 'running'), eb('holder', 'is', null)])]))
    .returningAll().executeTakeFirst()

/** Heartbeat and progress from the holder; answers whether a cancel was asked, or undefined when the run was taken away. */
export const heartbeatRun = (db: Db, id: number, holder: string, progress: number) =>
  db.updateTable('runs')
    .set({ heartbeat_at: sql`now()`, progress: sql`greatest(progress, ${progress})` })
    .where('id', '=', id).where('holder', '=', holder).where('status', '=', 'running')
    .returning(['cancel_requested']).executeTakeFirst()

/** The holder ends its run. Nothing happens when it no longer holds it. */
export const finishRun = (db: Db, id: number, holder: string, status: 'succeeded' | 'failed' | 'cancelled', message: string | null) =>
  db.updateTable('runs')
    .set({ status, message, finished_at: sql`now()`, heartbeat_at: sql`now()`, ...(status === 'succeeded' ? { progress: 1 } : {}) })
    .where('id', '=', id).where('holder', '=', holder).where('status', '=', 'running')
    .executeTakeFirst()

/** Stores the result once: a second insert for the same run (a retried job) does nothing. */
export const insertResultOnce = (
  db: Db,
  r: { runId: number; summary: unknown; meta: unknown; series: unknown; frames: Buffer; fronts: Buffer; peak: Buffer },
) =>
  db.insertInto('run_results')
    .values({
      run_id: r.runId, summary: JSON.stringify(r.summary), meta: JSON.stringify(r.meta), series: JSON.stringify(r.series),
      frames: r.frames, fronts: r.fronts, peak: r.peak, byte_size: r.frames.length + r.fronts.length + r.peak.length,
    })
    .onConflict((oc) => oc.column('run_id').doNothing())
    .executeTakeFirst()

export const hasResult = async (db: Db, runId: number) =>
  !!(await db.selectFrom('run_results').select('run_id').where('run_id', '=', runId).executeTakeFirst())

export const countResults = async (db: Db, runId: number) =>
  Number((await db.selectFrom('run_results').select((eb) => eb.fn.countAll<string>().as('n')).where('run_id', '=', runId).executeTakeFirstOrThrow()).n)

export const findResultSummaries = (db: Db, runIds: number[]) =>
  runIds.length
    ? db.selectFrom('run_results').select(['run_id', 'summary', 'meta']).where('run_id', 'in', runIds).execute()
    : Promise.resolve([])

export const findResultMeta = (db: Db, runId: number) =>
  db.selectFrom('run_results').select(['summary', 'meta']).where('run_id', '=', runId).executeTakeFirst()

export const findResultSeries = (db: Db, runId: number) =>
  db.selectFrom('run_results').select(['series']).where('run_id', '=', runId).executeTakeFirst()

export const findResultBinary = (db: Db, runId: number) =>
  db.selectFrom('run_results').select(['frames', 'fronts', 'peak', 'meta']).where('run_id', '=', runId).executeTakeFirst()

export const findResultFronts = (db: Db, runIds: number[]) =>
  runIds.length
    ? db.selectFrom('run_results').select(['run_id', 'fronts', 'meta', 'summary']).where('run_id', 'in', runIds).execute()
    : Promise.resolve([])

/** Cancel asked: a queued run ends at once; a running one is stopped by its holder. */
export const requestCancel = (db: Db, orgId: number, id: number) =>
  db.transaction().execute(async (trx) => {
    const queued = await trx.updateTable('runs')
      .set({ status: 'cancelled', cancel_requested: true, finished_at: sql`now()`, message: 'Cancelled before it started' })
      .where('org_id', '=', orgId).where('id', '=', id).where('status', '=', 'queued')
      .returning(['id', 'job_id']).executeTakeFirst()
    if (queued) return { was: 'queued' as const, jobId: queued.job_id }
    const running = await trx.updateTable('runs').set({ cancel_requested: true })
      .where('org_id', '=', orgId).where('id', '=', id).where('status', '=', 'running').returning(['id', 'job_id']).executeTakeFirst()
    return running ? { was: 'running' as const, jobId: running.job_id } : null
  })

/** Running runs whose holder has not beaten for `staleS` seconds. */
export const findStaleRuns = (db: Db, staleS: number) =>
  db.selectFrom('runs').select(['id', 'job_id', 'holder', 'attempts']).where('status', '=', 'running').where('holder', 'is not', null)
    .where('heartbeat_at', '<', sql<Date>`now() - make_interval(secs => ${staleS})`).execute()

/**
 * Declares a holder lost (compare-and-set on the holder, so one reaper wins): the run goes back to waiting for
 * the job's retry, or fails when its attempts are used up.
 */
export const releaseLostRun = (db: Db, id: number, holder: string, giveUp: boolean) =>
  db.updateTable('runs')
    .set(giveUp
      ? { holder: null, status: 'failed', finished_at: sql`now()`, message: 'The worker running this stopped responding too many times' }
      : { holder: null, message: 'The worker running this stopped responding; another worker will retry it' })
    .where('id', '=', id).where('holder', '=', holder).where('status', '=', 'running')
    .executeTakeFirst()

export const insertBatch = (db: Db, b: { orgId: number; floorId: number; label: string; config: unknown; userId: number | null }) =>
  db.insertInto('run_batches').values({ org_id: b.orgId, floor_id: b.floorId, kind: 'sweep', label: b.label, config: JSON.stringify(b.config), created_by: b.userId })
    .returningAll().executeTakeFirstOrThrow()

export const findBatchInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('run_batches').selectAll().where('org_id', '=', orgId).where('id', '=', id).executeTakeFirst()

export const listBatchesOfFloor = (db: Db, orgId: number, floorId: number) =>
  db.selectFrom('run_batches').selectAll().where('org_id', '=', orgId).where('floor_id', '=', floorId).orderBy('id', 'desc').limit(50).execute()

export const replaceRunJob = (db: Db, id: number, jobId: string) => db.updateTable('runs').set({ job_id: jobId }).where('id', '=', id).execute()

/** Locks the run row for the holder's final write; undefined when the holder lost it. */
export const lockHeldRun = (db: Db, id: number, holder: string) =>
  db.selectFrom('runs').select('id').where('id', '=', id).where('holder', '=', holder).where('status', '=', 'running').forUpdate().executeTakeFirst()

/**
 * A finished result that could not be stored at once (database down) may arrive after the reaper handed the run
 * to another attempt: the late holder takes the run back, since the result is the same computation. Only while
 * the run is still running; undefined when it ended meanwhile.
 */
export const adoptRunForResult = (db: Db, id: number, holder: string) =>
  db.updateTable('runs').set({ holder, heartbeat_at: sql`now()` })
    .where('id', '=', id).where('status', '=', 'running')
    .returning('id').executeTakeFirst()
