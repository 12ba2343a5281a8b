import type { Content, TableCell } from 'pdfmake/interfaces'
import { isTooLate, noticeVersion, TOO_LATE_FINDING, verdictText } from '../../shared/drills/compare'
import { formatSeconds } from '../../shared/plans/format'
import type { DrillDetail } from '../../shared/schemas/drills'
import { BRAND, cautionBox, renderPdf } from '../pdf/pdfmake'

const h2 = (text: string): Content => ({ text, fontSize: 13, bold: true, color: BRAND.navy, margin: [0, 12, 0, 5] })
const table = (widths: (string | number)[], head: string[], rows: TableCell[][]): Content => ({
  table: { headerRows: 1, widths, body: [head.map((t) => ({ text: t, bold: true, fillColor: '#e8eef5' })), ...rows] },
  layout: 'lightHorizontalLines', fontSize: 8.5, margin: [0, 2, 0, 6],
})
const stamp = (s: string | null) => (s ? s.replace('T', ' ').slice(0, 16) + ' UTC' : '–')
const MAIL = { pending: 'queued / retrying', sent: 'delivered to the mail server', bounced: 'bounced', none: 'no notice' } as const

/** The after-action report of one drill: roster, checklist against targets, measured against predicted, findings. */
export function renderDrillPdf(d: DrillDetail): Promise<Buffer> {
  const body: Content[] = [
    { text: 'Driftwarden drill report', color: BRAND.muted, fontSize: 9 },
    { text: d.title, fontSize: 18, bold: true, color: BRAND.navy, margin: [0, 2, 0, 2] },
    { text: `${d.siteName} · ${d.floorName} · ${d.localStart} · ${d.location} · status: ${d.status}`, margin: [0, 0, 0, 2] },
    { text: `Plan: ${d.planTitle}, version ${d.planVersion} (sha256 ${d.planHash}) · officer in charge: ${d.officerName}`, fontSize: 8, margin: [0, 0, 0, 8] },
    cautionBox(['Drill times are compared with screening predictions; a drill "within" a prediction does not show the real response would be fast enough.']),
    h2('Scenario'),
    { text: d.scenario },
    h2('Measured against predicted'),
    table(['*', 80, 80, 70, 120], ['Measure', 'Predicted', 'Measured', 'Difference', 'Verdict'], d.comparison.map((c) => [
      c.label, formatSeconds(c.predictedS, '–'), formatSeconds(c.measuredS, '–'), c.deltaS === null ? '–' : `${c.deltaS > 0 ? '+' : ''}${Math.round(c.deltaS)} s`, verdictText(c),
    ])),
    { text: 'Times count from the alarm being heard.', fontSize: 7.5, color: BRAND.muted },
    ...(d.comparison.some(isTooLate) ? [{ text: TOO_LATE_FINDING, bold: true, margin: [0, 4, 0, 0] } as Content] : []),
    h2('Checklist'),
    table([18, 100, '*', 55, 55, 95], ['#', 'Who', 'What', 'Target', 'Done at', 'Verdict'], d.stepComparison.map((s, i) => [
      String(i + 1), s.who, s.what, formatSeconds(s.targetS, '–'), s.done ? formatSeconds(s.atS, 'done') : 'not done', verdictText({ ...s, measure: d.checklist.find((x) => x.id === s.stepId)?.measure ?? 'none' }),
    ])),
    ...(d.record.observations ? [h2('Observations'), { text: d.record.observations } as Content] : []),
    { text: `Recorded ${stamp(d.record.recordedAt)}${d.record.recordedBy ? ` by ${d.record.recordedBy}` : ''}.`, fontSize: 8, margin: [0, 4, 0, 0] },
    h2('Findings and corrective actions'),
    d.findings.length
      ? table(['*', '*', 80, 60, 60], ['Finding', 'Corrective action', 'Owner', 'Due', 'Status'], d.findings.map((f) => [
        f.finding, f.action, f.ownerName, f.dueDate, f.status === 'closed' ? `closed ${stamp(f.closedAt).slice(0, 10)}` : f.overdue ? 'OPEN, overdue' : 'open',
      ]))
      : { text: 'None recorded.', italics: true },
    h2('Participants and notices'),
    table(['*', 130, 90, 110], ['Name', 'E-mail', 'Receipt', 'Latest notice'], d.roster.map((r) => [
      r.name, r.email, r.confirmedAt ? `confirmed ${stamp(r.confirmedAt)}` : 'not confirmed', `${MAIL[r.mail]}${r.mailAttempts > 1 ? ` (${r.mailAttempts} attempts)` : ''}`,
    ])),
    { text: `${d.confirmed} of ${d.participants} confirmed receipt. Latest notice: ${noticeVersion(d.sequence)}.`, fontSize: 8 },
  ]
  return renderPdf({ info: { title: `Drill report: ${d.title}`, creator: 'Driftwarden' }, content: body, footerLabel: `Drill report · ${d.title} · #${d.id}` })
}
