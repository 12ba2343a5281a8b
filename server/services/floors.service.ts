import { checkPlan, isPlanValid, type PlanProblem } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { emptyPlan, Plan } from '../../shared/floorplan/plan-schema'
import { planToScenario } from '../../shared/floorplan/scenario-io'
import type { ScenarioInput } from '../../shared/engine/scenario-schema'
import type {
  FloorDetail, FloorInput, FloorSummary, FloorUpdate, SavePlanResult,
} from '../../shared/schemas/floors'
import type { Db } from '../db/database'
import { AppError, conflict, notFound } from '../domain/errors'
import { canManageFloors } from '../domain/access'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import { checkPlanSafely } from '../jobs/plan-checks-thread'
import { floorChanged } from './staleness.service'
import {
  deleteFloor, findFloorInOrg, floorIdsOfUser, insertFloor, listFloorMembers, listFloors, lockFloorMeta, replaceFloorMembers,
  savePlanIfVersion, updateFloorMeta, usersInOrg,
} from '../repositories/floors.repo'
import type { ServiceContext } from './context'
import { requireSite } from './sites.service'

function check(plan: Plan, ceilingM: number): { problems: PlanProblem[]; planValid: boolean } {
  const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM })
  return { problems, planValid: isPlanValid(problems) }
}

/** The same checks for plans that may be big: off the request thread (issue 14). */
async function checkLarge(plan: Plan, ceilingM: number): Promise<{ problems: PlanProblem[]; planValid: boolean }> {
  const problems = await checkPlanSafely(plan, ceilingM)
  return { problems, planValid: isPlanValid(problems) }
}

type SummaryRow = Awaited<ReturnType<typeof listFloors>>[number]

function toSummary(r: SummaryRow): FloorSummary {
  return {
    id: r.id, siteId: r.site_id, siteName: r.site_name, name: r.name, ceilingHeightM: r.ceiling_height_m, version: r.version,
    planValid: r.plan_valid, roomCount: Number(r.room_count ?? 0), sourceCount: Number(r.source_count ?? 0),
    updatedAt: new Date(r.updated_at).toISOString(),
  }
}

/** Floors the actor may see: all of the org for officers, else only those they belong to. */
export async function listVisibleFloors(ctx: ServiceContext, actor: Actor, siteId?: number): Promise<{ floors: FloorSummary[] }> {
  if (siteId !== undefined) await requireSite(ctx, actor, siteId)
  const onlyIds = canManageFloors(actor) ? undefined : await floorIdsOfUser(ctx.db, actor.id)
  return { floors: (await listFloors(ctx.db, actor.orgId, { siteId, onlyIds })).map(toSummary) }
}

/** The floor row if the actor may see it; another organization's floor, or one they do not belong to, is 404. */
export async function requireVisibleFloor(db: Db, actor: Actor, id: number) {
  const row = await findFloorInOrg(db, actor.orgId, id)
  if (!row) throw notFound('Floor')
  if (!canManageFloors(actor) && !(await floorIdsOfUser(db, actor.id)).includes(id)) throw notFound('Floor')
  return row
}

export async function getFloor(ctx: ServiceContext, actor: Actor, id: number): Promise<FloorDetail> {
  const row = await requireVisibleFloor(ctx.db, actor, id)
  const members = await listFloorMembers(ctx.db, id)
  // Plans are validated on the way in; parse again so a hand-edited row cannot crash the editor.
  const plan = Plan.safeParse(row.plan)
  return {
    ...toSummary(row),
    managerIds: members.filter((m) => m.kind === 'manager').map((m) => m.user_id),
    memberIds: members.filter((m) => m.kind === 'member').map((m) => m.user_id),
    plan: plan.success ? plan.data : emptyPlan(),
    problems: row.problems as PlanProblem[],
    canEdit: canManageFloors(actor),
  }
}

/** Refuses people of another organization, and managers who are not lab managers (or officers). */
async function checkPeople(db: Db, actor: Actor, managerIds: number[] | undefined, memberIds: number[] | undefined) {
  const all = [...(managerIds ?? []), ...(memberIds ?? [])]
  const found = new Map((await usersInOrg(db, actor.orgId, all)).map((u) => [u.id, u.role]))
  const fields: Record<string, string> = {}
  managerIds?.forEach((id, i) => {
    const role = found.get(id)
    if (!role) fields[`managerIds.${i}`] = 'No such person in your organization'
    else if (role === 'staff') fields[`managerIds.${i}`] = 'Staff cannot be responsible for a floor; choose a lab manager'
  })
  memberIds?.forEach((id, i) => {
    if (!found.has(id)) fields[`memberIds.${i}`] = 'No such person in your organization'
  })
  if (Object.keys(fields).length) throw new AppError(400, 'validation_failed', `Some fields are not valid: ${Object.keys(fields).join(', ')}`, fields)
}

