import { randomBytes } from 'node:crypto'
import type { Db } from '../db/database'

/** Returns a named secret, creating a random one the first time, so restarts keep sessions and links valid. */
export async function getOrCreateSecret(db: Db, name: string): Promise<string> {
  await db
    .insertInto('app_secrets')
    .values({ name, value: randomBytes(32).toString('base64url') })
    .onConflict((oc) => oc.column('name').doNothing())
    .execute()
  return (await db.selectFrom('app_secrets').select('value').where('name', '=', name).executeTakeFirstOrThrow()).value
}
