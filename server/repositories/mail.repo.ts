import { sql } from 'kysely'
import type { Db } from '../db/database'
import type { CapturedAttachment } from '../db/tables/foundation'

export interface NewMail {
  orgId: number | null
  kind: string
  ref?: string | null
  to: string
  subject: string
  text: string
  html: string
  ics?: string | null
}

export const insertOutgoing = (db: Db, m: NewMail) =>
  db
    .insertInto('outgoing_mail')
    .values({
      org_id: m.orgId, kind: m.kind, ref: m.ref ?? null, to_address: m.to, subject: m.subject,
      text_body: m.text, html_body: m.html, ics: m.ics ?? null, status: 'pending',
    })
    .returningAll()
    .executeTakeFirstOrThrow()

/** Claims due messages; SKIP LOCKED lets several server processes dispatch without sending twice. */
export const claimDue = (db: Db, limit: number) =>
  db.transaction().execute(async (trx) => {
    const rows = await trx
      .selectFrom('outgoing_mail')
      .selectAll()
      .where('status', '=', 'pending')
      .where('next_attempt_at', '<=', sql<Date>`now()`)
      .orderBy('id')
      .limit(limit)
      .forUpdate()
      .skipLocked()
      .execute()
    if (rows.length) {
      // Push the retry time out while we work, so a crash mid-send only delays the message.
      await trx
        .updateTable('outgoing_mail')
        .set({ next_attempt_at: sql`now() + interval '2 minutes'`, attempts: sql`attempts + 1` })
        .where('id', 'in', rows.map((r) => r.id))
        .execute()
    }
    return rows
  })

export const markSent = (db: Db, id: number) =>
  db.updateTable('outgoing_mail').set({ status: 'sent', sent_at: sql`now()`, last_error: null }).where('id', '=', id).execute()

export const markRetry = (db: Db, id: number, error: string, delaySeconds: number) =>
  db
    .updateTable('outgoing_mail')
    .set({ last_error: error, next_attempt_at: sql`now() + make_interval(secs => ${delaySeconds})` })
    .where('id', '=', id)
    .execute()

export const markFailed = (db: Db, id: number, error: string) =>
  db.updateTable('outgoing_mail').set({ status: 'failed', last_error: error }).where('id', '=', id).execute()

export const listOutgoing = (db: Db, orgId: number, limit = 200) =>
  db.selectFrom('outgoing_mail').selectAll().where('org_id', '=', orgId).orderBy('id', 'desc').limit(limit).execute()

export const findOutgoingByRef = (db: Db, ref: string) =>
  db.selectFrom('outgoing_mail').selectAll().where('ref', '=', ref).orderBy('id').execute()

export const insertCaptured = (
  db: Db,
  m: { orgId: number | null; from: string; to: string[]; subject: string; text: string; html: string | null; attachments: CapturedAttachment[]; raw: string },
) =>
  db
    .insertInto('captured_mail')
    .values({
      org_id: m.orgId, envelope_from: m.from, envelope_to: m.to, subject: m.subject, text_body: m.text,
      html_body: m.html, attachments: JSON.stringify(m.attachments), raw: m.raw,
    })
    .execute()

/** Captured mail addressed to anyone in the organization, or tagged with it. */
export const listCapturedForOrg = (db: Db, orgId: number, limit = 200) =>
  db
    .selectFrom('captured_mail')
    .selectAll()
    .where((eb) =>
      eb.or([
        eb('org_id', '=', orgId),
        eb(sql<boolean>`envelope_to && (select coalesce(array_agg(email), '{}') from users where org_id = ${orgId})`, '=', true),
      ]),
    )
    .orderBy('id', 'desc')
    .limit(limit)
    .execute()

/** Captured mail to one address, newest first. */
export const listCapturedTo = (db: Db, address: string) =>
  db.selectFrom('captured_mail').selectAll().where(sql<boolean>`${address.toLowerCase()} = any(envelope_to)`).orderBy('id', 'desc').execute()
