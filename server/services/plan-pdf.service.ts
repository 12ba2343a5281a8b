import type { Content, TableCell } from 'pdfmake/interfaces'
import type { Plan } from '../../shared/floorplan/plan-schema'
import { doseLines, startName, verdictText, wayOutText } from '../../shared/egress/describe'
import { egressFigureSvg } from '../../shared/egress/figure'
import { floorPanelSvg, keyTimes, type FigureField } from '../../shared/plans/figure'
import { doorLineLabel, formatEventTime, formatFrom, formatPpm, formatSeconds, ISOLATION_NONE, summaryForStatus } from '../../shared/plans/format'
import { RULES } from '../../shared/plans/rule-list'
import { timeLeftText } from '../../shared/plans/rules'
import type { AckRecord, PlanContent, PlanLine } from '../../shared/schemas/plans'
import { STALE_KIND_LABELS, type PlanStaleness } from '../../shared/schemas/staleness'
import { RunFieldsMeta, RunSummary } from '../../shared/schemas/runs'
import { BRAND, cautionBox, renderPdf } from '../pdf/pdfmake'
import { runFronts } from '../repositories/plans.repo'
import type { ServiceContext } from './context'
import { egressOfRun } from './egress.service'

export interface PlanPdfInput {
  ctx: ServiceContext
  orgId: number
  planId: number
  floorName: string
  siteName: string
  runIds: number[]
  version: number
  status: 'draft' | 'published'
  hash: string | null
  publishedAt: string | null
  content: PlanContent
  floorPlan: Plan | null
  acks: AckRecord[]
  pending: string[]
  /** Why the plan is out of date now (shown in the header), null when up to date. */
  staleness?: PlanStaleness
}

const LEVEL_TEXT = { low: 'At the first (low) alarm', high: 'At the high alarm', none: 'No evacuation predicted' } as const
const h2 = (text: string): Content => ({ text, fontSize: 13, bold: true, color: BRAND.navy, margin: [0, 12, 0, 5] })
const small = (text: string): Content => ({ text, fontSize: 7.5, color: BRAND.muted })
const notes = (text: string): Content[] => (text.trim() ? [{ text: text.trim(), italics: true, margin: [0, 3, 0, 3] }] : [])
const table = (widths: (string | number)[], head: string[], rows: TableCell[][]): Content => ({
  table: { headerRows: 1, widths, body: [head.map((t) => ({ text: t, bold: true, fillColor: '#e8eef5' })), ...rows] },
  layout: 'lightHorizontalLines', fontSize: 8.5, margin: [0, 2, 0, 6],
})
const lines = (items: PlanLine[]): Content =>
  items.length
    ? table(['*', 120, 120], ['What', 'Who', 'From'], items.map((l) => [l.text, l.who || '–', small(formatFrom(l.from)) as TableCell]))
    : { text: 'None.', italics: true }

/** Reads stored fronts of the plan's runs; a run without them is drawn from its summary. */
async function figureInputs(ctx: ServiceContext, orgId: number, runIds: number[]) {
  const rows = await runFronts(ctx.db, orgId, runIds.slice(0, 2))
  return runIds.slice(0, 2).flatMap((id) => {
    const row = rows.find((r) => r.run_id === id)
    const summary = row ? RunSummary.safeParse(row.summary) : null
    if (!row || !summary?.success) return []
    const meta = RunFieldsMeta.safeParse(row.meta)
    let field: FigureField | null = null
    if (meta.success && row.fronts?.length) {
      const buf = row.fronts as Buffer
      const fronts = new Float32Array(buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength))
      if (fronts.length === meta.data.limits.length * meta.data.nx * meta.data.ny) field = { meta: meta.data, fronts }
    }
    return [{ runId: id, summary: summary.data, field }]
  })
}

/** The header's out-of-date notice: every reason in words, so a printed copy says it on its first page. */
function staleBox(s: NonNullable<PlanStaleness>): Content {
  return {
    table: { widths: ['*'], body: [[{
      stack: [
        { text: `OUT OF DATE since ${s.since.slice(0, 10)}: what this plan is built on has changed`, bold: true, color: '#bf360c', margin: [0, 0, 0, 3] },
        { ul: s.reasons.map((r) => ({ text: [{ text: `${STALE_KIND_LABELS[r.kind]}: `, bold: true }, r.reason] })), fontSize: 8.5 },
        { text: 'Its times, doors and drill targets may no longer match the floor; the EHS officer brings it up to date (re-run, refresh, publish).', fontSize: 8, margin: [0, 3, 0, 0] },
      ],
      fillColor: '#fff1e8', margin: [6, 5, 6, 5],
    }]] },
    layout: { hLineColor: () => '#bf360c', vLineColor: () => '#bf360c' }, margin: [0, 0, 0, 8],
  }
}

