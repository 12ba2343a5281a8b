import { ScenarioError } from '../../shared/engine/errors'
import { validateScenario } from '../../shared/engine/validate'
import { Plan } from '../../shared/floorplan/plan-schema'
import { buildRunScenario } from '../../shared/runs/build-scenario'
import type { ScenarioChange, ScenarioConfig, ScenarioRecord } from '../../shared/schemas/runs'
import { ScenarioConfig as ScenarioConfigSchema } from '../../shared/schemas/runs'
import { AppError, conflict, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import { latestRunsOfScenarios } from '../repositories/runs.repo'
import {
  deleteScenario, findScenarioByName, findScenarioInOrg, insertScenario, listScenariosOfFloor, lockScenario, updateScenario,
} from '../repositories/scenarios.repo'
import type { ServiceContext } from './context'
import { requireVisibleFloor } from './floors.service'
import { scenarioChanged, scenarioRemoved } from './staleness.service'

type Row = NonNullable<Awaited<ReturnType<typeof findScenarioInOrg>>>

function toRecord(r: Row, last: Awaited<ReturnType<typeof latestRunsOfScenarios>>[number] | undefined): ScenarioRecord {
  return {
    id: r.id, floorId: r.floor_id, name: r.name, config: ScenarioConfigSchema.parse(r.config),
    createdAt: new Date(r.created_at).toISOString(), updatedAt: new Date(r.updated_at).toISOString(),
    lastRun: last ? { id: last.id, status: last.status, progress: last.progress, createdAt: new Date(last.created_at).toISOString() } : null,
  }
}

/** Refuses a scenario that cannot run on the floor's plan (unknown source, mixed gases, invalid plan) with 400 naming the field. */
export function checkRunnable(floor: { plan: unknown; ceiling_height_m: number }, config: ScenarioConfig) {
  const plan = Plan.safeParse(floor.plan)
  if (!plan.success) throw new AppError(400, 'plan_invalid', 'The floor plan is not valid; fix it in the editor first', { plan: 'Not valid' })
  const built = buildRunScenario(plan.data, floor.ceiling_height_m, config)
  if (!built.ok) throw new AppError(400, 'validation_failed', `Some fields are not valid: ${Object.keys(built.fields).join(', ')}`, built.fields)
  try {
    validateScenario(built.scenario)
  } catch (e) {
    if (!(e instanceof ScenarioError)) throw e
    const field = /^grid|cells|memory/i.test(e.field) || /cells|memory/i.test(e.message) ? 'cellM' : `engine.${e.field}`
    throw new AppError(400, 'validation_failed', `The engine cannot run this: ${e.message}`, { [field]: e.message })
  }
  return { plan: plan.data, built }
}

export async function listScenarios(ctx: ServiceContext, actor: Actor, floorId: number) {
  await requireVisibleFloor(ctx.db, actor, floorId)
  const rows = await listScenariosOfFloor(ctx.db, actor.orgId, floorId)
  const last = new Map((await latestRunsOfScenarios(ctx.db, rows.map((r) => r.id))).map((r) => [r.scenario_id, r]))
  return { scenarios: rows.map((r) => toRecord(r, last.get(r.id))) }
}

export async function requireScenario(ctx: ServiceContext, actor: Actor, id: number) {
  const row = await findScenarioInOrg(ctx.db, actor.orgId, id)
  if (!row) throw notFound('Scenario')
  const floor = await requireVisibleFloor(ctx.db, actor, row.floor_id).catch(() => { throw notFound('Scenario') })
  return { row, floor }
}

export async function getScenario(ctx: ServiceContext, actor: Actor, id: number) {
  const { row } = await requireScenario(ctx, actor, id)
  const last = (await latestRunsOfScenarios(ctx.db, [id]))[0]
  return toRecord(row, last)
}

async function refuseDuplicateName(ctx: ServiceContext, floorId: number, name: string, exceptId?: number) {
  const same = await findScenarioByName(ctx.db, floorId, name)
  if (same && same.id !== exceptId) throw new AppError(409, 'name_taken', 'This floor already has a scenario with this name', { name: 'Already used on this floor' })
}

export async function createScenario(ctx: ServiceContext, actor: Actor, floorId: number, config: ScenarioConfig) {
  const floor = await requireVisibleFloor(ctx.db, actor, floorId)
  checkRunnable(floor, config)
  await refuseDuplicateName(ctx, floorId, config.name)
  const row = await insertScenario(ctx.db, { orgId: actor.orgId, floorId, name: config.name, config, userId: actor.id })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'scenario.created', targetType: 'scenario', targetId: row.id })
  return toRecord(row, undefined)
}

/** Settings whose saved value differs from the one sent: says what the other save changed, in the form's terms. */
function differingSettings(saved: unknown, mine: ScenarioConfig) {
  const s = (saved ?? {}) as Record<string, unknown>
  const keys = new Set([...Object.keys(s), ...Object.keys(mine)])
  return [...keys].filter((k) => JSON.stringify(s[k]) !== JSON.stringify((mine as Record<string, unknown>)[k])).sort()
}

export async function changeScenario(ctx: ServiceContext, actor: Actor, id: number, change: ScenarioChange) {
  const { updatedAt: seen, ...config } = change
  const { floor, row: before } = await requireScenario(ctx, actor, id)
  checkRunnable(floor, config)
  await refuseDuplicateName(ctx, floor.id, config.name, id)
  const row = await ctx.db.transaction().execute(async (trx) => {
    // Optimistic check (issue 14): the row is locked, so of two racing saves from the same read one answers 409.
    const locked = await lockScenario(trx, actor.orgId, id)
    if (!locked) throw notFound('Scenario')
    if (seen !== undefined && new Date(locked.updated_at).getTime() !== Date.parse(seen)) {
      const diff = differingSettings(locked.config, config)
      throw conflict(`Someone saved this scenario in the meantime (at ${new Date(locked.updated_at).toISOString()}, you read it at ${seen})`
        + `${diff.length ? `; the saved one differs from yours in: ${diff.join(', ')}` : ''}. Reload it to see their change.`, 'stale_version')
    }
    const updated = await updateScenario(trx, actor.orgId, id, { name: config.name, config })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'scenario.changed', targetType: 'scenario', targetId: id })
    return updated
  })
  await scenarioChanged(ctx, actor, id, before.config, config)
  return toRecord(row!, (await latestRunsOfScenarios(ctx.db, [id]))[0])
}

export async function removeScenario(ctx: ServiceContext, actor: Actor, id: number) {
  const { row } = await requireScenario(ctx, actor, id)
  await scenarioRemoved(ctx, actor, id, row.name)
  await deleteScenario(ctx.db, actor.orgId, id)
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'scenario.deleted', targetType: 'scenario', targetId: id })
}
