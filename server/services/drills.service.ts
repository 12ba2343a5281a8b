import { compareMeasured, compareSteps, nextDrillDue } from '../../shared/drills/compare'
import { formatLocal, localToUtc, utcToLocal } from '../../shared/drills/time'
import type {
  DrillChange, DrillDetail, DrillOverview, DrillRecordInput, DrillSummary, Finding, NewDrill, RosterEntry,
} from '../../shared/schemas/drills'
import { ChecklistStep, PlanContent } from '../../shared/schemas/plans'
import { Measured, StepResult } from '../../shared/schemas/drills'
import { z } from 'zod'
import { AppError, conflict, notFound } from '../domain/errors'
import { canManageDrills, isOfficerRole } from '../domain/access'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import { floorIdsOfUser } from '../repositories/floors.repo'
import {
  confirmParticipant, findDrillInOrg, findFindingInOrg, floorDrillStats, insertDrill, insertFinding, insertParticipants, invitablePeople,
  latestMailOfDrill, listDrillsInOrg, listFindings, listParticipants, membersOfFloor, saveRecord, setSiteFrequency, sitesWithDrills,
  updateDrill, updateFinding, type DrillRow, drilledVersion, siteOfFloor, versionNumbersOf,
} from '../repositories/drills.repo'
import { findPlanInOrg, findVersion } from '../repositories/plans.repo'
import { findSiteInOrg } from '../repositories/sites.repo'
import type { ServiceContext } from './context'
import { renderDrillPdf } from './drill-pdf.service'
import { drillClock, inspectReceiptToken, sendDrillNotices, tickReminders } from './drill-notices.service'

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null)

const invalid = (fields: Record<string, string>) => new AppError(400, 'validation_failed', `Some fields are not valid: ${Object.keys(fields).join(', ')}`, fields)

/** Officers see every drill; lab managers those of their floors and their own; staff only the drills they take part in. */
async function visibility(ctx: ServiceContext, actor: Actor): Promise<{ floorIds?: number[]; participantUserId?: number }> {
  if (canManageDrills(actor)) return {}
  if (actor.role === 'lab_manager') return { floorIds: await floorIdsOfUser(ctx.db, actor.id) }
  return { participantUserId: actor.id }
}

async function requireDrill(ctx: ServiceContext, actor: Actor, id: number): Promise<DrillRow> {
  const drill = await findDrillInOrg(ctx.db, actor.orgId, id)
  if (!drill) throw notFound('Drill')
  if (canManageDrills(actor)) return drill
  const participants = await listParticipants(ctx.db, id)
  const mine = participants.some((p) => p.user_id === actor.id)
  if (mine) return drill
  if (actor.role === 'lab_manager' && drill.floor_id !== null && (await floorIdsOfUser(ctx.db, actor.id)).includes(drill.floor_id)) return drill
  throw notFound('Drill')
}

function summary(d: DrillRow & { participant_count?: number; confirmed_count?: number; open_findings?: number }, counts?: { participants: number; confirmed: number; open: number }): DrillSummary {
  return {
    id: d.id, title: d.title, status: d.status, startsAt: iso(d.starts_at)!, timeZone: d.time_zone, localStart: formatLocal(d.starts_at, d.time_zone),
    location: d.location, planId: d.plan_id, planVersion: 0, floorId: d.floor_id, floorName: d.floor_name, siteId: d.site_id, siteName: d.site_name,
    officerName: d.officer_name ?? '–', participants: Number(counts?.participants ?? d.participant_count ?? 0), confirmed: Number(counts?.confirmed ?? d.confirmed_count ?? 0),
    openFindings: Number(counts?.open ?? d.open_findings ?? 0),
  }
}

export async function listDrills(ctx: ServiceContext, actor: Actor): Promise<{ drills: DrillSummary[] }> {
  const v = await visibility(ctx, actor)
  let rows = await listDrillsInOrg(ctx.db, actor.orgId, v)
  if (actor.role === 'lab_manager') {
    // Their floors' drills plus any they take part in.
    const own = await listDrillsInOrg(ctx.db, actor.orgId, { participantUserId: actor.id })
    rows = [...rows, ...own.filter((o) => !rows.some((r) => r.id === o.id))].sort((a, b) => +new Date(b.starts_at) - +new Date(a.starts_at))
  }
  const versions = await versionNumbersOf(ctx.db, actor.orgId, rows.map((r) => r.plan_version_id))
  return { drills: rows.map((r) => ({ ...summary(r as never), planVersion: versions.get(r.plan_version_id) ?? 0 })) }
}

