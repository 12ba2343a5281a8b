import type { AddressInfo } from 'node:net'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import type { Db } from '../db/database'
import { insertCaptured } from '../repositories/mail.repo'

export interface FakeSmtp {
  port: number
  close(): Promise<void>
}

/**
 * A local SMTP server for demo and development: accepts mail over the protocol and stores it in PostgreSQL.
 * Recipients at the reserved .invalid domain are refused with 550, so bounce handling can be seen and tested.
 */
export async function startFakeSmtp(db: Db, port = 0): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 20 * 1024 * 1024,
    onRcptTo(address, _session, cb) {
      if (/\.invalid$/i.test(address.address)) {
        const err = new Error(`No such mailbox: ${address.address}`) as Error & { responseCode: number }
        err.responseCode = 550
        return cb(err)
      }
      cb()
    },
    onData(stream, session, cb) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks)
          const m = await simpleParser(raw)
          const orgHeader = m.headers.get('x-driftwarden-org')
          await insertCaptured(db, {
            orgId: orgHeader ? Number(orgHeader) || null : null,
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            subject: m.subject ?? '',
            text: m.text ?? '',
            html: typeof m.html === 'string' ? m.html : null,
            attachments: m.attachments.map((a) => ({
              filename: a.filename ?? '',
              contentType: a.contentType,
              size: a.size,
              content: /^text\/|calendar|ics/.test(a.contentType) && a.size < 200_000 ? a.content.toString('utf8') : undefined,
            })),
            raw: raw.toString('utf8'),
          })
          cb()
        } catch (e) {
          cb(e as Error)
        }
      })
    },
  })
  server.on('error', (e) => console.warn('[fake-smtp]', e.message))
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => resolve())
  })
  const actual = (server.server.address() as AddressInfo).port
  return { port: actual, close: () => new Promise<void>((r) => server.close(() => r())) }
}
