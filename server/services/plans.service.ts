import { createHash } from 'node:crypto'
import { Plan } from '../../shared/floorplan/plan-schema'
import { hashInput } from '../../shared/plans/canonical'
import { refreshFromResults } from '../../shared/plans/refresh'
import { formatEventTime, formatSeconds, ISOLATION_NONE } from '../../shared/plans/format'
import { generatePlan, timeLeftText, type PlanRunInput } from '../../shared/plans/rules'
import { conservativeCase } from '../../shared/runs/bundle'
import { bundleMembers } from '../repositories/bundles.repo'
import { egressOfRun } from './egress.service'
import {
  type AckRecord, type NewPlan, PlanContent, type PlanDetail, type PlanListItem, type VersionSummary,
} from '../../shared/schemas/plans'
import { RunSummary } from '../../shared/schemas/runs'
import type { Db } from '../db/database'
import { AppError, conflict, forbidden, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { composeMail } from '../mail/compose'
import { appendAudit } from '../repositories/audit.repo'
import { floorIdsOfUser } from '../repositories/floors.repo'
import {
  auditOf, findDraft, findLatestPublished, findPlanInOrg, findVersion, insertAck, insertPlan, insertVersion, listAcks, listPlansInOrg,
  listVersions, lockPlan, managersOfFloors, maxVersion, nameOfUser, publishDraft, publisherOfVersion, runsWithSummaries, updateDraftContent,
  updatePlanRuns,
} from '../repositories/plans.repo'
import type { ServiceContext } from './context'
import { canEditPlans } from '../domain/access'
import { requireVisibleFloor } from './floors.service'
import { renderPlanPdf } from './plan-pdf.service'
import { differenceSincePublished, planUpdateOf, recordBasis, settleReasons, stalenessOf, stalenessOfPlan } from './staleness.service'

type PlanRow = NonNullable<Awaited<ReturnType<typeof findPlanInOrg>>>
type VersionRow = NonNullable<Awaited<ReturnType<typeof findVersion>>>

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null)
export const contentHash = (planId: number, version: number, floorId: number | null, content: unknown) =>
  createHash('sha256').update(hashInput({ planId, version, floorId, content })).digest('hex')

/** The plan if the caller may see it: officers see all of the organization, lab managers the plans of their floors. */
async function requirePlan(ctx: ServiceContext, actor: Actor, id: number): Promise<PlanRow> {
  const plan = await findPlanInOrg(ctx.db, actor.orgId, id)
  if (!plan) throw notFound('Plan')
  if (!canEditPlans(actor)) {
    if (plan.floor_id === null || !(await floorIdsOfUser(ctx.db, actor.id)).includes(plan.floor_id)) throw notFound('Plan')
    if (!(await findLatestPublished(ctx.db, id))) throw notFound('Plan')
  }
  return plan
}

function ackState(acked: boolean, dueAt: Date | string | null, now: Date): 'done' | 'pending' | 'overdue' {
  if (acked) return 'done'
  return dueAt && new Date(dueAt).getTime() < now.getTime() ? 'overdue' : 'pending'
}

/** The dashboard: every visible plan with its acknowledgment counts for the latest published version. */
export async function listPlans(ctx: ServiceContext, actor: Actor): Promise<{ plans: PlanListItem[] }> {
  const floorIds = canEditPlans(actor) ? undefined : await floorIdsOfUser(ctx.db, actor.id)
  const plans = await listPlansInOrg(ctx.db, actor.orgId, floorIds)
  const ids = plans.map((p) => p.id)
  const [versions, acks, managers] = await Promise.all([
    listVersions(ctx.db, ids), listAcks(ctx.db, ids), managersOfFloors(ctx.db, plans.flatMap((p) => (p.floor_id ? [p.floor_id] : []))),
  ])
  const now = new Date()
  const stale = await stalenessOf(ctx.db, actor.orgId, ids)
  const out: PlanListItem[] = []
  for (const p of plans) {
    const vs = versions.filter((v) => v.plan_id === p.id)
    const published = vs.find((v) => v.status === 'published')
    if (!canEditPlans(actor) && !published) continue
    const draft = vs.find((v) => v.status === 'draft')
    const shown = canEditPlans(actor) ? vs[0] : published
    const mgrs = managers.filter((m) => m.floor_id === p.floor_id)
    const counts = { done: 0, pending: 0, overdue: 0 }
    let mine: PlanListItem['mine'] = null
    if (published) {
      for (const m of mgrs) {
        const st = ackState(acks.some((a) => a.plan_id === p.id && a.version === published.version && a.user_id === m.id), published.ack_due_at, now)
        counts[st]++
        if (m.id === actor.id) mine = st
      }
    }
    const title = shown ? await versionTitle(ctx, p.id, shown.version) : p.floor_name
    out.push({
      id: p.id, title, floorId: p.floor_id, floorName: p.floor_name, siteName: p.site_name, latestVersion: vs[0]?.version ?? 0,
      latestPublished: published?.version ?? null, hasDraft: !!draft, publishedAt: iso(published?.published_at), ackDueAt: iso(published?.ack_due_at),
      acks: counts, mine, staleness: stale.get(p.id) ?? null,
    })
  }
  return { plans: out }
}

