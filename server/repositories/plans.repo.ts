import { sql } from 'kysely'
import type { Db } from '../db/database'
import { NOT_A_BUNDLE_CASE } from './runs.repo'

export const insertPlan = (db: Db, p: { orgId: number; floorId: number; floorName: string; siteName: string; runIds: number[]; userId: number }) =>
  db.insertInto('plans')
    .values({ org_id: p.orgId, floor_id: p.floorId, floor_name: p.floorName, site_name: p.siteName, run_ids: p.runIds, created_by: p.userId })
    .returningAll().executeTakeFirstOrThrow()

/** The results a plan's rule-derived content now comes from (after a refresh). */
export const updatePlanRuns = (db: Db, id: number, runIds: number[]) =>
  db.updateTable('plans').set({ run_ids: runIds }).where('id', '=', id).execute()

export const findPlanInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('plans').selectAll().where('org_id', '=', orgId).where('id', '=', id).executeTakeFirst()

export const listPlansInOrg = (db: Db, orgId: number, floorIds?: number[]) => {
  let q = db.selectFrom('plans').selectAll().where('org_id', '=', orgId).orderBy('id', 'desc')
  if (floorIds) q = q.where('floor_id', 'in', floorIds.length ? floorIds : [-1])
  return q.execute()
}

export const insertVersion = (db: Db, v: { orgId: number; planId: number; version: number; content: unknown; userId: number }) =>
  db.insertInto('plan_versions')
    .values({ org_id: v.orgId, plan_id: v.planId, version: v.version, status: 'draft', content: JSON.stringify(v.content), updated_by: v.userId })
    .returningAll().executeTakeFirstOrThrow()

/** Versions of plans, newest first, with the publisher's name. */
export const listVersions = (db: Db, planIds: number[]) =>
  planIds.length
    ? db.selectFrom('plan_versions')
      .leftJoin('users', 'users.id', 'plan_versions.published_by')
      .select(['plan_versions.id', 'plan_versions.plan_id', 'plan_versions.version', 'plan_versions.status', 'plan_versions.content_hash',
        'plan_versions.published_at', 'plan_versions.ack_due_at', 'plan_versions.updated_at', 'users.name as published_by_name'])
      .where('plan_versions.plan_id', 'in', planIds)
      .orderBy('plan_versions.plan_id').orderBy('plan_versions.version', 'desc').execute()
    : Promise.resolve([])

export const findVersion = (db: Db, planId: number, version: number) =>
  db.selectFrom('plan_versions').selectAll().where('plan_id', '=', planId).where('version', '=', version).executeTakeFirst()

export const findDraft = (db: Db, planId: number) =>
  db.selectFrom('plan_versions').selectAll().where('plan_id', '=', planId).where('status', '=', 'draft').executeTakeFirst()

export const findLatestPublished = (db: Db, planId: number) =>
  db.selectFrom('plan_versions').selectAll().where('plan_id', '=', planId).where('status', '=', 'published')
    .orderBy('version', 'desc').limit(1).executeTakeFirst()

export const maxVersion = async (db: Db, planId: number) =>
  Number((await db.selectFrom('plan_versions').select((eb) => eb.fn.max('version').as('v')).where('plan_id', '=', planId).executeTakeFirst())?.v ?? 0)

/** Only a draft can be written; a published row is also frozen by a trigger. */
export const updateDraftContent = (db: Db, id: number, content: unknown, userId: number) =>
  db.updateTable('plan_versions').set({ content: JSON.stringify(content), updated_by: userId, updated_at: sql`now()` })
    .where('id', '=', id).where('status', '=', 'draft').returningAll().executeTakeFirst()

export const publishDraft = (db: Db, id: number, p: { hash: string; userId: number; ackDueDays: number }) =>
  db.updateTable('plan_versions')
    .set({ status: 'published', content_hash: p.hash, published_by: p.userId, published_at: sql`now()`, updated_at: sql`now()`,
      ack_due_at: sql`now() + make_interval(days => ${p.ackDueDays})` })
    .where('id', '=', id).where('status', '=', 'draft').returningAll().executeTakeFirst()

export const insertAck = (db: Db, a: { orgId: number; versionId: number; userId: number; name: string; comment: string; hash: string }) =>
  db.insertInto('plan_acknowledgments')
    .values({ org_id: a.orgId, plan_version_id: a.versionId, user_id: a.userId, name: a.name, comment: a.comment, content_hash: a.hash })
    .onConflict((oc) => oc.columns(['plan_version_id', 'user_id']).doNothing())
    .returningAll().executeTakeFirst()

