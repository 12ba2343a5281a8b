import { sql } from 'kysely'
import type { Db } from '../db/database'

/** Sites of an organization with their floor counts; `visibleFloorIds` limits both to what a member may see. */
export const listSitesInOrg = (db: Db, orgId: number, visibleFloorIds?: number[]) => {
  let q = db
    .selectFrom('sites')
    .leftJoin('floors', (j) => {
      const on = j.onRef('floors.site_id', '=', 'sites.id')
      return visibleFloorIds ? on.on('floors.id', 'in', visibleFloorIds.length ? visibleFloorIds : [-1]) : on
    })
    .select(['sites.id', 'sites.name', 'sites.address', 'sites.created_at'])
    .select((eb) => eb.fn.count<number>('floors.id').as('floor_count'))
    .where('sites.org_id', '=', orgId)
    .groupBy('sites.id')
    .orderBy('sites.name')
  if (visibleFloorIds) q = q.having((eb) => eb.fn.count('floors.id'), '>', 0)
  return q.execute()
}

export const findSiteInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('sites').selectAll().where('id', '=', id).where('org_id', '=', orgId).executeTakeFirst()

export const findSiteByName = (db: Db, orgId: number, name: string) =>
  db.selectFrom('sites').selectAll().where('org_id', '=', orgId).where('name', '=', name).executeTakeFirst()

export const insertSite = (db: Db, s: { orgId: number; name: string; address: string }) =>
  db.insertInto('sites').values({ org_id: s.orgId, name: s.name, address: s.address }).returningAll().executeTakeFirstOrThrow()

export const updateSite = (db: Db, orgId: number, id: number, patch: { name?: string; address?: string }) =>
  db.updateTable('sites').set({ ...patch, updated_at: sql`now()` }).where('id', '=', id).where('org_id', '=', orgId)
    .returningAll().executeTakeFirst()

export const deleteSite = (db: Db, orgId: number, id: number) =>
  db.deleteFrom('sites').where('id', '=', id).where('org_id', '=', orgId).executeTakeFirst()

/** People of the organization who can be made responsible for or members of a floor. */
export const listAssignablePeople = (db: Db, orgId: number) =>
  db.selectFrom('users').select(['id', 'name', 'role']).where('org_id', '=', orgId).where('status', '!=', 'deactivated')
    .orderBy('name').execute()