async function versionTitle(ctx: ServiceContext, planId: number, version: number) {
  const v = await findVersion(ctx.db, planId, version)
  return (v?.content as PlanContent | undefined)?.title ?? `Plan ${planId}`
}

/** Finished results of a floor a plan can be generated from. */
export async function runsOfFloor(ctx: ServiceContext, actor: Actor, floorId: number) {
  const floor = await requireVisibleFloor(ctx.db, actor, floorId)
  const rows = await runsWithSummaries(ctx.db, actor.orgId, floorId)
  return {
    runs: rows.map((r) => {
      const s = r.summary as RunSummary | null
      return {
        id: r.id, label: r.label, finishedAt: iso(r.finished_at), gasName: s?.gas?.name ?? '?',
        detectorCount: (s?.receptors ?? []).filter((x) => x.kind === 'detector').length,
        floorChanged: Number(floor.version) > Number(r.floor_version),
      }
    }),
  }
}

/**
 * A result with a finished sensitivity bundle is read at its conservative end (shared/runs/bundle.ts conservativeCase):
 * the case's own run, labelled so, with a sentence saying so; still-running cases leave the nominal, said too.
 */
async function conservativeOfRun(ctx: ServiceContext, actor: Actor, run: PlanRunInput): Promise<{ run: PlanRunInput; note: string | null }> {
  const members = await bundleMembers(ctx.db, actor.orgId, run.id)
  if (!members.length) return { run, note: null }
  if (members.some((m) => m.status === 'queued' || m.status === 'running')) {
    return { run, note: `${run.label}: its sensitivity cases are still running, so this draft uses the nominal times; refresh it from the same result when they have finished.` }
  }
  const cases = [{ key: 'nominal', label: 'nominal', runId: run.id, summary: run.summary }, ...members.flatMap((m) => {
    const s = m.status === 'succeeded' ? RunSummary.safeParse(m.summary) : null
    return s?.success ? [{ key: m.case_key, label: m.case_label, runId: m.run_id, summary: s.data }] : []
  })]
  const pick = conservativeCase(cases)!
  const intro = `Times are the conservative end of the sensitivity band of ${run.label} (${cases.length} cases; ${members.length + 1 - cases.length ? `${members.length + 1 - cases.length} failed and left out; ` : ''}the case reaching a critical level first)`
  if (pick.key === 'nominal') return { run, note: `${intro}: the nominal case itself.` }
  return {
    run: { id: pick.runId, label: `${run.label} – conservative end: ${pick.label}`, summary: pick.summary },
    note: `${intro}: ${pick.label}, run #${pick.runId}, in place of the nominal run #${run.id}.`,
  }
}

