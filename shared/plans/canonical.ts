/**
 * Canonical JSON: object keys sorted at every level, no whitespace, undefined members dropped, numbers as
 * JSON writes them. Two equal documents always give the same text, so the same sha256 content hash.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value)) throw new Error('Non-finite number in canonical JSON')
    return JSON.stringify(value) ?? 'null'
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`
}

/** What a published version's hash covers: the plan id, version number, floor and the whole content. */
export function hashInput(v: { planId: number; version: number; floorId: number | null; content: unknown }): string {
  return canonicalJson({ planId: v.planId, version: v.version, floorId: v.floorId, content: v.content })
}
