import { ENGINE_VERSION } from '../../shared/engine-version'
import { Plan } from '../../shared/floorplan/plan-schema'
import { findGas } from '../../shared/gases/library'
import { currentGasFingerprint, GAS_LIBRARY_VERSION } from '../../shared/gases/version'
import { compareTimesToLimits, describeFloorChanges, describeScenarioChanges, joinChanges, timeChangeText, whenBy } from '../../shared/plans/stale-changes'
import { RunSummary, ScenarioConfig } from '../../shared/schemas/runs'
import { PlanBasis, type PlanStaleness, type PlanUpdateState } from '../../shared/schemas/staleness'
import type { Db } from '../db/database'
import { notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import {
  bumpScenarioVersion, clearReasons, latestPlanUpdate, floorVersion, insertStaleReasons, openReasons, plansOfFloor, plansOfScenario, plansWithResultVersions,
  publishedBases, reasonsSettledSince, setSiteReviewInterval, resultVersions, runStartTimes, setDraftBasis, stampResultVersions,
} from '../repositories/staleness.repo'
import type { ServiceContext } from './context'

/**
 * Plans that know when they are stale (issue 17). A plan version is built on a floor version, scenarios, and
 * results computed by one engine version with one gas library; each is recorded (results when stored, plan versions
 * when published). A change to any of them marks exactly the plans built on it stale, with a reason in plain words;
 * the reason is settled when the plan's results are replaced by ones computed after the change.
 */

type Kind = 'floor' | 'scenario' | 'gas' | 'engine'

/** The runs worker records the versions a result was computed with, in the transaction that stores it. */
export const stampResult = (db: Db, runId: number, gasId: string) =>
  stampResultVersions(db, runId, { engineVersion: ENGINE_VERSION, gasLibraryVersion: GAS_LIBRARY_VERSION, gasId, gasEntryHash: currentGasFingerprint(gasId) })

/** What a plan version built on these results rests on. */
export async function planBasis(db: Db, floorId: number | null, runIds: number[]): Promise<PlanBasis> {
  const rows = await resultVersions(db, runIds)
  return {
    floorId, floorVersion: floorId === null ? null : await floorVersion(db, floorId),
    runs: rows.map((r) => ({
      runId: r.runId, scenarioId: r.scenarioId, scenarioVersion: r.scenarioVersion, floorVersion: r.floorVersion, engineVersion: r.engineVersion,
      gasLibraryVersion: r.gasLibraryVersion, gasId: r.gasId, gasEntryHash: r.gasEntryHash,
    })),
  }
}

/** Called by publishPlan just before the draft is frozen. */
export async function recordBasis(db: Db, draftId: number, floorId: number | null, runIds: number[]) {
  await setDraftBasis(db, draftId, await planBasis(db, floorId, runIds))
}

async function mark(db: Db, plans: { id: number; org_id: number }[], kind: Kind, ref: string, reason: string, userId: number | null) {
  return insertStaleReasons(db, plans.map((p) => ({ orgId: p.org_id, planId: p.id, kind, ref, reason, userId })))
}

/**
 * Hook of the floor saves (plan drawing and ceiling height): every plan of the floor becomes stale with what changed.
 * Nothing is marked when nothing the results depend on changed (the underlay image, for instance).
 */
export async function floorChanged(
  ctx: ServiceContext, actor: Actor, floorId: number,
  before: { plan: unknown; ceilingM: number }, after: { plan: unknown; ceilingM: number }, version: number,
) {
  const a = Plan.safeParse(before.plan), b = Plan.safeParse(after.plan)
  const changes = a.success && b.success
    ? describeFloorChanges({ plan: a.data, ceilingM: before.ceilingM }, { plan: b.data, ceilingM: after.ceilingM })
    : [`floor plan edited (version ${version})`]
  if (!changes.length) return []
  const plans = await plansOfFloor(ctx.db, actor.orgId, floorId)
  return mark(ctx.db, plans, 'floor', `floor:${floorId}:v${version}:${changes.join('|').slice(0, 300)}`, `${joinChanges(changes)} ${whenBy(new Date(), actor.name)}`, actor.id)
}

/** Hook of a scenario edit: numbers the edit, and marks the plans built on the scenario's results. */
export async function scenarioChanged(ctx: ServiceContext, actor: Actor, scenarioId: number, before: unknown, after: ScenarioConfig) {
  const old = ScenarioConfig.safeParse(before)
  const changes = old.success ? describeScenarioChanges(old.data, after) : ['settings edited']
  if (!changes.length) return []
  const v = await bumpScenarioVersion(ctx.db, actor.orgId, scenarioId)
  const plans = await plansOfScenario(ctx.db, actor.orgId, scenarioId)
  const name = old.success ? old.data.name : after.name
  return mark(ctx.db, plans, 'scenario', `scenario:${scenarioId}:v${v?.version ?? '?'}`, `scenario ${name}: ${joinChanges(changes)} ${whenBy(new Date(), actor.name)}`, actor.id)
}

/** Hook of a scenario delete: its results stay, but nothing can re-run them. */
export async function scenarioRemoved(ctx: ServiceContext, actor: Actor, scenarioId: number, name: string) {
  const plans = await plansOfScenario(ctx.db, actor.orgId, scenarioId)
  return mark(ctx.db, plans, 'scenario', `scenario:${scenarioId}:deleted`, `scenario ${name} deleted ${whenBy(new Date(), actor.name)}`, actor.id)
}

/** The engine version and gas library in force, or others in tests ("as if the engine had been bumped"). */
export interface CodeVersions { engineVersion: number; gasFingerprint: (gasId: string) => string | null }
const CURRENT: CodeVersions = { engineVersion: ENGINE_VERSION, gasFingerprint: currentGasFingerprint }

/**
 * Marks the plans whose results were computed by another engine version or with an earlier gas library entry
 * (run at start-up and before each weekly digest: these change with a deployment, not with a request).
 */
export async function sweepCodeVersions(db: Db, current: CodeVersions = CURRENT) {
  const rows = await plansWithResultVersions(db)
  const byPlan = new Map<number, typeof rows>()
  for (const r of rows) byPlan.set(r.planId, [...(byPlan.get(r.planId) ?? []), r])
  const marks: Parameters<typeof insertStaleReasons>[1] = []
  const list = (ids: number[]) => `${ids.length > 1 ? 'results' : 'result'} ${ids.join(', ')}`
  for (const [planId, runs] of byPlan) {
    const orgId = runs[0]!.orgId
    const oldEngine = runs.filter((r) => r.engineVersion !== current.engineVersion)
    if (oldEngine.length) {
      const was = [...new Set(oldEngine.map((r) => r.engineVersion))].join(', ')
      marks.push({ orgId, planId, kind: 'engine', ref: `engine:${current.engineVersion}`, userId: null,
        reason: `the engine is now at version ${current.engineVersion} (its outputs changed); ${list(oldEngine.map((r) => r.runId))} came from version ${was}` })
    }
    const gases = new Set(runs.map((r) => r.gasId).filter((g): g is string => !!g))
    for (const gasId of gases) {
      const now = current.gasFingerprint(gasId)
      const old = runs.filter((r) => r.gasId === gasId && r.gasEntryHash !== null && r.gasEntryHash !== now)
      if (!old.length) continue
      const name = findGas(gasId)?.name ?? gasId
      marks.push({ orgId, planId, kind: 'gas', ref: `gas:${gasId}:${now ?? 'removed'}`, userId: null,
        reason: now === null
          ? `the gas ${name} is no longer in the gas library; ${list(old.map((r) => r.runId))} used its earlier entry`
          : `the gas library entry for ${name} changed (library version ${GAS_LIBRARY_VERSION}); ${list(old.map((r) => r.runId))} used the earlier values` })
    }
  }
  return insertStaleReasons(db, marks)
}

/**
 * After the plan's results were replaced (refresh): settles each open reason the new results answer. A floor or
 * scenario change is answered when every result concerned was started after the change (a run copies the floor and
 * scenario when it is queued); an engine or gas change when every result concerned carries the current version.
 */
export async function settleReasons(db: Db, actor: Pick<Actor, 'id' | 'orgId'>, planId: number, runIds: number[], current: CodeVersions = CURRENT) {
  const [reasons, runs] = await Promise.all([openReasons(db, actor.orgId, [planId]), resultVersions(db, runIds)])
  const started = new Map((await runStartTimes(db, runIds)).map((r) => [r.id, new Date(r.created_at).getTime()]))
  const after = (ids: number[], t: Date) => ids.every((id) => (started.get(id) ?? 0) > new Date(t).getTime())
  const settled = reasons.filter((r) => {
    const [, a, b] = r.ref.split(':')
    if (r.kind === 'floor') return after(runs.map((x) => x.runId), r.created_at)
    if (r.kind === 'scenario') return after(runs.filter((x) => x.scenarioId === Number(a)).map((x) => x.runId), r.created_at)
    if (r.kind === 'engine') return runs.every((x) => x.engineVersion === current.engineVersion)
    return runs.filter((x) => x.gasId === a).every((x) => x.gasEntryHash === null || x.gasEntryHash === current.gasFingerprint(a!) || b === 'removed')
  })
  await clearReasons(db, settled.map((r) => r.id), actor.id)
  return settled.length
}

/** Open reasons per plan, for the plan page, the plans list, the overview and the PDF header. */
export async function stalenessOf(db: Db, orgId: number, planIds: number[]): Promise<Map<number, NonNullable<PlanStaleness>>> {
  const out = new Map<number, NonNullable<PlanStaleness>>()
  for (const r of await openReasons(db, orgId, planIds)) {
    const at = new Date(r.created_at).toISOString()
    const cur = out.get(r.plan_id) ?? { since: at, reasons: [] }
    cur.reasons.push({ kind: r.kind, reason: r.reason, at })
    out.set(r.plan_id, cur)
  }
  return out
}

export const stalenessOfPlan = async (db: Db, orgId: number, planId: number): Promise<PlanStaleness> =>
  (await stalenessOf(db, orgId, [planId])).get(planId) ?? null

/**
 * For the re-acknowledgment e-mail of a new version: the reasons it answers and the times to limits, previous
 * published version against this one. Empty for a first version.
 */
export async function differenceSincePublished(db: Db, orgId: number, planId: number, runIds: number[]): Promise<string[]> {
  const prev = (await publishedBases(db, planId))[0]
  if (!prev) return []
  const basis = PlanBasis.safeParse(prev.basis)
  if (!basis.success) return [`What changed since version ${prev.version}: the results behind version ${prev.version} were not recorded; compare the two versions on the plan page.`]
  const sums = async (ids: number[]) => (await resultVersions(db, ids)).flatMap((r) => {
    const s = RunSummary.safeParse(r.summary)
    return s.success ? [s.data] : []
  })
  const changes = compareTimesToLimits(await sums(basis.data.runs.map((r) => r.runId)), await sums(runIds)).map(timeChangeText)
  const settled = await reasonsSettledSince(db, orgId, planId, prev.published_at ? new Date(prev.published_at) : new Date(0))
  return [
    ...(settled.length ? [`Why there is a new version: ${settled.slice(0, 5).map((r) => r.reason).join('; ')}${settled.length > 5 ? ` (and ${settled.length - 5} more)` : ''}.`] : []),
    changes.length
      ? `Times to limits, version ${prev.version} → this version (earliest first): ${changes.slice(0, 6).join('; ')}${changes.length > 6 ? `; and ${changes.length - 6} more` : ''}.`
      : `The predicted times to limits are the same as in version ${prev.version}.`,
  ]
}

/** The latest "bring up to date" request of a plan, for its page. */
export async function planUpdateOf(db: Db, orgId: number, planId: number): Promise<PlanUpdateState> {
  const u = await latestPlanUpdate(db, orgId, planId)
  if (!u) return null
  return {
    id: u.id, status: u.status, runIds: u.run_ids, message: u.message, changes: Array.isArray(u.changes) ? u.changes : [],
    createdAt: new Date(u.created_at).toISOString(), finishedAt: u.finished_at ? new Date(u.finished_at).toISOString() : null,
  }
}

/** A site's review interval (days) for the weekly digest; another organization's site is a 404. */
export async function setReviewInterval(ctx: ServiceContext, actor: Actor, siteId: number, days: number) {
  const row = await setSiteReviewInterval(ctx.db, actor.orgId, siteId, days)
  if (!row) throw notFound('Site')
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'site.review_interval', targetType: 'site', targetId: siteId, detail: { days } })
  return { siteId, days: row.review_interval_days }
}
