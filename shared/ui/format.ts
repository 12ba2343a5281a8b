/** Date and time in the reader's locale, e.g. "3 Mar 2025, 14:05"; the raw text if it is not a date. */
export function formatDateTime(iso: string | null | undefined, locale?: string): string {
  if (!iso) return '—'
  const date = new Date(iso)
  if (Number.isNaN(date.getTime())) return iso
  return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(date)
}