export async function createFloor(ctx: ServiceContext, actor: Actor, siteId: number, input: FloorInput): Promise<FloorDetail> {
  await requireSite(ctx, actor, siteId)
  await checkPeople(ctx.db, actor, input.managerIds, input.memberIds)
  const plan = emptyPlan()
  const id = await ctx.db.transaction().execute(async (trx) => {
    const { id } = await insertFloor(trx, { orgId: actor.orgId, siteId, name: input.name, ceilingHeightM: input.ceilingHeightM, plan,
      ...check(plan, input.ceilingHeightM), userId: actor.id })
    await replaceFloorMembers(trx, id, 'manager', input.managerIds ?? [])
    await replaceFloorMembers(trx, id, 'member', input.memberIds ?? [])
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'floor.created', targetType: 'floor', targetId: id })
    return id
  })
  return getFloor(ctx, actor, id)
}

/** Name, ceiling and people; the plan has its own versioned save. A new ceiling re-runs the checks. */
export async function changeFloor(ctx: ServiceContext, actor: Actor, id: number, patch: FloorUpdate): Promise<FloorDetail> {
  const row = await requireVisibleFloor(ctx.db, actor, id)
  await checkPeople(ctx.db, actor, patch.managerIds, patch.memberIds)
  const rechecked = patch.ceilingHeightM !== undefined ? await checkLarge(Plan.parse(row.plan), patch.ceilingHeightM) : {}
  const { updatedAt: seen, ...fields } = patch
  await ctx.db.transaction().execute(async (trx) => {
    // Optimistic check on the floor's own fields: the row is locked, so of two racing changes one answers 409.
    const locked = await lockFloorMeta(trx, actor.orgId, id)
    if (seen !== undefined && locked && new Date(locked.updated_at).getTime() !== Date.parse(seen)) {
      throw conflict(`Someone changed this floor in the meantime (now ${new Date(locked.updated_at).toISOString()}, yours was ${seen}): reload it`, 'stale_version')
    }
    await updateFloorMeta(trx, actor.orgId, id, { name: patch.name, ceilingHeightM: patch.ceilingHeightM, ...rechecked })
    if (patch.managerIds) await replaceFloorMembers(trx, id, 'manager', patch.managerIds)
    if (patch.memberIds) await replaceFloorMembers(trx, id, 'member', patch.memberIds)
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'floor.changed', targetType: 'floor', targetId: id,
      detail: { fields: Object.keys(fields) } })
  })
  if (patch.ceilingHeightM !== undefined) await floorChanged(ctx, actor, id, { plan: row.plan, ceilingM: row.ceiling_height_m }, { plan: row.plan, ceilingM: patch.ceilingHeightM }, row.version)
  return getFloor(ctx, actor, id)
}

export async function removeFloor(ctx: ServiceContext, actor: Actor, id: number): Promise<void> {
  const r = await deleteFloor(ctx.db, actor.orgId, id)
  if (!r.numDeletedRows) throw notFound('Floor')
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'floor.deleted', targetType: 'floor', targetId: id })
}

/**
 * Save a plan draft with optimistic concurrency. Drafts with problems are stored (people save as they
 * draw); the answer says whether the plan is valid engine input and lists the problems.
 */
export async function savePlan(ctx: ServiceContext, actor: Actor, id: number, version: number, plan: Plan): Promise<SavePlanResult> {
  const row = await requireVisibleFloor(ctx.db, actor, id)
  const checked = await checkLarge(plan, row.ceiling_height_m)
  const saved = await savePlanIfVersion(ctx.db, actor.orgId, id, version, { plan, ...checked, userId: actor.id })
  if (!saved) {
    const current = await findFloorInOrg(ctx.db, actor.orgId, id)
    throw conflict(`Someone saved this floor in the meantime (now version ${current?.version ?? '?'}, yours was ${version})`, 'stale_version')
  }
  await floorChanged(ctx, actor, id, { plan: row.plan, ceilingM: row.ceiling_height_m }, { plan, ceilingM: row.ceiling_height_m }, saved.version)
  return { version: saved.version, updatedAt: new Date(saved.updated_at).toISOString(), ...checked }
}

/**
 * The floor as the engine's scenario file. An invalid plan is refused with 400, one field per reason
 * (keyed by the plan path), so the editor can point at each.
 */
export async function exportScenario(
  ctx: ServiceContext, actor: Actor, id: number, opts: { gasId?: string; durationS: number; cellM: number },
): Promise<ScenarioInput> {
  const row = await requireVisibleFloor(ctx.db, actor, id)
  const r = planToScenario(Plan.parse(row.plan), {
    knownGasIds: LIBRARY_GAS_IDS, ceilingM: row.ceiling_height_m, name: `${row.site_name} – ${row.name}`,
    gasId: opts.gasId, durationS: opts.durationS, cellM: opts.cellM,
  })
  if (!r.ok) {
    const fields: Record<string, string> = {}
    for (const p of r.problems) fields[p.path] = fields[p.path] ? `${fields[p.path]}; ${p.message}` : p.message
    throw new AppError(400, 'plan_invalid', `The plan cannot be used as engine input: ${r.problems.map((p) => p.message).join('; ')}`, fields)
  }
  return r.scenario
}
