import { sql, type Updateable } from 'kysely'
import type { Db } from '../db/database'
import type { InvitationsTable } from '../db/tables/invitations'

export const findInvitationInOrg = (db: Db, orgId: number, email: string) =>
  db.selectFrom('invitations').selectAll().where('org_id', '=', orgId).where('email', '=', email.toLowerCase()).executeTakeFirst()

export const findInvitationById = (db: Db, id: number) => db.selectFrom('invitations').selectAll().where('id', '=', id).executeTakeFirst()

export const findOpenInvitation = (db: Db, orgId: number, id: number) =>
  db.selectFrom('invitations').selectAll().where('id', '=', id).where('org_id', '=', orgId).where('status', '<>', 'accepted').executeTakeFirst()

/** Invitations not yet accepted (pending or revoked): they appear in the organization's list of people. */
export const listOpenInvitations = (db: Db, orgId: number) =>
  db.selectFrom('invitations').selectAll().where('org_id', '=', orgId).where('status', '<>', 'accepted').execute()

export const insertInvitation = (
  db: Db,
  i: { orgId: number; email: string; name: string; role: InvitationsTable['role']; nonceHash: string | null; expiresAt: Date; invitedBy: number },
) =>
  db
    .insertInto('invitations')
    .values({ org_id: i.orgId, email: i.email.toLowerCase(), name: i.name, role: i.role, nonce_hash: i.nonceHash, expires_at: i.expiresAt, invited_by: i.invitedBy })
    .returningAll()
    .executeTakeFirstOrThrow()

export const updateInvitation = (db: Db, orgId: number, id: number, patch: Pick<Updateable<InvitationsTable>, 'name' | 'role' | 'status'>) =>
  db.updateTable('invitations').set({ ...patch, updated_at: sql`now()` }).where('id', '=', id).where('org_id', '=', orgId)
    .returningAll().executeTakeFirst()

/** Uses up a pending invitation's link once (a racing second use gets nothing back). */
export const consumeInvitation = (db: Db, id: number) =>
  db.updateTable('invitations').set({ used_at: sql`now()`, status: 'accepted', updated_at: sql`now()` })
    .where('id', '=', id).where('status', '=', 'pending').where('used_at', 'is', null).where('expires_at', '>', sql<Date>`now()`)
    .returningAll().executeTakeFirst()