/** Every acknowledgment of the plans' versions, with the version number. */
export const listAcks = (db: Db, planIds: number[]) =>
  planIds.length
    ? db.selectFrom('plan_acknowledgments')
      .innerJoin('plan_versions', 'plan_versions.id', 'plan_acknowledgments.plan_version_id')
      .select(['plan_acknowledgments.id', 'plan_acknowledgments.user_id', 'plan_acknowledgments.name', 'plan_acknowledgments.comment',
        'plan_acknowledgments.acknowledged_at', 'plan_acknowledgments.content_hash', 'plan_versions.version', 'plan_versions.plan_id'])
      .where('plan_versions.plan_id', 'in', planIds)
      .orderBy('plan_acknowledgments.acknowledged_at').execute()
    : Promise.resolve([])

/** Lab managers responsible for floors (active accounts only). */
export const managersOfFloors = (db: Db, floorIds: number[]) =>
  floorIds.length
    ? db.selectFrom('floor_members').innerJoin('users', 'users.id', 'floor_members.user_id')
      .select(['floor_members.floor_id', 'users.id', 'users.name', 'users.email', 'users.role'])
      .where('floor_members.floor_id', 'in', floorIds).where('floor_members.kind', '=', 'manager')
      .where('users.status', '=', 'active').where('users.role', '=', 'lab_manager')
      .orderBy('users.name').execute()
    : Promise.resolve([])

/** Succeeded runs of a floor that have a stored result, with their summaries. */
export const runsWithSummaries = (db: Db, orgId: number, floorId: number, ids?: number[]) => {
  let q = db.selectFrom('runs').innerJoin('run_results', 'run_results.run_id', 'runs.id')
    .select(['runs.id', 'runs.label', 'runs.finished_at', 'runs.floor_id', 'runs.floor_version', 'run_results.summary'])
    .where('runs.org_id', '=', orgId).where('runs.floor_id', '=', floorId).where('runs.status', '=', 'succeeded')
    .orderBy('runs.id', 'desc').limit(200)
  // Asked by id (a plan built on a bundle's conservative case) any run counts; the pick list shows nominal runs only.
  q = ids ? q.where('runs.id', 'in', ids.length ? ids : [-1]) : q.where(NOT_A_BUNDLE_CASE)
  return q.execute()
}

/** Stored fronts of runs (arrival time of each limit per cell) for the plan figure. */
export const runFronts = (db: Db, orgId: number, ids: number[]) =>
  ids.length
    ? db.selectFrom('run_results').innerJoin('runs', 'runs.id', 'run_results.run_id')
      .select(['run_results.run_id', 'run_results.fronts', 'run_results.meta', 'run_results.summary'])
      .where('runs.org_id', '=', orgId).where('runs.id', 'in', ids).execute()
    : Promise.resolve([])

/** The audit entries of one target, oldest first, with the actor's name. */
export const auditOf = (db: Db, orgId: number, targetType: string, targetId: number) =>
  db.selectFrom('audit_log').leftJoin('users', 'users.id', 'audit_log.actor_id')
    .select(['audit_log.at', 'audit_log.action', 'audit_log.detail', 'users.name as actor'])
    .where('audit_log.org_id', '=', orgId).where('audit_log.target_type', '=', targetType).where('audit_log.target_id', '=', String(targetId))
    .orderBy('audit_log.id').execute()

/** The active account that published a version (to tell them about acknowledgments), if any. */
export const publisherOfVersion = (db: Db, orgId: number, versionId: number) =>
  db.selectFrom('plan_versions').innerJoin('users', 'users.id', 'plan_versions.published_by')
    .select(['users.id', 'users.name', 'users.email'])
    .where('plan_versions.id', '=', versionId).where('plan_versions.org_id', '=', orgId).where('users.status', '=', 'active')
    .executeTakeFirst()

/** Locks the plan row so draft saves of one plan run one at a time (the version check then sees the latest save). */
export const lockPlan = (db: Db, id: number) =>
  db.selectFrom('plans').select('id').where('id', '=', id).forUpdate().executeTakeFirst()

/** Who saved a version last (for the 409 message). */
export const nameOfUser = async (db: Db, id: number | null) =>
  id === null ? null : ((await db.selectFrom('users').select('name').where('id', '=', id).executeTakeFirst())?.name ?? null)
