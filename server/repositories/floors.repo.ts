import { sql } from 'kysely'
import type { Db } from '../db/database'
import type { FloorMembersTable } from '../db/tables/floors'

const SUMMARY_COLUMNS = [
  'floors.id', 'floors.site_id', 'floors.name', 'floors.ceiling_height_m', 'floors.version', 'floors.plan_valid',
  'floors.updated_at', 'sites.name as site_name',
] as const

/** Floor summaries of an organization, optionally of one site and/or only the given floor ids. */
export const listFloors = (db: Db, orgId: number, opts: { siteId?: number; onlyIds?: number[] } = {}) => {
  let q = db
    .selectFrom('floors')
    .innerJoin('sites', 'sites.id', 'floors.site_id')
    .select(SUMMARY_COLUMNS)
    .select([
      sql<number>`jsonb_array_length(floors.plan->'rooms')`.as('room_count'),
      sql<number>`jsonb_array_length(floors.plan->'sources')`.as('source_count'),
    ])
    .where('floors.org_id', '=', orgId)
    .orderBy('sites.name').orderBy('floors.name')
  if (opts.siteId !== undefined) q = q.where('floors.site_id', '=', opts.siteId)
  if (opts.onlyIds) q = q.where('floors.id', 'in', opts.onlyIds.length ? opts.onlyIds : [-1])
  return q.execute()
}

export const findFloorInOrg = (db: Db, orgId: number, id: number) =>
  db
    .selectFrom('floors')
    .innerJoin('sites', 'sites.id', 'floors.site_id')
    .select(SUMMARY_COLUMNS)
    .select(['floors.plan', 'floors.problems', 'floors.org_id'])
    .select([
      sql<number>`jsonb_array_length(floors.plan->'rooms')`.as('room_count'),
      sql<number>`jsonb_array_length(floors.plan->'sources')`.as('source_count'),
    ])
    .where('floors.id', '=', id)
    .where('floors.org_id', '=', orgId)
    .executeTakeFirst()

export const insertFloor = (
  db: Db,
  f: { orgId: number; siteId: number; name: string; ceilingHeightM: number; plan: unknown; planValid: boolean; problems: unknown[]; userId: number | null },
) =>
  db
    .insertInto('floors')
    .values({
      org_id: f.orgId, site_id: f.siteId, name: f.name, ceiling_height_m: f.ceilingHeightM, plan: JSON.stringify(f.plan),
      plan_valid: f.planValid, problems: JSON.stringify(f.problems), updated_by: f.userId,
    })
    .returning('id')
    .executeTakeFirstOrThrow()

export const updateFloorMeta = (db: Db, orgId: number, id: number, patch: { name?: string; ceilingHeightM?: number; planValid?: boolean; problems?: unknown[] }) =>
  db
    .updateTable('floors')
    .set({
      ...(patch.name !== undefined ? { name: patch.name } : {}),
      ...(patch.ceilingHeightM !== undefined ? { ceiling_height_m: patch.ceilingHeightM } : {}),
      ...(patch.planValid !== undefined ? { plan_valid: patch.planValid } : {}),
      ...(patch.problems !== undefined ? { problems: JSON.stringify(patch.problems) } : {}),
      updated_at: sql`now()`,
    })
    .where('id', '=', id)
    .where('org_id', '=', orgId)
    .executeTakeFirst()

/**
 * Compare-and-set save of the plan: writes only when the stored version is still `expectedVersion`,
 * and bumps it. Returns the new version and time, or undefined when someone saved in between.
 */
export const savePlanIfVersion = (
  db: Db,
  orgId: number,
  id: number,
  expectedVersion: number,
  p: { plan: unknown; planValid: boolean; problems: unknown[]; userId: number },
) =>
  db
    .updateTable('floors')
    .set({
      plan: JSON.stringify(p.plan), plan_valid: p.planValid, problems: JSON.stringify(p.problems), updated_by: p.userId,
      version: sql`version + 1`, updated_at: sql`now()`,
    })
    .where('id', '=', id)
    .where('org_id', '=', orgId)
    .where('version', '=', expectedVersion)
    .returning(['version', 'updated_at'])
    .executeTakeFirst()

export const deleteFloor = (db: Db, orgId: number, id: number) =>
  db.deleteFrom('floors').where('id', '=', id).where('org_id', '=', orgId).executeTakeFirst()

export const listFloorMembers = (db: Db, floorId: number) =>
  db.selectFrom('floor_members').select(['user_id', 'kind']).where('floor_id', '=', floorId).orderBy('user_id').execute()

/** Replace the people of one kind on a floor. */
export async function replaceFloorMembers(db: Db, floorId: number, kind: FloorMembersTable['kind'], userIds: number[]) {
  await db.deleteFrom('floor_members').where('floor_id', '=', floorId).where('kind', '=', kind).execute()
  const unique = [...new Set(userIds)]
  if (unique.length) {
    await db.insertInto('floor_members').values(unique.map((user_id) => ({ floor_id: floorId, user_id, kind }))).execute()
  }
}

/** Ids of the floors a user belongs to (as responsible lab manager or assigned member). */
export const floorIdsOfUser = async (db: Db, userId: number) =>
  (await db.selectFrom('floor_members').select('floor_id').distinct().where('user_id', '=', userId).execute()).map((r) => r.floor_id)

/** Users of the organization among `ids` (to refuse assigning someone from elsewhere). */
export const usersInOrg = (db: Db, orgId: number, ids: number[]) =>
  ids.length
    ? db.selectFrom('users').select(['id', 'role']).where('org_id', '=', orgId).where('id', 'in', ids).execute()
    : Promise.resolve([])

/** Locks the floor row for a change of its own fields; answers its last-change time, to the millisecond the API shows. */
export const lockFloorMeta = (db: Db, orgId: number, id: number) =>
  db.selectFrom('floors').select(['id', 'updated_at']).where('id', '=', id).where('org_id', '=', orgId).forUpdate().executeTakeFirst()