/** People an officer can invite or put in charge. */
export async function invitable(ctx: ServiceContext, actor: Actor) {
  return { people: (await invitablePeople(ctx.db, actor.orgId)).map((p) => ({ id: p.id, name: p.name, email: p.email, role: p.role })) }
}

export async function scheduleDrill(ctx: ServiceContext, actor: Actor, input: NewDrill): Promise<DrillDetail> {
  const plan = await findPlanInOrg(ctx.db, actor.orgId, input.planId)
  if (!plan) throw invalid({ planId: 'No such plan in your organization' })
  const version = await findVersion(ctx.db, plan.id, input.planVersion)
  if (!version || version.status !== 'published') throw invalid({ planVersion: 'Only a published version of the plan can be drilled' })
  const people = await invitablePeople(ctx.db, actor.orgId)
  const byId = new Map(people.map((p) => [p.id, p]))
  const fields: Record<string, string> = {}
  const officer = byId.get(input.officerId)
  if (!officer) fields.officerId = 'No such active person in your organization'
  else if (!isOfficerRole(officer.role)) fields.officerId = 'The officer in charge must be an EHS officer or administrator'
  input.participants.userIds.forEach((id, i) => { if (!byId.has(id)) fields[`participants.userIds.${i}`] = 'No such active person in your organization' })
  const startsAt = localToUtc(input.date, input.time, input.timeZone)
  if (startsAt.getTime() <= drillClock.now().getTime()) fields.date = 'The drill must be in the future'
  if (Object.keys(fields).length) throw invalid(fields)

  const invited: { userId: number | null; name: string; email: string; source: string }[] = []
  for (const id of input.participants.userIds) { const p = byId.get(id)!; invited.push({ userId: p.id, name: p.name, email: p.email, source: 'person' }) }
  if (plan.floor_id !== null) {
    if (input.participants.groups.includes('floor_staff')) for (const p of await membersOfFloor(ctx.db, plan.floor_id, 'member')) invited.push({ userId: p.id, name: p.name, email: p.email, source: 'floor_staff' })
    if (input.participants.groups.includes('floor_managers')) for (const p of await membersOfFloor(ctx.db, plan.floor_id, 'manager')) invited.push({ userId: p.id, name: p.name, email: p.email, source: 'floor_managers' })
  }
  for (const g of input.participants.guests) invited.push({ userId: people.find((p) => p.email === g.email)?.id ?? null, name: g.name, email: g.email, source: 'guest' })
  if (!invited.length) throw invalid({ participants: 'Invite at least one person or group' })

  const content = PlanContent.parse(version.content)
  const siteId = plan.floor_id !== null ? await siteOfFloor(ctx.db, actor.orgId, plan.floor_id) : null
  const id = await ctx.db.transaction().execute(async (trx) => {
    const { id } = await insertDrill(trx, {
      orgId: actor.orgId, planId: plan.id, planVersionId: version.id, floorId: plan.floor_id, siteId, floorName: plan.floor_name,
      siteName: plan.site_name, title: input.title, scenario: input.scenario, location: input.location, startsAt, timeZone: input.timeZone,
      durationMinutes: input.durationMinutes, reminderMinutes: input.reminderMinutes, officerId: input.officerId, checklist: content.checklist,
      predicted: content.predicted, userId: actor.id,
    })
    await insertParticipants(trx, id, invited)
    const sent = await sendDrillNotices(ctx, trx, actor.orgId, id, 'invitation')
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'drill.scheduled', targetType: 'drill', targetId: id,
      detail: { planId: plan.id, planVersion: version.version, startsAt: startsAt.toISOString(), invited: sent.length } })
    return id
  })
  await tickReminders(ctx).catch(() => undefined)
  return getDrill(ctx, actor, id)
}

