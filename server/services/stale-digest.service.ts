import type { PlanContent } from '../../shared/schemas/plans'
import { STALE_KIND_LABELS } from '../../shared/schemas/staleness'
import type { Db } from '../db/database'
import { composeMail } from '../mail/compose'
import { managersOfFloors } from '../repositories/plans.repo'
import { acksOfVersions, allPlansOfOrg, mailWithRef, officersOfOrgs, publishedPlansForDigest } from '../repositories/staleness.repo'
import type { BackgroundHost, ServiceContext } from './context'
import { stalenessOf, sweepCodeVersions } from './staleness.service'

/**
 * The weekly digest to EHS officers (issue 17, item 8): plans that are out of date with what they are built on, and
 * published plans whose lab-manager acknowledgments are missing, overdue or older than the site's review interval.
 * A pg-boss schedule sends it on Monday mornings; each officer gets it once per week (the outgoing mail's ref), and
 * only when there is something to do.
 */
export const DIGEST_QUEUE = 'plan-digest'
/** Mondays 06:00 UTC. */
export const DIGEST_CRON = '0 6 * * 1'

const DAY = 86_400_000

export interface DigestPlan { id: number; title: string; where: string; lines: string[] }
export interface OrgDigest { stale: DigestPlan[]; acks: DigestPlan[] }

/** The Monday (UTC) of the week of `now`, as yyyy-mm-dd: the digest's once-a-week key. */
export function weekKey(now: Date): string {
  const d = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate()))
  d.setUTCDate(d.getUTCDate() - ((d.getUTCDay() + 6) % 7))
  return d.toISOString().slice(0, 10)
}

const days = (ms: number) => Math.floor(ms / DAY)
const date = (d: Date | string) => new Date(d).toISOString().slice(0, 10)

/** What one organization's officers are told this week. */
export async function orgDigest(db: Db, orgId: number, now: Date): Promise<OrgDigest> {
  const [all, published] = await Promise.all([allPlansOfOrg(db, orgId), publishedPlansForDigest(db, orgId)])
  const titleOf = new Map(published.map((p) => [p.id, (p.content as PlanContent | null)?.title ?? `Plan ${p.id}`]))
  const stale = await stalenessOf(db, orgId, all.map((p) => p.id))
  const out: OrgDigest = { stale: [], acks: [] }
  for (const p of all) {
    const s = stale.get(p.id)
    if (!s) continue
    out.stale.push({ id: p.id, title: titleOf.get(p.id) ?? `Plan ${p.id} (not published)`, where: `${p.site_name} · ${p.floor_name}`,
      lines: [`Out of date since ${date(s.since)}:`, ...s.reasons.map((r) => `${STALE_KIND_LABELS[r.kind]}: ${r.reason}`)] })
  }
  const managers = await managersOfFloors(db, published.flatMap((p) => (p.floor_id ? [p.floor_id] : [])))
  const acks = await acksOfVersions(db, published.map((p) => p.versionId))
  for (const p of published) {
    const interval = p.review_interval_days ?? 365
    const lines: string[] = []
    const mine = acks.filter((a) => a.plan_version_id === p.versionId)
    const missing = managers.filter((m) => m.floor_id === p.floor_id && !mine.some((a) => a.user_id === m.id))
    if (missing.length) {
      const overdue = p.ack_due_at && new Date(p.ack_due_at).getTime() < now.getTime()
      lines.push(`Version ${p.version} not yet acknowledged by ${missing.map((m) => m.name).join(', ')}${overdue ? ` (overdue since ${date(p.ack_due_at!)})` : p.ack_due_at ? ` (due ${date(p.ack_due_at)})` : ''}.`)
    }
    const old = mine.filter((a) => now.getTime() - new Date(a.acknowledged_at).getTime() > interval * DAY)
    if (old.length) {
      const names = old.map((a) => managers.find((m) => m.id === a.user_id)?.name ?? 'a former lab manager')
      const oldest = Math.min(...old.map((a) => new Date(a.acknowledged_at).getTime()))
      lines.push(`Acknowledged by ${names.join(', ')} ${days(now.getTime() - oldest)} days ago, longer than the site's review interval of ${interval} days: review the plan and publish it again (or ask for acknowledgment again).`)
    } else if (!mine.length && p.published_at && now.getTime() - new Date(p.published_at).getTime() > interval * DAY) {
      lines.push(`Published ${days(now.getTime() - new Date(p.published_at).getTime())} days ago and never acknowledged, longer than the site's review interval of ${interval} days.`)
    }
    if (lines.length) out.acks.push({ id: p.id, title: titleOf.get(p.id)!, where: `${p.site_name} · ${p.floor_name}`, lines })
  }
  return out
}