/** The chosen finished results of a floor as rule inputs, and the floor; a 400 naming each bad id. */
async function planInputs(ctx: ServiceContext, actor: Actor, floorId: number, runIds: number[]) {
  const floor = await requireVisibleFloor(ctx.db, actor, floorId)
  const ids = [...new Set(runIds)]
  const rows = await runsWithSummaries(ctx.db, actor.orgId, floorId, ids)
  const fields: Record<string, string> = {}
  const runs: PlanRunInput[] = []
  ids.forEach((id, i) => {
    const row = rows.find((r) => r.id === id)
    const parsed = row ? RunSummary.safeParse(row.summary) : null
    if (!row) fields[`runIds.${i}`] = 'No finished result with this id on this floor'
    else if (!parsed?.success) fields[`runIds.${i}`] = 'This result has no readable summary'
    else runs.push({ id, label: row.label, summary: parsed.data })
  })
  if (Object.keys(fields).length) throw new AppError(400, 'validation_failed', `Some fields are not valid: ${Object.keys(fields).join(', ')}`, fields)
  const planDoc = Plan.safeParse(floor.plan)
  if (!planDoc.success) throw new AppError(400, 'validation_failed', 'The floor plan cannot be read', { floorId: 'The floor plan is not valid' })
  // Sensitivity bundles (issue 17): a result whose cases have finished is read at its conservative end, the nominal kept beside it.
  const floorInput = { name: floor.name, siteName: floor.site_name, plan: planDoc.data }
  const nominals = [...runs]
  const bundleNotes: string[] = []
  for (const [i, run] of runs.entries()) {
    const c = await conservativeOfRun(ctx, actor, run)
    if (c.note) bundleNotes.push(c.note)
    runs[i] = c.run
  }
  // Egress routes from each run's stored fields over the floor as drawn now (the Evacuation section and drill steps use them).
  for (const run of runs) run.egress = await egressOfRun(ctx, run.id, planDoc.data, run.summary)
  if (runs.some((r, i) => r !== nominals[i])) {
    const nominal = generatePlan(floorInput, nominals).predicted
    bundleNotes.push(`Nominal beside it: first alarm ${formatEventTime(nominal.firstAlarmS, 'none')}, smallest time left for egress ${timeLeftText(nominal.egressMarginS, nominal.firstAlarmS !== null)}, isolate within ${formatSeconds(nominal.isolationByS, ISOLATION_NONE)}.`)
  }
  return { floor, ids, runs, floorInput, bundleNotes }
}

/** The conservative-end statement of the bundles (and the nominal figures beside it) follows the generated summary. */
const withBundleNotes = <T extends { summary: string }>(c: T, notes: string[]): T => (notes.length ? { ...c, summary: [c.summary, ...notes].filter(Boolean).join(' ') } : c)

/** Applies the rules of shared/plans/rules.ts to the chosen results and stores the draft of version 1. */
export async function createPlan(ctx: ServiceContext, actor: Actor, input: NewPlan): Promise<PlanDetail> {
  const { floor, ids, runs, floorInput, bundleNotes } = await planInputs(ctx, actor, input.floorId, input.runIds)
  const content = PlanContent.parse(withBundleNotes(generatePlan(floorInput, runs, input.title), bundleNotes))

  const id = await ctx.db.transaction().execute(async (trx) => {
    const plan = await insertPlan(trx, { orgId: actor.orgId, floorId: floor.id, floorName: floor.name, siteName: floor.site_name, runIds: ids, userId: actor.id })
    await insertVersion(trx, { orgId: actor.orgId, planId: plan.id, version: 1, content, userId: actor.id })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'plan.generated', targetType: 'plan', targetId: plan.id, detail: { runIds: ids, floorId: floor.id } })
    return plan.id
  })
  return getPlan(ctx, actor, id)
}

function versionSummary(v: Awaited<ReturnType<typeof listVersions>>[number]): VersionSummary {
  return { version: v.version, status: v.status, contentHash: v.content_hash, publishedAt: iso(v.published_at), publishedBy: v.published_by_name ?? null,
    ackDueAt: iso(v.ack_due_at), updatedAt: iso(v.updated_at)! }
}

function ackRecord(a: Awaited<ReturnType<typeof listAcks>>[number]): AckRecord {
  return { id: a.id, userId: a.user_id, name: a.name, at: iso(a.acknowledged_at)!, comment: a.comment, version: a.version }
}

