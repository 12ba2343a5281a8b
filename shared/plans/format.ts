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
