/** Wall-clock time in an IANA time zone ↔ UTC instants, with the platform's Intl data only (pure). */

/** Offset of `tz` from UTC at instant `ms`, in milliseconds (e.g. +3 600 000 for Europe/Berlin in winter). */
export function zoneOffsetMs(ms: number, tz: string): number {
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone: tz, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit',
  }).formatToParts(new Date(ms))
  const get = (t: string) => Number(parts.find((p) => p.type === t)!.value)
  const asUtc = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second'))
  return asUtc - Math.floor(ms / 1000) * 1000
}

/** "2026-12-14" + "09:30" in "Europe/Berlin" → the UTC instant. Times skipped by a DST change move forward. */
export function localToUtc(date: string, time: string, tz: string): Date {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const [hh, mm] = time.split(':').map(Number) as [number, number]
  const naive = Date.UTC(y, m - 1, d, hh, mm)
  let utc = naive - zoneOffsetMs(naive, tz)
  const second = naive - zoneOffsetMs(utc, tz)
  if (second !== utc) utc = second
  return new Date(utc)
}

/** The UTC instant as date and time on the wall clock of `tz`. */
export function utcToLocal(at: Date, tz: string): { date: string; time: string } {
  const ms = at.getTime() + zoneOffsetMs(at.getTime(), tz)
  const iso = new Date(ms).toISOString()
  return { date: iso.slice(0, 10), time: iso.slice(11, 16) }
}

/** "Mon, 14 Dec 2026, 09:30 (Europe/Berlin)" for notices. */
export function formatLocal(at: Date | string, tz: string): string {
  const text = new Intl.DateTimeFormat('en-GB', { timeZone: tz, weekday: 'short', day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
    .format(new Date(at))
  return `${text} (${tz})`
}