export async function getPlan(ctx: ServiceContext, actor: Actor, id: number): Promise<PlanDetail> {
  const plan = await requirePlan(ctx, actor, id)
  const editor = canEditPlans(actor)
  const [versions, acks, managers] = await Promise.all([
    listVersions(ctx.db, [id]), listAcks(ctx.db, [id]), managersOfFloors(ctx.db, plan.floor_id ? [plan.floor_id] : []),
  ])
  const visible = editor ? versions : versions.filter((v) => v.status === 'published')
  const published = visible.find((v) => v.status === 'published')
  const shown = editor ? visible[0]! : published!
  const row = (await findVersion(ctx.db, id, shown.version))!
  const now = new Date()
  const mgrStates = managers.map((m) => {
    const ack = published ? acks.find((a) => a.version === published.version && a.user_id === m.id) : undefined
    return { userId: m.id, name: m.name, email: m.email, state: ackState(!!ack, published?.ack_due_at ?? null, now), ack: ack ? ackRecord(ack) : null }
  })
  const me = mgrStates.find((m) => m.userId === actor.id)
  return {
    id: plan.id, floorId: plan.floor_id, floorName: plan.floor_name, siteName: plan.site_name, runIds: plan.run_ids, createdAt: iso(plan.created_at)!,
    versions: visible.map(versionSummary),
    current: { version: row.version, status: row.status, contentHash: row.content_hash, content: PlanContent.parse(row.content) },
    latestPublished: published?.version ?? null,
    managers: published ? mgrStates : mgrStates.map((m) => ({ ...m, state: 'pending' as const })),
    acknowledgments: acks.map(ackRecord),
    canEdit: editor,
    canAcknowledge: actor.role === 'lab_manager' && !!published && !!me && me.state !== 'done',
    staleness: await stalenessOfPlan(ctx.db, actor.orgId, id),
    update: editor ? await planUpdateOf(ctx.db, actor.orgId, id) : null,
  }
}

/** One version's frozen (or draft) content; lab managers only see published versions. */
export async function getVersion(ctx: ServiceContext, actor: Actor, id: number, version: number) {
  await requirePlan(ctx, actor, id)
  const v = await findVersion(ctx.db, id, version)
  if (!v || (!canEditPlans(actor) && v.status !== 'published')) throw notFound('Plan version')
  return { version: v.version, status: v.status, contentHash: v.content_hash, content: PlanContent.parse(v.content) }
}

/** Writes `content` into the open draft, or, when the latest version is published, into a new draft of the next version. */
async function writeDraft(db: Db, actor: Actor, planId: number, draft: VersionRow | undefined, content: PlanContent): Promise<number> {
  if (draft) {
    await updateDraftContent(db, draft.id, content, actor.id)
    return draft.version
  }
  const version = (await maxVersion(db, planId)) + 1
  await insertVersion(db, { orgId: actor.orgId, planId, version, content, userId: actor.id })
  return version
}

/**
 * Rebuilds the rule-derived content from (newer) results of the plan's floor, keeping what officers wrote
 * (shared/plans/refresh.ts), into the draft: the open draft, or the draft of the next version after a publish.
 */
export async function refreshPlan(ctx: ServiceContext, actor: Actor, id: number, runIds: number[]): Promise<PlanDetail> {
  const plan = await requirePlan(ctx, actor, id)
  if (plan.floor_id === null) throw conflict('The floor of this plan was deleted: it can no longer be refreshed from results', 'floor_deleted')
  const { ids, runs, floorInput, bundleNotes } = await planInputs(ctx, actor, plan.floor_id, runIds)
  const fresh = PlanContent.parse(withBundleNotes(generatePlan(floorInput, runs), bundleNotes))
  await ctx.db.transaction().execute(async (trx) => {
    const draft = await findDraft(trx, id)
    const base = draft ?? (await findLatestPublished(trx, id))!
    const { content, rebuilt, kept } = refreshFromResults(PlanContent.parse(base.content), fresh)
    const version = await writeDraft(trx, actor, id, draft, content)
    await updatePlanRuns(trx, id, ids)
    await settleReasons(trx, actor, id, ids)
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'plan.refreshed', targetType: 'plan', targetId: id, detail: { version, runIds: ids, rebuilt, kept } })
  })
  return getPlan(ctx, actor, id)
}

/** 409 stale_version when the version an edit started from (the open draft, else the latest published) changed since `seen`. */
async function refuseStale(db: Db, planId: number, draft: VersionRow | undefined, seen: string) {
  const base = draft ?? (await findLatestPublished(db, planId))
  if (!base || new Date(base.updated_at).getTime() === Date.parse(seen)) return
  const who = await nameOfUser(db, base.status === 'published' ? base.published_by : base.updated_by)
  const what = base.status === 'published' ? `published version ${base.version}` : `saved the draft of version ${base.version}`
  throw conflict(`${who ?? 'Someone'} ${what} in the meantime (at ${new Date(base.updated_at).toISOString()}, you read it at ${seen}). `
    + 'Reload the plan to see their change.', 'stale_version')
}

