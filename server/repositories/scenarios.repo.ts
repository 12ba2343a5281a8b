import { sql } from 'kysely'
import type { Db } from '../db/database'

export const listScenariosOfFloor = (db: Db, orgId: number, floorId: number) =>
  db.selectFrom('scenarios').selectAll().where('org_id', '=', orgId).where('floor_id', '=', floorId).orderBy('name').execute()

export const findScenarioInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('scenarios').selectAll().where('org_id', '=', orgId).where('id', '=', id).executeTakeFirst()

export const findScenarioByName = (db: Db, floorId: number, name: string) =>
  db.selectFrom('scenarios').selectAll().where('floor_id', '=', floorId).where('name', '=', name).executeTakeFirst()

export const insertScenario = (db: Db, s: { orgId: number; floorId: number; name: string; config: unknown; userId: number | null }) =>
  db.insertInto('scenarios')
    .values({ org_id: s.orgId, floor_id: s.floorId, name: s.name, config: JSON.stringify(s.config), created_by: s.userId })
    .returningAll().executeTakeFirstOrThrow()

export const updateScenario = (db: Db, orgId: number, id: number, s: { name: string; config: unknown }) =>
  db.updateTable('scenarios').set({ name: s.name, config: JSON.stringify(s.config), updated_at: sql`now()` })
    .where('org_id', '=', orgId).where('id', '=', id).returningAll().executeTakeFirst()

export const deleteScenario = (db: Db, orgId: number, id: number) =>
  db.deleteFrom('scenarios').where('org_id', '=', orgId).where('id', '=', id).executeTakeFirst()

/** Locks the scenario row for a change; answers who saved it last and when (to the millisecond the API shows). */
export const lockScenario = (db: Db, orgId: number, id: number) =>
  db.selectFrom('scenarios').select(['id', 'name', 'config', 'updated_at']).where('org_id', '=', orgId).where('id', '=', id).forUpdate().executeTakeFirst()
