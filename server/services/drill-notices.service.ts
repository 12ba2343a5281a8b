import { titleWithoutDrillPrefix } from '../../shared/drills/compare'
import { createHmac } from 'node:crypto'
import { createEvent } from 'ics'
import { formatLocal } from '../../shared/drills/time'
import { SCREENING_CAUTION } from '../../shared/ui/cautions'
import type { Db } from '../db/database'
import { gone } from '../domain/errors'
import { composeMail } from '../mail/compose'
import { claimReminder, dueReminders, findDrillInOrg, findParticipant, listParticipants, setParticipantToken } from '../repositories/drills.repo'
import type { BackgroundHost, ServiceContext } from './context'
import { hashNonce, signToken, verifyTokenSignature } from './signed-links'

/**
 * Drill notices: invitations, moves, cancellations and reminders, each an e-mail through the foundation's
 * queue with an iCalendar file (stable UID per drill, SEQUENCE from the drill row), and per participant a
 * signed, single-use receipt link. The clock is injectable so tests can move time forward.
 */
export const drillClock = { now: (): Date => new Date() }

export const REMINDER_QUEUE = 'drill-reminders'
const TOKEN_PURPOSE = 'drill-receipt'

/**
 * Receipt links follow the approach of services/signed-links.ts: `<participant>.<nonce>.<purpose>.<expires>.<hmac>`.
 * The HMAC stops forgery; the stored nonce hash (rotated by each notice) and token_used_at make it single-use.
 */
export async function issueReceiptToken(db: Db, secret: string, participantId: number, expiresAt: Date, clearConfirmation: boolean, generation: number): Promise<string> {
  // Derived from the drill's notice sequence, so a reminder carries the same link as the invitation (both keep
  // working until one is used) while a move, which bumps the sequence, replaces it.
  const nonce = createHmac('sha256', secret).update(`drill-receipt-nonce.${participantId}.${generation}`).digest('base64url').slice(0, 24)
  await setParticipantToken(db, participantId, hashNonce(nonce), expiresAt, clearConfirmation)
  return signToken(secret, participantId, nonce, TOKEN_PURPOSE, expiresAt)
}

/** Checks a receipt link without using it; 410 when tampered with, replaced, used or expired. */
export async function inspectReceiptToken(db: Db, secret: string, token: string) {
  const invalid = 'This confirmation link is not valid. Use the link in the latest e-mail about the drill.'
  const { id, nonceHash } = verifyTokenSignature(secret, token, TOKEN_PURPOSE, drillClock.now(), { invalid, expired: 'This confirmation link has expired.' })
  const row = await findParticipant(db, id)
  if (!row || row.nonce_hash !== nonceHash) throw gone(invalid)
  if (row.token_used_at) throw gone('This confirmation link has already been used.')
  if (row.token_expires_at && new Date(row.token_expires_at).getTime() < drillClock.now().getTime()) throw gone('This confirmation link has expired.')
  return { row, nonceHash }
}

/** Links stay valid until a week after the drill. */
export const tokenExpiry = (startsAt: Date) => new Date(startsAt.getTime() + 7 * 86_400_000)

export type NoticeKind = 'invitation' | 'moved' | 'cancelled' | 'reminder'

type Drill = NonNullable<Awaited<ReturnType<typeof findDrillInOrg>>>

/** The iCalendar text for one recipient; throws when the ics package refuses the input. */
export function drillIcs(drill: Drill, to: { name: string; email: string }, method: 'REQUEST' | 'CANCEL', sequence: number, description: string): string {
  const s = new Date(drill.starts_at)
  const { error, value } = createEvent({
    productId: 'driftwarden/drills',
    uid: `drill-${drill.id}@driftwarden`,
    sequence,
    method,
    status: method === 'CANCEL' ? 'CANCELLED' : 'CONFIRMED',
    title: `${method === 'CANCEL' ? 'Cancelled: ' : ''}Drill: ${titleWithoutDrillPrefix(drill.title)}`,
    description,
    location: drill.location,
    start: [s.getUTCFullYear(), s.getUTCMonth() + 1, s.getUTCDate(), s.getUTCHours(), s.getUTCMinutes()],
    startInputType: 'utc',
    startOutputType: 'utc',
    duration: { minutes: drill.duration_minutes },
    organizer: { name: drill.officer_name ?? 'Driftwarden', email: drill.officer_email ?? 'no-reply@driftwarden.localhost' },
    attendees: [{ name: to.name, email: to.email, rsvp: false, role: 'REQ-PARTICIPANT', partstat: 'NEEDS-ACTION' }],
  })
  if (error || !value) throw error ?? new Error('Calendar file could not be built')
  return value
}