/** Edits the draft; when the latest version is published, the edit becomes the draft of the next version. */
export async function saveDraft(ctx: ServiceContext, actor: Actor, id: number, content: PlanContent, seen?: string): Promise<PlanDetail> {
  await requirePlan(ctx, actor, id)
  await ctx.db.transaction().execute(async (trx) => {
    // Saves of one plan run one at a time; with the updatedAt the edit started from, a save, refresh or publish
    // since then answers 409 stale_version instead of being overwritten (issue 14).
    await lockPlan(trx, id)
    const draft = await findDraft(trx, id)
    if (seen !== undefined) await refuseStale(trx, id, draft, seen)
    const version = await writeDraft(trx, actor, id, draft, content)
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'plan.draft_saved', targetType: 'plan', targetId: id, detail: { version } })
  })
  return getPlan(ctx, actor, id)
}

/** Freezes the draft with its content hash and asks each lab manager of the floor to acknowledge it, by e-mail. */
export async function publishPlan(ctx: ServiceContext, actor: Actor, id: number, ackDueDays: number): Promise<PlanDetail> {
  const plan = await requirePlan(ctx, actor, id)
  await ctx.db.transaction().execute(async (trx) => {
    const draft = await findDraft(trx, id)
    if (!draft) throw conflict('There is no draft to publish: edit the plan first', 'no_draft')
    const content = PlanContent.parse(draft.content)
    const hash = contentHash(id, draft.version, plan.floor_id, content)
    await recordBasis(trx, draft.id, plan.floor_id, plan.run_ids)
    const difference = await differenceSincePublished(trx, actor.orgId, id, plan.run_ids)
    const published = await publishDraft(trx, draft.id, { hash, userId: actor.id, ackDueDays })
    if (!published) throw conflict('Someone published this draft in the meantime', 'stale_version')
    const managers = await managersOfFloors(trx, plan.floor_id ? [plan.floor_id] : [])
    for (const m of managers) {
      const url = `${ctx.publicUrl()}/plans/${id}`
      const mail = composeMail({
        subject: `Please acknowledge: ${content.title} (version ${draft.version})`,
        greeting: `Hello ${m.name},`,
        paragraphs: [
          `${actor.name} published version ${draft.version} of the response plan "${content.title}" for ${plan.site_name}, ${plan.floor_name}. As a lab manager of this floor, please read it and acknowledge it by ${new Date(published.ack_due_at!).toISOString().slice(0, 10)}.`,
          ...difference,
          `Version fingerprint (sha256): ${hash}`,
          'The plan is a screening-based planning aid. It does not replace the site emergency action plan, local codes or the authority having jurisdiction.',
        ],
        action: { label: 'Open the plan', url },
      })
      await ctx.mail.queue(trx, { orgId: actor.orgId, kind: 'plan_ack_request', ref: `plan:${id}:v${draft.version}:user:${m.id}`, to: m.email, ...mail })
    }
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'plan.published', targetType: 'plan', targetId: id,
      detail: { version: draft.version, hash, notified: managers.map((m) => m.id), ackDueDays } })
  })
  return getPlan(ctx, actor, id)
}

