import { sweepWorstCase } from '../../shared/runs/sweep'
import { RunSummary, ScenarioConfig, type SweepDetail, type SweepInput } from '../../shared/schemas/runs'
import { AppError, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import { findBatchInOrg, findResultSummaries, insertBatch, listBatchesOfFloor, listRuns } from '../repositories/runs.repo'
import type { ServiceContext } from './context'
import { requireVisibleFloor } from './floors.service'
import { queueRun, toListItem } from './runs.service'
import { checkRunnable } from './scenarios.service'

/** One batch: the same leak and conditions at each chosen source in turn ("any of these cylinders"). */
export async function startSweep(ctx: ServiceContext, actor: Actor, floorId: number, input: SweepInput): Promise<SweepDetail> {
  const floor = await requireVisibleFloor(ctx.db, actor, floorId)
  // Each source alone must be runnable; checking them together also refuses unknown ids with their index.
  for (const [i, id] of input.config.sourceIds.entries()) {
    try {
      checkRunnable(floor, { ...input.config, sourceIds: [id] })
    } catch (e) {
      if (!(e instanceof AppError) || !e.fields) throw e
      const fields = Object.fromEntries(Object.entries(e.fields).map(([k, v]) => [k === 'sourceIds.0' ? `config.sourceIds.${i}` : `config.${k}`, v]))
      throw new AppError(400, e.code, `Some fields are not valid: ${Object.keys(fields).join(', ')}`, fields)
    }
  }
  const batch = await insertBatch(ctx.db, { orgId: actor.orgId, floorId, label: input.config.name, config: input.config, userId: actor.id })
  for (const id of input.config.sourceIds) {
    const config: ScenarioConfig = { ...input.config, sourceIds: [id] }
    await queueRun(ctx, actor, { floorId, floorVersion: floor.version, scenarioId: null, batchId: batch.id, label: `${input.config.name} — ${id}`, config })
  }
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'sweep.queued', targetType: 'run_batch', targetId: batch.id, detail: { sources: input.config.sourceIds } })
  return getSweep(ctx, actor, batch.id)
}

export async function getSweep(ctx: ServiceContext, actor: Actor, id: number): Promise<SweepDetail> {
  const batch = await findBatchInOrg(ctx.db, actor.orgId, id)
  if (!batch) throw notFound('Sweep')
  await requireVisibleFloor(ctx.db, actor, batch.floor_id).catch(() => { throw notFound('Sweep') })
  const runs = (await listRuns(ctx.db, actor.orgId, { batchId: id })).reverse()
  const summaries = new Map((await findResultSummaries(ctx.db, runs.filter((r) => r.status === 'succeeded').map((r) => r.id))).map((s) => [s.run_id, RunSummary.parse(s.summary)]))
  const items = runs.map((r) => ({ ...toListItem(r), sourceId: ScenarioConfig.parse(r.config).sourceIds[0]! }))
  const { limits, worstCase } = sweepWorstCase(items.map((r) => ({ sourceId: r.sourceId, summary: summaries.get(r.id) ?? null })))
  return {
    id: batch.id, floorId: batch.floor_id, label: batch.label, createdAt: new Date(batch.created_at).toISOString(),
    runs: items, limits, worstCase, complete: items.every((r) => ['succeeded', 'failed', 'cancelled'].includes(r.status)),
  }
}

export async function listSweeps(ctx: ServiceContext, actor: Actor, floorId: number) {
  await requireVisibleFloor(ctx.db, actor, floorId)
  const rows = await listBatchesOfFloor(ctx.db, actor.orgId, floorId)
  return { sweeps: rows.map((b) => ({ id: b.id, label: b.label, createdAt: new Date(b.created_at).toISOString() })) }
}