const SUBJECT: Record<NoticeKind, (t: string) => string> = {
  invitation: (t) => `Drill invitation: ${titleWithoutDrillPrefix(t)}`,
  moved: (t) => `Drill moved: ${titleWithoutDrillPrefix(t)}`,
  cancelled: (t) => `Drill cancelled: ${titleWithoutDrillPrefix(t)}`,
  reminder: (t) => `Reminder: drill ${titleWithoutDrillPrefix(t)}`,
}

/**
 * Queues the notice of one kind to every participant (or those in `only`), rotating receipt tokens where the
 * notice carries a link. Runs inside the caller's transaction so notices and the change commit together.
 */
export async function sendDrillNotices(ctx: ServiceContext, db: Db, orgId: number, drillId: number, kind: NoticeKind, opts: { reason?: string } = {}) {
  const drill = (await findDrillInOrg(db, orgId, drillId))!
  const participants = await listParticipants(db, drillId)
  const when = formatLocal(drill.starts_at, drill.time_zone)
  const sent: number[] = []
  for (const p of participants) {
    const needsLink = kind === 'invitation' || kind === 'moved' || (kind === 'reminder' && !p.confirmed_at)
    const token = needsLink ? await issueReceiptToken(db, ctx.linkSecret, p.id, tokenExpiry(new Date(drill.starts_at)), kind === 'moved', drill.sequence) : null
    const lead: Record<NoticeKind, string> = {
      invitation: `You are invited to the emergency drill "${drill.title}" on ${drill.floor_name} (${drill.site_name}).`,
      moved: `The drill "${drill.title}" has been moved. The new time and place are below; please confirm again.`,
      cancelled: `The drill "${drill.title}" has been cancelled.${opts.reason ? ` Reason: ${opts.reason}` : ''}`,
      reminder: `A reminder: the drill "${drill.title}" on ${drill.floor_name} is coming up.`,
    }
    const paragraphs = [
      lead[kind],
      ...(kind === 'cancelled' ? [`It was planned for ${when} at ${drill.location}.`] : [
        `When: ${when}, about ${drill.duration_minutes} minutes.`,
        `Where: ${drill.location}.`,
        `Scenario: ${drill.scenario}`,
        ...(kind === 'moved' && opts.reason ? [`Why it moved: ${opts.reason}`] : []),
        `Officer in charge: ${drill.officer_name ?? 'the EHS officer'}.`,
        'This is a drill: nothing will be released. If a real alarm sounds, follow it and evacuate.',
      ]),
      ...(token ? ['Please confirm that you received this notice with the link below (no sign-in needed; it works once).'] : []),
    ]
    const mail = composeMail({
      subject: SUBJECT[kind](drill.title),
      greeting: `Hello ${p.name},`,
      paragraphs,
      action: token ? { label: 'Confirm receipt', url: `${ctx.publicUrl()}/drills/confirm?token=${encodeURIComponent(token)}` } : undefined,
    })
    const sequence = drill.sequence
    const ics = kind === 'reminder' ? null : drillIcs(drill, p, kind === 'cancelled' ? 'CANCEL' : 'REQUEST', sequence,
      `${drill.scenario}\n\n${SCREENING_CAUTION.summary}\n${SCREENING_CAUTION.emergency}`)
    await ctx.mail.queue(db, { orgId, kind: `drill_${kind}`, ref: `drill:${drillId}:p:${p.id}:${kind}:${sequence}`, to: p.email, ...mail, ics })
    sent.push(p.id)
  }
  return sent
}

/** Sends every reminder that is due at `now` (once per drill); returns the drills reminded. */
export async function processDueReminders(ctx: ServiceContext, now: Date): Promise<number[]> {
  const done: number[] = []
  for (const d of await dueReminders(ctx.db, now)) {
    await ctx.db.transaction().execute(async (trx) => {
      if (!(await claimReminder(trx, d.id, now))) return
      await sendDrillNotices(ctx, trx, d.org_id, d.id, 'reminder')
      done.push(d.id)
    })
  }
  return done
}

/**
 * The reminder job on the shared pg-boss queue: a tick every minute (pg-boss cron) and on demand; each tick
 * sends what is due by drillClock, so a test can move the clock and send a tick.
 */
export async function startDrillReminders(rt: BackgroundHost) {
  const boss = rt.ctx.jobs.boss
  await rt.ctx.jobs.ensureQueue(REMINDER_QUEUE, { retryLimit: 3, retryDelay: 5, expireInSeconds: 120 })
  const workerId = await boss.work(REMINDER_QUEUE, { pollingIntervalSeconds: 0.5, batchSize: 1 }, async () => {
    const sent = await processDueReminders(rt.ctx, drillClock.now())
    return { reminded: sent }
  })
  await boss.schedule(REMINDER_QUEUE, '* * * * *')
  rt.onClose(async () => {
    await boss.offWork({ id: workerId })
  })
}

/** Asks the worker to look for due reminders now (after the clock moved, or a drill changed). */
export const tickReminders = (ctx: ServiceContext) => ctx.jobs.boss.send(REMINDER_QUEUE, {})