/** Queues this week's digest to every active EHS officer who has something to act on; answers how many were queued. */
export async function sendWeeklyDigest(ctx: ServiceContext, now = new Date()): Promise<number> {
  // Engine and gas library changes arrive with deployments: look again first, so the digest lists them.
  await sweepCodeVersions(ctx.db).catch((e) => console.warn('[digest] sweep', (e as Error).message))
  const week = weekKey(now)
  const byOrg = new Map<number, OrgDigest>()
  let queued = 0
  for (const o of await officersOfOrgs(ctx.db)) {
    const ref = `digest:${week}:user:${o.id}`
    if (await mailWithRef(ctx.db, ref)) continue
    if (!byOrg.has(o.org_id)) byOrg.set(o.org_id, await orgDigest(ctx.db, o.org_id, now))
    const d = byOrg.get(o.org_id)!
    if (!d.stale.length && !d.acks.length) continue
    const url = (id: number) => `${ctx.publicUrl()}/plans/${id}`
    const block = (p: DigestPlan) => `${p.title} (${p.where}): ${p.lines.join(' ')} ${url(p.id)}`
    const paragraphs = [
      `Your weekly summary of response plans for the week of ${week}.`,
      ...(d.stale.length
        ? [`${d.stale.length === 1 ? 'One plan is' : `${d.stale.length} plans are`} out of date with the floor, scenarios, gas library or engine they were built on. Until each is brought up to date (one action on its page re-runs, refreshes and publishes it), its times, doors and drill targets may not match the floor:`, ...d.stale.map(block)]
        : ['No plan is out of date with what it was built on.']),
      ...(d.acks.length
        ? [`${d.acks.length === 1 ? 'One plan needs' : `${d.acks.length} plans need`} lab-manager acknowledgments:`, ...d.acks.map(block)]
        : ['Every published plan is acknowledged within its review interval.']),
      'Plans are planning advice for drills and training, not live guidance during an incident. Their times are screening estimates: local codes, the authority having jurisdiction and licensed practice govern.',
    ]
    const mail = composeMail({
      subject: `Weekly plan digest: ${d.stale.length} out of date, ${d.acks.length} waiting for acknowledgment`,
      greeting: `Hello ${o.name},`,
      paragraphs,
      action: { label: 'Open the response plans', url: `${ctx.publicUrl()}/plans` },
    })
    await ctx.mail.queue(ctx.db, { orgId: o.org_id, kind: 'plan_digest', ref, to: o.email, ...mail })
    queued++
  }
  return queued
}

/** The weekly schedule and its worker (server process). */
export async function startWeeklyDigest(rt: BackgroundHost) {
  const boss = rt.ctx.jobs.boss
  await rt.ctx.jobs.ensureQueue(DIGEST_QUEUE, { policy: 'singleton', retryLimit: 2, retryDelay: 60, expireInSeconds: 900 })
  const workerId = await boss.work(DIGEST_QUEUE, { pollingIntervalSeconds: 2, batchSize: 1 }, async () => ({ queued: await sendWeeklyDigest(rt.ctx) }))
  await boss.schedule(DIGEST_QUEUE, DIGEST_CRON, {}, { tz: 'UTC' })
  rt.onClose(async () => { await boss.offWork({ id: workerId }) })
}
