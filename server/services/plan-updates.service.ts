import { compareTimesToLimits, timeChangeText } from '../../shared/plans/stale-changes'
import { RunSummary } from '../../shared/schemas/runs'
import type { BringUpToDate, PlanUpdateState } from '../../shared/schemas/staleness'
import { AppError, conflict } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import {
  finishPlanUpdate, findUserActor, insertPlanUpdate, latestPlanUpdate, findWaitingUpdate, resultVersions, runStates, waitingPlanUpdates,
} from '../repositories/staleness.repo'
import type { BackgroundHost, ServiceContext } from './context'
import { getPlan, publishPlan, refreshPlan } from './plans.service'
import { startScenarioRun } from './runs.service'
import { planUpdateOf } from './staleness.service'

/**
 * "Bring up to date" (issue 17, item 7): one action re-runs the plan's scenarios on the floor as it is now, and when
 * every re-run has finished, refreshes the draft from the new results (keeping the officer's own text), records old
 * against new times to limits, and, if asked, publishes, which e-mails the lab managers to acknowledge again with the
 * difference summarised. A pg-boss queue with the singleton policy finishes the waiting requests one at a time.
 */
export const PLAN_UPDATES_QUEUE = 'plan-updates'

export async function bringUpToDate(ctx: ServiceContext, actor: Actor, planId: number, input: BringUpToDate): Promise<PlanUpdateState> {
  const plan = await getPlan(ctx, actor, planId)
  if (!plan.canEdit) throw new AppError(403, 'forbidden', 'Only EHS officers and admins bring plans up to date')
  if (plan.floorId === null) throw conflict('The floor of this plan was deleted: it can no longer be re-run', 'floor_deleted')
  if (plan.update?.status === 'waiting') throw conflict('This plan is already being brought up to date: its re-runs are still going', 'update_waiting')
  const used = await resultVersions(ctx.db, plan.runIds)
  const scenarioIds = [...new Set(used.map((r) => r.scenarioId).filter((s): s is number => s !== null))]
  if (!scenarioIds.length) {
    throw conflict('The results of this plan do not come from saved scenarios, so they cannot be re-run here: run the scenarios, then refresh the plan from the new results', 'nothing_to_rerun')
  }
  // Results without a scenario (a sweep member, for instance) stay as they are beside the re-runs.
  const kept = used.filter((r) => r.scenarioId === null).map((r) => r.runId)
  const reruns: number[] = []
  for (const s of scenarioIds) reruns.push((await startScenarioRun(ctx, actor, s)).id)
  const row = await insertPlanUpdate(ctx.db, { orgId: actor.orgId, planId, userId: actor.id, oldRunIds: plan.runIds, runIds: [...reruns, ...kept], publish: input.publish, ackDueDays: input.ackDueDays })
  if (!row) throw conflict('This plan is already being brought up to date: its re-runs are still going', 'update_waiting')
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'plan.update_requested', targetType: 'plan', targetId: planId,
    detail: { reruns, kept, publish: input.publish } })
  await tickPlanUpdates(ctx)
  return planUpdateOf(ctx.db, actor.orgId, planId)
}

export async function planUpdateState(ctx: ServiceContext, actor: Actor, planId: number): Promise<PlanUpdateState> {
  await getPlan(ctx, actor, planId)
  return (await latestPlanUpdate(ctx.db, actor.orgId, planId)) ? planUpdateOf(ctx.db, actor.orgId, planId) : null
}

const summaries = async (ctx: ServiceContext, ids: number[]) =>
  (await resultVersions(ctx.db, ids)).flatMap((r) => {
    const s = RunSummary.safeParse(r.summary)
    return s.success ? [s.data] : []
  })

/** Finishes the waiting requests whose re-runs have all ended; answers how many are still waiting. */
export async function processPlanUpdates(ctx: ServiceContext): Promise<number> {
  let waiting = 0
  for (const u of await waitingPlanUpdates(ctx.db)) {
    const states = await runStates(ctx.db, u.run_ids)
    const bad = states.find((s) => s.status === 'failed' || s.status === 'cancelled')
    if (!bad && states.some((s) => s.status === 'queued' || s.status === 'running')) { waiting++; continue }
    const held = await findWaitingUpdate(ctx.db, u.id)
    if (!held) continue
    if (bad || states.length !== u.run_ids.length) {
      await finishPlanUpdate(ctx.db, u.id, 'failed', bad ? `Re-run #${bad.id} (${bad.label}) ${bad.status}${bad.message ? `: ${bad.message}` : ''}. The plan was not changed.` : 'A re-run is missing. The plan was not changed.', [])
      continue
    }
    const who = u.requested_by === null ? undefined : await findUserActor(ctx.db, u.requested_by)
    if (!who || who.status !== 'active') {
      await finishPlanUpdate(ctx.db, u.id, 'failed', 'The officer who asked for this is no longer active. The plan was not changed.', [])
      continue
    }
    const actor: Actor = { id: who.id, orgId: who.org_id, role: who.role, email: who.email, name: who.name }
    const changes = compareTimesToLimits(await summaries(ctx, u.old_run_ids), await summaries(ctx, u.run_ids)).map(timeChangeText)
    try {
      await refreshPlan(ctx, actor, u.plan_id, u.run_ids)
      if (u.publish) await publishPlan(ctx, actor, u.plan_id, u.ack_due_days)
      await finishPlanUpdate(ctx.db, u.id, u.publish ? 'published' : 'refreshed', null, changes)
    } catch (e) {
      const message = e instanceof AppError ? e.message : 'The refresh failed; see the server log'
      if (!(e instanceof AppError)) console.warn('[plan-updates]', (e as Error).message)
      await finishPlanUpdate(ctx.db, u.id, 'failed', `${message}. The plan was not published.`, changes)
    }
  }
  return waiting
}

const ensurePlanUpdatesQueue = (ctx: ServiceContext) =>
  ctx.jobs.ensureQueue(PLAN_UPDATES_QUEUE, { policy: 'singleton', retryLimit: 3, retryDelay: 5, expireInSeconds: 600 })

export async function tickPlanUpdates(ctx: ServiceContext, afterS = 0) {
  await ensurePlanUpdatesQueue(ctx)
  await ctx.jobs.boss.send(PLAN_UPDATES_QUEUE, {}, afterS ? { startAfter: afterS } : {})
}

/** The queue's worker (server process): each tick finishes what it can and asks for another while re-runs go on. */
export async function startPlanUpdates(rt: BackgroundHost) {
  const boss = rt.ctx.jobs.boss
  await ensurePlanUpdatesQueue(rt.ctx)
  const workerId = await boss.work(PLAN_UPDATES_QUEUE, { pollingIntervalSeconds: 0.5, batchSize: 1 }, async () => {
    const waiting = await processPlanUpdates(rt.ctx)
    if (waiting) await tickPlanUpdates(rt.ctx, 2)
    return { waiting }
  })
  // A safety net after a restart: the chain of ticks lives in the queue, but a minute's tick costs nothing.
  await boss.schedule(PLAN_UPDATES_QUEUE, '* * * * *')
  rt.onClose(async () => { await boss.offWork({ id: workerId }) })
}