/**
 * The ways out drawn over the floor as it is now, per result (the first two, like the fronts figure), with each
 * route's verdict, way and dose in a table below: the same picture and words as the results page.
 */
async function egressFigures(p: PlanPdfInput, plan: Plan): Promise<Content[]> {
  const out: Content[] = []
  const rows = await runFronts(p.ctx.db, p.orgId, p.runIds.slice(0, 2))
  for (const id of p.runIds.slice(0, 2)) {
    const row = rows.find((r) => r.run_id === id)
    const summary = row ? RunSummary.safeParse(row.summary) : null
    if (!summary?.success) continue
    const eg = await egressOfRun(p.ctx, id, plan, summary.data)
    if (!eg) continue
    out.push({ ...(h2(`Figure: ways out, run #${id}`) as object), pageBreak: 'before' } as Content)
    out.push({ text: `${eg.startBasis}. ${eg.speedBasis}.`, fontSize: 8, margin: [0, 0, 0, 4] })
    out.push({ svg: egressFigureSvg({ plan, egress: eg, width: 500 }), width: 500, margin: [0, 0, 0, 6] } as Content)
    const unsafe = eg.routes.filter((r) => !r.safe)
    if (unsafe.length) {
      out.push({ text: `No safe route under these conditions from ${unsafe.map((r) => startName(plan, r)).join(', ')}: do not send people that way; plan earlier warning, a refuge or rescue by protected responders.`, bold: true, color: '#b03a2e', margin: [0, 0, 0, 4] })
    }
    out.push(table([95, 85, '*', 150], ['From', 'Verdict', 'Way out', 'Dose along the way'], eg.routes.map((r) => [
      startName(plan, r), { text: verdictText(r), bold: true, color: r.safe ? '#0a7d55' : '#b03a2e' } as TableCell,
      { stack: [wayOutText(plan, r), small(r.reason)] } as TableCell, { stack: doseLines(eg, r).map((d) => small(d)) } as TableCell,
    ])))
    for (const n of eg.notes) out.push(small(n))
    out.push(small(eg.caution))
  }
  return out
}

