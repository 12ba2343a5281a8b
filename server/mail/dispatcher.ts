import type { Transporter } from 'nodemailer'
import type { Db } from '../db/database'
import { claimDue, markFailed, markRetry, markSent } from '../repositories/mail.repo'

export interface MailDispatcher {
  /** Sends what is due now; resolves when this round is done. */
  runOnce(): Promise<number>
  /** Asks for a round soon (after a message is queued). */
  kick(): void
  stop(): Promise<void>
}

/** Permanent refusals (5xx from the server, e.g. unknown mailbox) are bounces; anything else is retried. */
function isPermanent(err: unknown): boolean {
  const code = (err as { responseCode?: number }).responseCode
  return typeof code === 'number' && code >= 500 && code < 600
}

/** Retry delay: 2, 4, 8 ... seconds, at most 5 minutes, so a stopped SMTP server is picked up soon after it returns. */
export const retryDelaySeconds = (attempts: number) => Math.min(300, 2 ** Math.max(1, attempts))

export function startMailDispatcher(db: Db, transport: Transporter, opts: { from: string; intervalMs?: number }): MailDispatcher {
  let running: Promise<number> | null = null
  let stopped = false

  async function round(): Promise<number> {
    let sent = 0
    for (;;) {
      const batch = await claimDue(db, 10)
      if (!batch.length) return sent
      for (const m of batch) {
        try {
          await transport.sendMail({
            from: opts.from,
            to: m.to_address,
            subject: m.subject,
            text: m.text_body,
            html: m.html_body,
            headers: m.org_id ? { 'X-Driftwarden-Org': String(m.org_id), 'X-Driftwarden-Kind': m.kind } : { 'X-Driftwarden-Kind': m.kind },
            ...(m.ics ? { icalEvent: { method: /METHOD:CANCEL/.test(m.ics) ? 'CANCEL' : 'REQUEST', filename: 'drill.ics', content: m.ics } } : {}),
          })
          await markSent(db, m.id)
          sent++
        } catch (err) {
          const msg = err instanceof Error ? err.message : String(err)
          if (isPermanent(err)) await markFailed(db, m.id, msg)
          else await markRetry(db, m.id, msg, retryDelaySeconds(m.attempts + 1))
        }
      }
    }
  }

  const runOnce = () => {
    if (!running) running = round().finally(() => (running = null))
    return running
  }
  const tick = () => {
    if (!stopped) runOnce().catch((e) => console.warn('[mail] dispatch round failed:', e.message))
  }
  const timer = setInterval(tick, opts.intervalMs ?? 1000)
  timer.unref()
  return {
    runOnce,
    kick: () => setTimeout(tick, 0).unref(),
    stop: async () => {
      stopped = true
      clearInterval(timer)
      await running?.catch(() => undefined)
    },
  }
}
