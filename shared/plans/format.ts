/** Display helpers for plan times and figures; pure, shared by pages, PDFs and e-mails. */

/** 0 → "0 s", 75 → "1 min 15 s", 3600 → "60 min"; null → the `never` text. */
export function formatSeconds(s: number | null | undefined, never = 'not within the run'): string {
  if (s === null || s === undefined || !Number.isFinite(s)) return never
  const r = Math.round(s)
  if (r < 60) return `${r} s`
  const m = Math.floor(r / 60)
  const sec = r % 60
  return sec ? `${m} min ${sec} s` : `${m} min`
}

/** ppm with sensible precision: 0.0006 → "0.0006", 12.5 → "12.5", 66986 → "66,986". */
export function formatPpm(ppm: number): string {
  if (!Number.isFinite(ppm)) return '–'
  if (ppm >= 1000) return Math.round(ppm).toLocaleString('en-US')
  if (ppm >= 10) return String(Math.round(ppm * 10) / 10)
  return String(Number(ppm.toPrecision(2)))
}

/** "run 12 · Write-up desk" style reference for a rule-derived line. */
export function formatFrom(from: { runId: number; runLabel: string; subjectName: string | null; rule: string } | null): string {
  if (!from) return 'Entered by the officer'
  return `${from.rule} · run #${from.runId} (${from.runLabel})${from.subjectName ? ` · ${from.subjectName}` : ''}`
}

/**
 * A time measured from the start of the release. The solver interpolates first crossings inside its steps, so a
 * cell next to a strong source can cross a limit a fraction of a second after the release starts; "0 s" would read
 * like "before the release", so times under half a second say so in words.
 */
export function formatEventTime(s: number | null | undefined, never = 'not within the run'): string {
  if (s === null || s === undefined || !Number.isFinite(s)) return never
  return s < 0.5 ? 'within the first second (< 1 s)' : formatSeconds(s)
}

/** A door's name, or where it leads when it has none ("Door to Process lab"). */
export function doorLabel(name: string, leadsToName: string | null): string {
  return name.trim() || (leadsToName ? `Door to ${leadsToName}` : 'Door to outside')
}

/** The sentence drafts carry; a published plan does not show it. */
export const REVIEW_HINT = 'Review every section before publishing.'
/** A plan summary as shown for a version: the draft's review reminder is dropped once published. */
export function summaryForStatus(summary: string, status: 'draft' | 'published'): string {
  return status === 'draft' ? summary : summary.replace(REVIEW_HINT, '').trim()
}

/** The predicted isolation figure in words. */
export const ISOLATION_NONE = 'no limit reached at a workstation'
/** "at 1 min 5 s", or "within the first second (< 1 s)" for an event right at the start of the release. */
export const atEventTime = (s: number) => (s < 0.5 ? formatEventTime(s) : `at ${formatSeconds(s)}`)
/** A stored door line's label; plans generated before names fell back read the room from the note. */
export const doorLineLabel = (d: { name: string; note: string }) => doorLabel(d.name, d.note.match(/^Leads into (.+?)(?:, also affected|$)/)?.[1] ?? null)

/** A result to choose in "Generate a plan": its label (or that it has none), gas and detector count, so similar runs can be told apart. */
export function runChoiceText(r: { id: number; label: string; gasName: string; detectorCount?: number }): string {
  const det = r.detectorCount === undefined ? '' : `, ${r.detectorCount === 0 ? 'no detectors' : `${r.detectorCount} detector${r.detectorCount === 1 ? '' : 's'}`}`
  return `#${r.id} ${r.label.trim() || '(no label)'} – ${r.gasName}${det}`
}
