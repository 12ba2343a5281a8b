import type { Db } from '../db/database'
import type { MailDispatcher } from '../mail/dispatcher'
import { insertOutgoing, listCapturedForOrg, listOutgoing, type NewMail } from '../repositories/mail.repo'

/** Outgoing mail is written to PostgreSQL first and sent by the dispatcher, so nothing is lost if SMTP is down. */
export class MailService {
  constructor(
    private readonly db: Db,
    private readonly dispatcher: MailDispatcher | null,
    readonly fakeSmtpEnabled: boolean,
  ) {}

  async queue(db: Db, mail: NewMail) {
    const row = await insertOutgoing(db, mail)
    this.dispatcher?.kick()
    return row
  }

  /** Sends everything due now (tests and shutdown use this to avoid waiting for the timer). */
  flush() {
    return this.dispatcher?.runOnce() ?? Promise.resolve(0)
  }

  async outgoing(orgId: number) {
    return (await listOutgoing(this.db, orgId)).map((m) => ({
      id: m.id, to: m.to_address, subject: m.subject, status: m.status, attempts: m.attempts, lastError: m.last_error,
      createdAt: new Date(m.created_at).toISOString(), sentAt: m.sent_at ? new Date(m.sent_at).toISOString() : null,
    }))
  }

  async captured(orgId: number) {
    return (await listCapturedForOrg(this.db, orgId)).map((m) => ({
      id: m.id, receivedAt: new Date(m.received_at).toISOString(), from: m.envelope_from, to: m.envelope_to, subject: m.subject,
      text: m.text_body, attachments: m.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.size })),
    }))
  }
}
