import { Plan } from '../../shared/floorplan/plan-schema'
import { bundleCases } from '../../shared/runs/bundle'
import { RUN_STATUSES, RunFieldsMeta, RunSummary, ScenarioConfig, type RunDetail, type RunListItem, type RunSeries } from '../../shared/schemas/runs'
import { AppError, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { enqueueRun, RUNS_QUEUE } from '../jobs/runs-worker'
import { appendAudit } from '../repositories/audit.repo'
import { insertBundleMember } from '../repositories/bundles.repo'
import { floorIdsOfUser } from '../repositories/floors.repo'
import {
  findResultBinary, findResultMeta, findResultSeries, findRunInOrg, insertRun, listRuns, requestCancel,
} from '../repositories/runs.repo'
import type { ServiceContext } from './context'
import { canManageFloors } from '../domain/access'
import { requireVisibleFloor } from './floors.service'
import { checkRunnable, requireScenario } from './scenarios.service'
import { RunFieldsCache } from './run-fields-cache'

type ListRow = Awaited<ReturnType<typeof listRuns>>[number]

export function toListItem(r: ListRow): RunListItem {
  const cfg = ScenarioConfig.safeParse(r.config)
  return {
    id: r.id, scenarioId: r.scenario_id, floorId: r.floor_id, batchId: r.batch_id, label: r.label,
    status: RUN_STATUSES.includes(r.status) ? r.status : 'failed', progress: r.progress, message: r.message,
    createdAt: new Date(r.created_at).toISOString(), finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
    ventilationState: cfg.success ? cfg.data.ventilationState : undefined,
  }
}

/** The run if the actor may see its floor; otherwise (other organization, floor not theirs) 404. */
export async function requireRun(ctx: ServiceContext, actor: Actor, id: number) {
  const run = await findRunInOrg(ctx.db, actor.orgId, id)
  if (!run) throw notFound('Run')
  await requireVisibleFloor(ctx.db, actor, run.floor_id).catch(() => { throw notFound('Run') })
  return run
}

/** Queues the scenario's sensitivity cases (none when it has them off); answers their run ids. */
async function queueBundleCases(
  ctx: ServiceContext, actor: Actor,
  b: { nominalRunId: number; floor: { id: number; version: number; plan: unknown; ceiling_height_m: number }; label: string; config: ScenarioConfig },
) {
  if (!b.config.sensitivity?.enabled) return []
  const plan = Plan.safeParse(b.floor.plan)
  if (!plan.success) return []
  const ids: number[] = []
  for (const c of bundleCases(plan.data, b.floor.ceiling_height_m, b.config).cases) {
    const run = await insertRun(ctx.db, { orgId: actor.orgId, floorId: b.floor.id, scenarioId: null, batchId: null, label: `${b.label} · sensitivity: ${c.label}`, config: c.config, floorVersion: b.floor.version, userId: actor.id })
    await insertBundleMember(ctx.db, { runId: run.id, nominalRunId: b.nominalRunId, orgId: actor.orgId, caseKey: c.key, caseLabel: c.label })
    await enqueueRun(ctx.db, ctx.jobs, run.id, -1) // after every ordinary run: the nominal answers first
    ids.push(run.id)
  }
  return ids
}

/** Creates the run row and its job. `config` is what this run uses (a sweep passes one source at a time). */
export async function queueRun(
  ctx: ServiceContext, actor: Actor,
  r: { floorId: number; floorVersion: number; scenarioId: number | null; batchId: number | null; label: string; config: ScenarioConfig },
) {
  const run = await insertRun(ctx.db, { orgId: actor.orgId, floorId: r.floorId, scenarioId: r.scenarioId, batchId: r.batchId, label: r.label, config: r.config, floorVersion: r.floorVersion, userId: actor.id })
  await enqueueRun(ctx.db, ctx.jobs, run.id)
  return run
}

export async function startScenarioRun(ctx: ServiceContext, actor: Actor, scenarioId: number): Promise<RunDetail> {
  const { row, floor } = await requireScenario(ctx, actor, scenarioId)
  const config = ScenarioConfig.parse(row.config)
  checkRunnable(floor, config)
  const run = await queueRun(ctx, actor, { floorId: floor.id, floorVersion: floor.version, scenarioId, batchId: null, label: row.name, config })
  // Sensitivity bundle (issue 17): the extra cases as ordinary runs, each its own job, tied to this nominal run.
  const bundle = await queueBundleCases(ctx, actor, { nominalRunId: run.id, floor, label: row.name, config })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'run.queued', targetType: 'run', targetId: run.id, detail: { scenarioId, ...(bundle.length ? { bundle } : {}) } })
  return getRun(ctx, actor, run.id)
}

export async function listFloorRuns(ctx: ServiceContext, actor: Actor, floorId: number) {
  await requireVisibleFloor(ctx.db, actor, floorId)
  return { runs: (await listRuns(ctx.db, actor.orgId, { floorIds: [floorId] })).map(toListItem) }
}

/** Recent runs of every floor the actor can see. */
export async function listVisibleRuns(ctx: ServiceContext, actor: Actor) {
  const floorIds = canManageFloors(actor) ? undefined : await floorIdsOfUser(ctx.db, actor.id)
  return { runs: (await listRuns(ctx.db, actor.orgId, { floorIds, limit: 100 })).map(toListItem) }
}

export async function getRun(ctx: ServiceContext, actor: Actor, id: number): Promise<RunDetail> {
  const run = await requireRun(ctx, actor, id)
  const res = run.status === 'succeeded' ? await findResultMeta(ctx.db, id) : undefined
  return {
    ...toListItem(run),
    summary: res ? RunSummary.parse(res.summary) : null,
    meta: res ? RunFieldsMeta.parse(res.meta) : null,
    config: ScenarioConfig.parse(run.config),
    floorVersion: run.floor_version,
    attempts: run.attempts,
    canRun: canManageFloors(actor),
  }
}

export async function getRunSeries(ctx: ServiceContext, actor: Actor, id: number): Promise<RunSeries> {
  await requireRun(ctx, actor, id)
  const r = await findResultSeries(ctx.db, id)
  if (!r) throw new AppError(409, 'not_ready', 'This run has no result yet')
  return r.series as RunSeries
}

const fieldsCache = new RunFieldsCache()

/** The Float32 planes (layout: RunFieldsMeta in shared/schemas/runs.ts) as bytes, with the number of frames. */
export async function getRunFields(ctx: ServiceContext, actor: Actor, id: number): Promise<{ bytes: Buffer; frames: number }> {
  await requireRun(ctx, actor, id)
  let entry = fieldsCache.get(id)
  if (!entry) {
    const r = await findResultBinary(ctx.db, id)
    if (!r) throw new AppError(409, 'not_ready', 'This run has no result yet')
    const meta = r.meta as RunFieldsMeta
    entry = { body: Buffer.concat([r.frames, r.fronts, r.peak]), frames: r.frames.length / 4 / (meta.nx * meta.ny) }
    fieldsCache.set(id, entry)
  }
  return { bytes: entry.body, frames: entry.frames }
}

export async function cancelRun(ctx: ServiceContext, actor: Actor, id: number): Promise<RunDetail> {
  await requireRun(ctx, actor, id)
  const r = await requestCancel(ctx.db, actor.orgId, id)
  if (!r) throw new AppError(409, 'finished', 'This run has already finished')
  if (r.was === 'queued' && r.jobId) await ctx.jobs.boss.cancel(RUNS_QUEUE, r.jobId).catch(() => undefined)
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'run.cancel_requested', targetType: 'run', targetId: id })
  return getRun(ctx, actor, id)
}