/** A lab manager of the floor acknowledges the latest published version; once, for good. */
export async function acknowledgePlan(ctx: ServiceContext, actor: Actor, id: number, version: number, comment: string): Promise<AckRecord> {
  const plan = await requirePlan(ctx, actor, id)
  const managers = await managersOfFloors(ctx.db, plan.floor_id ? [plan.floor_id] : [])
  if (!managers.some((m) => m.id === actor.id)) throw forbidden('Only the lab managers responsible for this floor can acknowledge its plan')
  const v: VersionRow | undefined = await findVersion(ctx.db, id, version)
  if (!v || v.status !== 'published') throw notFound('Published plan version')
  const latest = await findLatestPublished(ctx.db, id)
  if (latest && latest.version !== version) throw conflict(`Version ${version} has been replaced by version ${latest.version}; acknowledge the current version`, 'stale_version')
  const ack = await ctx.db.transaction().execute(async (trx) => {
    const row = await insertAck(trx, { orgId: actor.orgId, versionId: v.id, userId: actor.id, name: actor.name, comment, hash: v.content_hash! })
    if (!row) throw conflict('You have already acknowledged this version', 'already_acknowledged')
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'plan.acknowledged', targetType: 'plan', targetId: id,
      detail: { version, hash: v.content_hash, comment } })
    // Tell the officer who published this version; same transaction, so no mail without the acknowledgment.
    const publisher = await publisherOfVersion(trx, actor.orgId, v.id)
    if (publisher && publisher.id !== actor.id) {
      const content = PlanContent.parse(v.content)
      const all = await listAcks(trx, [id])
      const done = new Set(all.filter((a) => a.version === version).map((a) => a.user_id))
      const waiting = managers.filter((m) => !done.has(m.id)).map((m) => m.name)
      const mail = composeMail({
        subject: `Acknowledged: ${content.title} (version ${version}) by ${actor.name}`,
        greeting: `Hello ${publisher.name},`,
        paragraphs: [
          `${actor.name} acknowledged version ${version} of the response plan "${content.title}" for ${plan.site_name}, ${plan.floor_name}.`,
          comment.trim() ? `Their comment: ${comment.trim()}` : 'They left no comment.',
          waiting.length
            ? `Still to acknowledge (${waiting.length} of ${managers.length}): ${waiting.join(', ')}.`
            : `Every lab manager of the floor (${managers.length}) has now acknowledged this version.`,
        ],
        action: { label: 'Open the plan', url: `${ctx.publicUrl()}/plans/${id}` },
      })
      await ctx.mail.queue(trx, { orgId: actor.orgId, kind: 'plan_acknowledged', ref: `plan:${id}:v${version}:ack:${actor.id}`, to: publisher.email, ...mail })
    }
    return row
  })
  return { id: ack.id, userId: ack.user_id, name: ack.name, at: iso(ack.acknowledged_at)!, comment: ack.comment, version }
}

export async function planAudit(ctx: ServiceContext, actor: Actor, id: number) {
  await requirePlan(ctx, actor, id)
  const rows = await auditOf(ctx.db, actor.orgId, 'plan', id)
  return { entries: rows.map((r) => ({ at: iso(r.at)!, actor: r.actor ?? null, action: r.action, detail: r.detail })) }
}

/** The PDF of one version: content, figure, timeline, checklist, acknowledgment record, hash, cautions. */
export async function planPdf(ctx: ServiceContext, actor: Actor, id: number, version: number): Promise<{ bytes: Buffer; fileName: string }> {
  const plan = await requirePlan(ctx, actor, id)
  const v = await findVersion(ctx.db, id, version)
  if (!v || (!canEditPlans(actor) && v.status !== 'published')) throw notFound('Plan version')
  const content = PlanContent.parse(v.content)
  const [acks, managers] = await Promise.all([listAcks(ctx.db, [id]), managersOfFloors(ctx.db, plan.floor_id ? [plan.floor_id] : [])])
  const floor = plan.floor_id ? await requireVisibleFloor(ctx.db, { ...actor, role: 'admin' }, plan.floor_id).catch(() => null) : null
  const floorPlan = floor ? Plan.safeParse(floor.plan) : null
  const bytes = await renderPlanPdf({
    ctx, orgId: actor.orgId, planId: id, floorName: plan.floor_name, siteName: plan.site_name, runIds: plan.run_ids,
    version: v.version, status: v.status, hash: v.content_hash, publishedAt: iso(v.published_at), content,
    floorPlan: floorPlan?.success ? floorPlan.data : null,
    acks: acks.filter((a) => a.version === v.version).map(ackRecord),
    pending: managers.filter((m) => !acks.some((a) => a.version === v.version && a.user_id === m.id)).map((m) => m.name),
    staleness: await stalenessOfPlan(ctx.db, actor.orgId, id),
  })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'plan.pdf_downloaded', targetType: 'plan', targetId: id, detail: { version } })
  return { bytes, fileName: `plan-${id}-v${v.version}.pdf` }
}