export async function renderPlanPdf(p: PlanPdfInput): Promise<Buffer> {
  const c = p.content
  const body: Content[] = []
  body.push({ text: 'Driftwarden response plan', color: BRAND.muted, fontSize: 9 })
  body.push({ text: c.title, fontSize: 18, bold: true, color: BRAND.navy, margin: [0, 2, 0, 2] })
  body.push({ text: `${p.siteName} · ${p.floorName} · version ${p.version} (${p.status === 'published' ? `published ${p.publishedAt?.slice(0, 10)}` : 'DRAFT, not published'})`, margin: [0, 0, 0, 2] })
  body.push({ text: [{ text: 'Version hash (sha256): ', bold: true }, p.hash ?? 'none yet: drafts have no hash'], fontSize: 8, margin: [0, 0, 0, 8] })
  if (p.staleness) body.push(staleBox(p.staleness))
  body.push(cautionBox(['Exposure limits are for healthy adult workers; they are not lines between safe and dangerous.']))
  if (c.summary) body.push({ text: summaryForStatus(c.summary, p.status), margin: [0, 0, 0, 6] })

  body.push(h2('1. Hazard'))
  for (const h of c.hazard.items) {
    body.push({ text: `${h.gasName} (${h.properties.join(', ')})`, bold: true, margin: [0, 2, 0, 2] })
    body.push({ text: h.release, margin: [0, 0, 0, 2] })
    body.push(table(['*', 90, 70, 70], ['Source', 'Room', 'Inventory m³', 'Released m³'],
      h.sources.map((s) => [`${s.name}${s.description ? ` – ${s.description}` : ''}`, s.roomName, s.inventoryM3 === null ? '–' : s.inventoryM3.toPrecision(3), s.releasedM3.toPrecision(3)])))
    body.push(table([140, 60, '*'], ['Limit', 'ppm', 'Source of the value'], h.limits.map((l) => [l.label, formatPpm(l.ppm), l.source])))
    body.push(small(formatFrom(h.from)))
  }
  body.push(...notes(c.hazard.notes))

  body.push(h2('2. Predicted timeline'))
  body.push({ text: `Predicted first alarm: ${formatEventTime(c.predicted.firstAlarmS, 'none')} · smallest time left for egress: ${timeLeftText(c.predicted.egressMarginS, c.predicted.firstAlarmS !== null)} · isolate within: ${formatSeconds(c.predicted.isolationByS, ISOLATION_NONE)} (after the alarm is heard)`, bold: true, margin: [0, 0, 0, 4] })
  body.push(table([60, '*', 120, 110], ['Time', 'Event', 'Where', 'From'], c.timeline.rows.map((r) => [
    r.kind === 'egress' ? `${formatSeconds(r.timeS, '–')} left` : formatEventTime(r.timeS, 'never'), r.event, r.where || '–', small(formatFrom(r.from)) as TableCell,
  ])))
  body.push(...notes(c.timeline.notes))

  // Figure
  if (p.floorPlan) {
    const figs = await figureInputs(p.ctx, p.orgId, p.runIds)
    for (const f of figs) {
      body.push({ ...(h2(`Figure: fronts and limit areas, run #${f.runId}`) as object), pageBreak: 'before' } as Content)
      for (const t of keyTimes(f.summary)) {
        body.push({ svg: floorPanelSvg({ plan: p.floorPlan, summary: f.summary, field: f.field, timeS: t.timeS, title: t.label, width: 420 }), width: 420, margin: [0, 0, 0, 6] } as Content)
      }
    }
  }

  body.push(h2('3. Evacuation'))
  body.push({ text: [{ text: 'Assembly point: ', bold: true }, c.evacuation.assemblyPoint || 'not set yet – the officer must name it before publishing'], margin: [0, 0, 0, 4] })
  body.push(table([100, 80, '*', 110], ['Room', 'Leave', 'Doors', 'Why / from'], c.evacuation.rooms.map((r) => [
    r.roomName, LEVEL_TEXT[r.alarmLevel], r.doors.length ? r.doors.map((d) => `${doorLineLabel(d)}${d.note ? ` (${d.note})` : ''}`).join('\n') : '–',
    { stack: [r.reason, ...(r.route ? [{ text: r.route, margin: [0, 2, 0, 0] }] : []), ...(r.avoid ? [{ text: r.avoid, bold: true, color: '#b03a2e', margin: [0, 2, 0, 0] }] : []), small(formatFrom(r.from))] } as TableCell,
  ])))
  body.push(...notes(c.evacuation.notes))
  if (p.floorPlan) body.push(...(await egressFigures(p, p.floorPlan)))

  body.push(h2('4. Immediate actions'))
  body.push(lines(c.actions.items))
  body.push(...notes(c.actions.notes))

  body.push(h2('5. Protective equipment and re-entry'))
  body.push({ text: 'Protective equipment', bold: true })
  body.push(lines(c.protection.ppe))
  body.push({ text: 'Re-entry criteria (all must hold)', bold: true })
  body.push(lines(c.protection.reentry))
  body.push(...notes(c.protection.notes))

  body.push(h2('6. After the incident'))
  body.push(lines(c.afterIncident.items))
  body.push(...notes(c.afterIncident.notes))

  body.push(h2('7. Roles and contacts'))
  body.push(table([150, '*', 90, 120], ['Duty', 'Person', 'Phone', 'E-mail'], c.roles.map((r) => [r.duty, r.person || 'to be assigned', r.phone || '–', r.email || '–'])))
  if (c.contacts.length) body.push(table([120, 110, 90, '*'], ['Contact', 'Organization', 'Phone', 'Note'], c.contacts.map((x) => [x.name, x.organization || '–', x.phone || '–', x.note || '–'])))

  body.push(h2('8. Drill checklist'))
  body.push(table([20, 110, '*', 60, 110], ['#', 'Who', 'What', 'Within', 'Basis'], c.checklist.map((s, i) => [
    String(i + 1), s.who, s.what, formatSeconds(s.targetS, '–'), small(s.basis) as TableCell,
  ])))
  body.push(small('"Within" counts from the alarm being heard.'))

  body.push(h2('9. Acknowledgment record'))
  if (p.status !== 'published') body.push({ text: 'Drafts cannot be acknowledged.', italics: true })
  else {
    body.push(p.acks.length
      ? table([130, 110, '*'], ['Lab manager', 'Acknowledged (UTC)', 'Comment'], p.acks.map((a) => [a.name, a.at.replace('T', ' ').slice(0, 19), a.comment || '–']))
      : { text: 'No acknowledgments yet.', italics: true })
    if (p.pending.length) body.push({ text: `Still to acknowledge: ${p.pending.join(', ')}`, margin: [0, 2, 0, 0] })
  }
  body.push(h2('How this plan was generated'))
  body.push({ ul: RULES.map((r) => ({ text: [{ text: `${r.id} ${r.title}: `, bold: true }, r.text] })), fontSize: 8 })

  return renderPdf({
    info: { title: c.title, creator: 'Driftwarden' },
    content: body,
    footerLabel: `${c.title} · v${p.version} · ${p.hash ? `sha256 ${p.hash.slice(0, 16)}…` : 'draft'}`,
  })
}