/** Moves (or renames) a scheduled drill: the next SEQUENCE goes out, and everyone confirms again. */
export async function changeDrill(ctx: ServiceContext, actor: Actor, id: number, change: DrillChange): Promise<DrillDetail> {
  const drill = await requireDrill(ctx, actor, id)
  if (drill.status !== 'scheduled') throw conflict(`This drill is ${drill.status}; it can no longer be changed`, 'not_scheduled')
  const tz = change.timeZone ?? drill.time_zone
  const local = utcToLocal(new Date(drill.starts_at), drill.time_zone)
  const startsAt = localToUtc(change.date ?? local.date, change.time ?? local.time, tz)
  const moved = startsAt.getTime() !== new Date(drill.starts_at).getTime() || (change.location !== undefined && change.location !== drill.location)
  if (startsAt.getTime() <= drillClock.now().getTime()) throw invalid({ date: 'The drill must be in the future' })
  await ctx.db.transaction().execute(async (trx) => {
    await updateDrill(trx, id, {
      title: change.title, scenario: change.scenario, location: change.location, startsAt, timeZone: tz, durationMinutes: change.durationMinutes,
      bumpSequence: true, resetReminder: startsAt.getTime() !== new Date(drill.starts_at).getTime(),
    })
    await sendDrillNotices(ctx, trx, actor.orgId, id, 'moved', { reason: change.reason })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'drill.changed', targetType: 'drill', targetId: id,
      detail: { fields: Object.keys(change), moved, startsAt: startsAt.toISOString() } })
  })
  await tickReminders(ctx).catch(() => undefined)
  return getDrill(ctx, actor, id)
}

export async function cancelDrill(ctx: ServiceContext, actor: Actor, id: number, reason: string): Promise<DrillDetail> {
  const drill = await requireDrill(ctx, actor, id)
  if (drill.status !== 'scheduled') throw conflict(`This drill is ${drill.status}; it cannot be cancelled`, 'not_scheduled')
  await ctx.db.transaction().execute(async (trx) => {
    await updateDrill(trx, id, { status: 'cancelled', cancelReason: reason, bumpSequence: true })
    await sendDrillNotices(ctx, trx, actor.orgId, id, 'cancelled', { reason })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'drill.cancelled', targetType: 'drill', targetId: id, detail: { reason } })
  })
  return getDrill(ctx, actor, id)
}

/** Records what happened: each checklist step, the measured times, observations. */
export async function recordDrill(ctx: ServiceContext, actor: Actor, id: number, input: DrillRecordInput): Promise<DrillDetail> {
  const drill = await requireDrill(ctx, actor, id)
  if (drill.status === 'cancelled') throw conflict('A cancelled drill cannot be recorded', 'cancelled')
  if (input.completed && new Date(drill.starts_at).getTime() > drillClock.now().getTime()) throw invalid({ completed: 'The drill has not started yet' })
  const checklist = z.array(ChecklistStep).parse(drill.checklist)
  const fields: Record<string, string> = {}
  input.steps.forEach((s, i) => { if (!checklist.some((c) => c.id === s.stepId)) fields[`steps.${i}.stepId`] = 'Not a step of this drill\'s checklist' })
  if (Object.keys(fields).length) throw invalid(fields)
  await ctx.db.transaction().execute(async (trx) => {
    await saveRecord(trx, id, { steps: input.steps, measured: input.measured, observations: input.observations, completed: input.completed, userId: actor.id })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'drill.recorded', targetType: 'drill', targetId: id, detail: { measured: input.measured } })
  })
  return getDrill(ctx, actor, id)
}

export async function addFinding(ctx: ServiceContext, actor: Actor, id: number, f: { finding: string; action: string; ownerId: number; dueDate: string }): Promise<DrillDetail> {
  await requireDrill(ctx, actor, id)
  const owner = (await invitablePeople(ctx.db, actor.orgId)).find((p) => p.id === f.ownerId)
  if (!owner) throw invalid({ ownerId: 'No such active person in your organization' })
  await insertFinding(ctx.db, { orgId: actor.orgId, drillId: id, finding: f.finding, action: f.action, ownerId: owner.id, ownerName: owner.name, dueDate: f.dueDate })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'drill.finding_added', targetType: 'drill', targetId: id, detail: { owner: owner.id, dueDate: f.dueDate } })
  return getDrill(ctx, actor, id)
}

