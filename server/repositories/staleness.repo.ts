import { sql } from 'kysely'
import type { Db } from '../db/database'

/** Records what a stored result was computed with (called by the runs worker in the storing transaction). */
export const stampResultVersions = (db: Db, runId: number, v: { engineVersion: number; gasLibraryVersion: number; gasId: string; gasEntryHash: string | null }) =>
  db.updateTable('run_results')
    .set({
      engine_version: v.engineVersion, gas_library_version: v.gasLibraryVersion, gas_id: v.gasId, gas_entry_hash: v.gasEntryHash,
      scenario_version: sql`(select s.version from runs r join scenarios s on s.id = r.scenario_id where r.id = ${runId})`,
    })
    .where('run_id', '=', runId).execute()

/** The recorded versions of results, with the run's floor version and scenario. */
export const resultVersions = (db: Db, runIds: number[]) =>
  runIds.length
    ? db.selectFrom('runs').innerJoin('run_results', 'run_results.run_id', 'runs.id')
      .select(['runs.id as runId', 'runs.scenario_id as scenarioId', 'runs.floor_version as floorVersion', 'run_results.scenario_version as scenarioVersion',
        'run_results.engine_version as engineVersion', 'run_results.gas_library_version as gasLibraryVersion', 'run_results.gas_id as gasId',
        'run_results.gas_entry_hash as gasEntryHash', 'run_results.summary'])
      .where('runs.id', 'in', runIds).orderBy('runs.id').execute()
    : Promise.resolve([])

/** Writes the basis into a draft (a published row is frozen by a trigger, so this runs just before publishing). */
export const setDraftBasis = (db: Db, versionId: number, basis: unknown) =>
  db.updateTable('plan_versions').set({ basis: JSON.stringify(basis) }).where('id', '=', versionId).where('status', '=', 'draft').execute()

export const publishedBases = (db: Db, planId: number) =>
  db.selectFrom('plan_versions').select(['version', 'basis', 'published_at']).where('plan_id', '=', planId).where('status', '=', 'published')
    .orderBy('version', 'desc').execute()

/** Plans of a floor (any state: a draft built on the floor is stale too). */
export const plansOfFloor = (db: Db, orgId: number, floorId: number) =>
  db.selectFrom('plans').select(['id', 'org_id']).where('org_id', '=', orgId).where('floor_id', '=', floorId).execute()

/** Plans whose results include a run of the scenario. */
export const plansOfScenario = (db: Db, orgId: number, scenarioId: number) =>
  db.selectFrom('plans').select(['plans.id', 'plans.org_id']).where('plans.org_id', '=', orgId)
    .where(sql<boolean>`exists (select 1 from runs r where r.id = any(plans.run_ids) and r.scenario_id = ${scenarioId})`).execute()

/** Every plan with the recorded versions of each of its results (for the engine and gas library sweep). */
export const plansWithResultVersions = (db: Db) =>
  db.selectFrom('plans')
    .innerJoin('runs', (j) => j.on(sql<boolean>`runs.id = any(plans.run_ids)`))
    .innerJoin('run_results', 'run_results.run_id', 'runs.id')
    .select(['plans.id as planId', 'plans.org_id as orgId', 'runs.id as runId', 'run_results.engine_version as engineVersion',
      'run_results.gas_id as gasId', 'run_results.gas_entry_hash as gasEntryHash', 'run_results.gas_library_version as gasLibraryVersion'])
    .orderBy('plans.id').orderBy('runs.id').execute()

export const bumpScenarioVersion = (db: Db, orgId: number, id: number) =>
  db.updateTable('scenarios').set({ version: sql`version + 1` }).where('id', '=', id).where('org_id', '=', orgId)
    .returning(['version']).executeTakeFirst()

export const scenarioVersions = (db: Db, ids: number[]) =>
  ids.length ? db.selectFrom('scenarios').select(['id', 'version']).where('id', 'in', ids).execute() : Promise.resolve([])

/** One open reason per plan and change: a second mark of the same change does nothing. */
export const insertStaleReasons = (db: Db, rows: { orgId: number; planId: number; kind: 'floor' | 'scenario' | 'gas' | 'engine'; ref: string; reason: string; userId: number | null }[]) =>
  rows.length
    ? db.insertInto('plan_stale_reasons')
      .values(rows.map((r) => ({ org_id: r.orgId, plan_id: r.planId, kind: r.kind, ref: r.ref, reason: r.reason, changed_by: r.userId })))
      .onConflict((oc) => oc.columns(['plan_id', 'ref']).where('cleared_at', 'is', null).doNothing())
      .returning(['plan_id', 'ref']).execute()
    : Promise.resolve([])

export const openReasons = (db: Db, orgId: number, planIds: number[]) =>
  planIds.length
    ? db.selectFrom('plan_stale_reasons').select(['id', 'plan_id', 'kind', 'ref', 'reason', 'created_at'])
      .where('org_id', '=', orgId).where('plan_id', 'in', planIds).where('cleared_at', 'is', null)
      .orderBy('plan_id').orderBy('created_at').orderBy('id').execute()
    : Promise.resolve([])

export const clearReasons = (db: Db, ids: number[], userId: number | null) =>
  ids.length
    ? db.updateTable('plan_stale_reasons').set({ cleared_at: sql`now()`, cleared_by: userId }).where('id', 'in', ids).where('cleared_at', 'is', null).execute()
    : Promise.resolve([])

