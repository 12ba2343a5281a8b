import { sql } from 'kysely'
import type { Db } from '../db/database'

export const insertToken = (db: Db, t: { userId: number; purpose: 'invite' | 'reset'; nonceHash: string; expiresAt: Date }) =>
  db
    .insertInto('auth_tokens')
    .values({ user_id: t.userId, purpose: t.purpose, nonce_hash: t.nonceHash, expires_at: t.expiresAt })
    .returning('id')
    .executeTakeFirstOrThrow()

export const findToken = (db: Db, id: number) => db.selectFrom('auth_tokens').selectAll().where('id', '=', id).executeTakeFirst()

/** Marks a token used; returns undefined when someone used it first (single use even under a race). */
export const consumeToken = (db: Db, id: number) =>
  db
    .updateTable('auth_tokens')
    .set({ used_at: sql`now()` })
    .where('id', '=', id)
    .where('used_at', 'is', null)
    .where('expires_at', '>', sql<Date>`now()`)
    .returning('id')
    .executeTakeFirst()

/** A new link replaces older unused ones of the same purpose. */
export const retireTokens = (db: Db, userId: number, purpose: 'invite' | 'reset') =>
  db.updateTable('auth_tokens').set({ used_at: sql`now()` }).where('user_id', '=', userId).where('purpose', '=', purpose).where('used_at', 'is', null).execute()