export async function changeFinding(ctx: ServiceContext, actor: Actor, findingId: number, p: { status: 'open' | 'closed'; note?: string }) {
  const f = await findFindingInOrg(ctx.db, actor.orgId, findingId)
  if (!f) throw notFound('Finding')
  await updateFinding(ctx.db, findingId, { ...p, userId: actor.id })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: p.status === 'closed' ? 'drill.finding_closed' : 'drill.finding_reopened', targetType: 'drill', targetId: f.drill_id, detail: { findingId } })
  return getDrill(ctx, actor, f.drill_id)
}

function toFinding(r: Awaited<ReturnType<typeof listFindings>>[number], today: string): Finding {
  return {
    id: r.id, drillId: r.drill_id, drillTitle: r.drill_title, finding: r.finding, action: r.action, ownerId: r.owner_id, ownerName: r.owner_name,
    dueDate: r.due, status: r.status, overdue: r.status === 'open' && r.due < today, closedAt: iso(r.closed_at), note: r.note,
  }
}

async function roster(ctx: ServiceContext, drillId: number): Promise<RosterEntry[]> {
  const [participants, mails] = await Promise.all([listParticipants(ctx.db, drillId), latestMailOfDrill(ctx.db, drillId)])
  return participants.map((p) => {
    const m = mails.find((x) => x.ref?.startsWith(`drill:${drillId}:p:${p.id}:`))
    return {
      id: p.id, userId: p.user_id, name: p.name, email: p.email, source: p.source, confirmedAt: iso(p.confirmed_at),
      mail: !m ? 'none' : m.status === 'failed' ? 'bounced' : m.status, mailAttempts: m?.attempts ?? 0, mailError: m?.last_error ?? null,
    }
  })
}

export async function getDrill(ctx: ServiceContext, actor: Actor, id: number): Promise<DrillDetail> {
  const d = await requireDrill(ctx, actor, id)
  const [people, findingRows, version, plan] = await Promise.all([
    roster(ctx, id), listFindings(ctx.db, actor.orgId, { drillId: id }),
    drilledVersion(ctx.db, actor.orgId, d.plan_version_id),
    findPlanInOrg(ctx.db, actor.orgId, d.plan_id),
  ])
  const checklist = z.array(ChecklistStep).parse(d.checklist)
  const predicted = PlanContent.shape.predicted.parse(d.predicted)
  const steps = z.array(StepResult).parse(d.step_results)
  const measured = Measured.parse(d.measured)
  const today = drillClock.now().toISOString().slice(0, 10)
  const mine = people.some((p) => p.userId === actor.id)
  const manage = canManageDrills(actor)
  return {
    ...summary(d, { participants: people.length, confirmed: people.filter((p) => p.confirmedAt).length, open: findingRows.filter((f) => f.status === 'open').length }),
    planVersion: version?.version ?? 0,
    scenario: d.scenario, durationMinutes: d.duration_minutes, reminderMinutes: d.reminder_minutes, reminderSentAt: iso(d.reminder_sent_at), sequence: d.sequence,
    officerId: d.officer_id, planTitle: (version?.content as PlanContent | undefined)?.title ?? `Plan ${plan?.id}`, planHash: version?.content_hash ?? '',
    checklist, predicted,
    // Staff see who else is invited only by name, never their addresses or delivery problems.
    roster: manage || actor.role === 'lab_manager' ? people : people.map((p) => (p.userId === actor.id ? p : { ...p, email: '', mailError: null })),
    record: { steps, measured, observations: d.observations, recordedAt: iso(d.recorded_at), recordedBy: d.recorded_by_name ?? null },
    comparison: compareMeasured(predicted, measured),
    stepComparison: compareSteps(checklist, steps),
    findings: findingRows.map((f) => toFinding(f, today)),
    canManage: manage,
    mine,
    hasStarted: new Date(d.starts_at).getTime() <= drillClock.now().getTime(),
  }
}

