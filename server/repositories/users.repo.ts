import { sql, type Updateable } from 'kysely'
import type { Db } from '../db/database'
import type { UsersTable } from '../db/tables/foundation'

type Role = UsersTable['role']

export const findActiveUserById = (db: Db, id: number) =>
  db.selectFrom('users').selectAll().where('id', '=', id).where('status', '=', 'active').executeTakeFirst()

export const findUserByEmail = (db: Db, email: string) =>
  db.selectFrom('users').selectAll().where('email', '=', email.toLowerCase()).executeTakeFirst()

export const findUserInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('users').selectAll().where('id', '=', id).where('org_id', '=', orgId).executeTakeFirst()

export const listUsersInOrg = (db: Db, orgId: number) =>
  db.selectFrom('users').selectAll().where('org_id', '=', orgId).orderBy('name').execute()

export const insertUser = (
  db: Db,
  u: { id?: number; orgId: number; email: string; name: string; role: Role; status: UsersTable['status']; passwordHash: string | null },
) =>
  db
    .insertInto('users')
    .values({ ...(u.id === undefined ? {} : { id: u.id }), org_id: u.orgId, email: u.email.toLowerCase(), name: u.name, role: u.role, status: u.status, password_hash: u.passwordHash })
    .returningAll()
    .executeTakeFirstOrThrow()

export const updateUser = (
  db: Db,
  orgId: number,
  id: number,
  patch: Pick<Updateable<UsersTable>, 'name' | 'role' | 'status' | 'password_hash' | 'unit_system'>,
) =>
  db
    .updateTable('users')
    .set({ ...patch, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('org_id', '=', orgId)
    .returningAll()
    .executeTakeFirst()

export const countActiveAdmins = async (db: Db, orgId: number) =>
  (
    await db
      .selectFrom('users')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('org_id', '=', orgId)
      .where('role', '=', 'admin')
      .where('status', '=', 'active')
      .executeTakeFirstOrThrow()
  ).n

/** Ends every stored session of a user (password reset, deactivation). */
export const deleteSessionsOfUser = (db: Db, userId: number) =>
  sql`DELETE FROM "session" WHERE (sess->>'userId')::int = ${userId}`.execute(db)

export const findUserById = (db: Db, id: number) => db.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirstOrThrow()