/** Current floor versions (to tell whether a result was computed on the floor as drawn now). */
export const floorVersion = async (db: Db, floorId: number) =>
  (await db.selectFrom('floors').select(['version']).where('id', '=', floorId).executeTakeFirst())?.version ?? null

export const userName = async (db: Db, id: number | null) =>
  id === null ? null : ((await db.selectFrom('users').select('name').where('id', '=', id).executeTakeFirst())?.name ?? null)

// --- bring up to date -------------------------------------------------------------------------------------------

export const insertPlanUpdate = (db: Db, u: { orgId: number; planId: number; userId: number; oldRunIds: number[]; runIds: number[]; publish: boolean; ackDueDays: number }) =>
  db.insertInto('plan_updates')
    .values({ org_id: u.orgId, plan_id: u.planId, requested_by: u.userId, old_run_ids: u.oldRunIds, run_ids: u.runIds, publish: u.publish, ack_due_days: u.ackDueDays })
    .onConflict((oc) => oc.column('plan_id').where('status', '=', 'waiting').doNothing())
    .returningAll().executeTakeFirst()

export const latestPlanUpdate = (db: Db, orgId: number, planId: number) =>
  db.selectFrom('plan_updates').selectAll().where('org_id', '=', orgId).where('plan_id', '=', planId).orderBy('id', 'desc').limit(1).executeTakeFirst()

export const waitingPlanUpdates = (db: Db) =>
  db.selectFrom('plan_updates').selectAll().where('status', '=', 'waiting').orderBy('id').execute()

/** Ends a waiting update once (compare-and-set on the status, so two workers cannot both finish it). */
export const finishPlanUpdate = (db: Db, id: number, status: 'refreshed' | 'published' | 'failed', message: string | null, changes: string[]) =>
  db.updateTable('plan_updates').set({ status, message, changes: JSON.stringify(changes), finished_at: sql`now()` })
    .where('id', '=', id).where('status', '=', 'waiting').returning(['id']).executeTakeFirst()

/** The update if it is still waiting (the queue's singleton policy lets one tick at a time get here). */
export const findWaitingUpdate = (db: Db, id: number) =>
  db.selectFrom('plan_updates').selectAll().where('id', '=', id).where('status', '=', 'waiting').executeTakeFirst()

export const setSiteReviewInterval = (db: Db, orgId: number, siteId: number, days: number) =>
  db.updateTable('sites').set({ review_interval_days: days }).where('id', '=', siteId).where('org_id', '=', orgId)
    .returning(['id', 'review_interval_days']).executeTakeFirst()

export const runStates = (db: Db, ids: number[]) =>
  ids.length ? db.selectFrom('runs').select(['id', 'status', 'message', 'label']).where('id', 'in', ids).execute() : Promise.resolve([])

export const findUserActor = (db: Db, id: number) =>
  db.selectFrom('users').select(['id', 'org_id', 'name', 'email', 'role', 'status']).where('id', '=', id).executeTakeFirst()

// --- weekly digest ----------------------------------------------------------------------------------------------

export const officersOfOrgs = (db: Db) =>
  db.selectFrom('users').select(['id', 'org_id', 'name', 'email']).where('role', '=', 'ehs_officer').where('status', '=', 'active').orderBy('org_id').orderBy('name').execute()

/** Each plan's latest published version with its site's review interval. */
export const publishedPlansForDigest = (db: Db, orgId: number) =>
  db.selectFrom('plans')
    .innerJoin('plan_versions as v', (j) => j.onRef('v.plan_id', '=', 'plans.id').on('v.status', '=', 'published')
      .on(sql<boolean>`v.version = (select max(version) from plan_versions w where w.plan_id = plans.id and w.status = 'published')`))
    .leftJoin('floors', 'floors.id', 'plans.floor_id')
    .leftJoin('sites', 'sites.id', 'floors.site_id')
    .select(['plans.id', 'plans.floor_id', 'plans.floor_name', 'plans.site_name', 'v.id as versionId', 'v.version', 'v.content', 'v.published_at',
      'v.ack_due_at', 'sites.review_interval_days'])
    .where('plans.org_id', '=', orgId).orderBy('plans.id').execute()

export const allPlansOfOrg = (db: Db, orgId: number) =>
  db.selectFrom('plans').select(['id', 'floor_name', 'site_name']).where('org_id', '=', orgId).orderBy('id').execute()

export const acksOfVersions = (db: Db, versionIds: number[]) =>
  versionIds.length
    ? db.selectFrom('plan_acknowledgments').select(['plan_version_id', 'user_id', 'acknowledged_at']).where('plan_version_id', 'in', versionIds).execute()
    : Promise.resolve([])

export const mailWithRef = async (db: Db, ref: string) =>
  !!(await db.selectFrom('outgoing_mail').select('id').where('ref', '=', ref).limit(1).executeTakeFirst())

export const runStartTimes = (db: Db, ids: number[]) =>
  ids.length ? db.selectFrom('runs').select(['id', 'created_at']).where('id', 'in', ids).execute() : Promise.resolve([])

/** Reasons of a plan settled after a moment (the previous publish): what a new version answers. */
export const reasonsSettledSince = (db: Db, orgId: number, planId: number, since: Date) =>
  db.selectFrom('plan_stale_reasons').select(['reason']).where('org_id', '=', orgId).where('plan_id', '=', planId)
    .where('cleared_at', 'is not', null).where('cleared_at', '>', since).orderBy('id').execute()