/** History per site and floor: the site's frequency, last drill held, next due, overdue; open corrective actions. */
export async function drillOverview(ctx: ServiceContext, actor: Actor): Promise<DrillOverview> {
  const v = await visibility(ctx, actor)
  const now = drillClock.now()
  const [sites, floors, findings] = await Promise.all([
    sitesWithDrills(ctx.db, actor.orgId), floorDrillStats(ctx.db, actor.orgId),
    listFindings(ctx.db, actor.orgId, { openOnly: true, floorIds: v.floorIds }),
  ])
  const visibleFloors = floors.filter((f) => !v.floorIds || v.floorIds.includes(f.id))
  const out = sites.map((s) => {
    const fl = visibleFloors.filter((f) => f.site_id === s.id)
    const held = fl.map((f) => f.last_held).filter((x): x is Date => !!x).map((x) => new Date(x))
    const last = held.length ? new Date(Math.max(...held.map((x) => x.getTime()))) : null
    const next = fl.map((f) => f.next_scheduled).filter((x): x is Date => !!x).map((x) => new Date(x).getTime())
    const due = nextDrillDue(last, Number(s.frequency_days), now)
    return {
      siteId: s.id, siteName: s.name, frequencyDays: Number(s.frequency_days), lastHeldAt: iso(last), nextDueAt: due.nextDueAt.toISOString(), overdue: due.overdue,
      nextScheduledAt: next.length ? new Date(Math.min(...next)).toISOString() : null,
      floors: fl.map((f) => ({ floorId: f.id, floorName: f.name, held: Number(f.held), lastHeldAt: iso(f.last_held), scheduled: Number(f.scheduled) })),
    }
  }).filter((s) => !v.floorIds || s.floors.length)
  const today = now.toISOString().slice(0, 10)
  // Staff see no site overview and only the actions they own.
  if (v.participantUserId !== undefined) return { sites: [], openFindings: findings.filter((f) => f.owner_id === actor.id).map((f) => toFinding(f, today)) }
  return { sites: out, openFindings: findings.map((f) => toFinding(f, today)) }
}

export async function setFrequency(ctx: ServiceContext, actor: Actor, siteId: number, days: number) {
  if (!(await findSiteInOrg(ctx.db, actor.orgId, siteId))) throw notFound('Site')
  await setSiteFrequency(ctx.db, actor.orgId, siteId, days)
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'site.drill_frequency', targetType: 'site', targetId: siteId, detail: { days } })
  return drillOverview(ctx, actor)
}

/** What the public confirmation page shows before the person confirms (does not use the link up). */
export async function receiptInfo(ctx: ServiceContext, token: string) {
  const { row } = await inspectReceiptToken(ctx.db, ctx.linkSecret, token)
  return { drillTitle: row.title, localStart: formatLocal(row.starts_at, row.time_zone), location: row.location, name: row.name, status: row.status, alreadyConfirmed: !!row.confirmed_at }
}

export async function confirmReceipt(ctx: ServiceContext, token: string) {
  const { row, nonceHash } = await inspectReceiptToken(ctx.db, ctx.linkSecret, token)
  const done = await confirmParticipant(ctx.db, row.id, nonceHash, drillClock.now())
  if (!done) throw new AppError(410, 'gone', 'This confirmation link has already been used.')
  await appendAudit(ctx.db, { orgId: row.org_id, actorId: null, action: 'drill.receipt_confirmed', targetType: 'drill', targetId: row.drill_id, detail: { participantId: row.id, email: row.email } })
  return { drillTitle: row.title, localStart: formatLocal(row.starts_at, row.time_zone), location: row.location, name: row.name, status: row.status, alreadyConfirmed: true }
}

export async function drillPdf(ctx: ServiceContext, actor: Actor, id: number) {
  const d = await getDrill(ctx, actor, id)
  const bytes = await renderDrillPdf(d)
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'drill.pdf_downloaded', targetType: 'drill', targetId: id })
  return { bytes, fileName: `drill-${id}-report.pdf` }
}
