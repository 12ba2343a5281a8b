import type { Db } from '../db/database'

export const findOrg = (db: Db, id: number) => db.selectFrom('organizations').selectAll().where('id', '=', id).executeTakeFirst()
export const findOrgByName = (db: Db, name: string) =>
  db.selectFrom('organizations').selectAll().where('name', '=', name).executeTakeFirst()
export const insertOrg = (db: Db, name: string) =>
  db.insertInto('organizations').values({ name }).returningAll().executeTakeFirstOrThrow()
