import type { Plan } from '../floorplan/plan-schema'
import { VENTILATION_STATE_LABELS, type RunSummary, type ScenarioConfig } from '../schemas/runs'
import { canonicalJson } from './canonical'

/**
 * Plain-language lists of what changed in a floor plan or a scenario, for the reason a plan is stale
 * ("room Wet lab's air changes changed from 6 to 4"), and the old-vs-new times to limits after a refresh.
 * An empty list means nothing the results depend on changed (a moved underlay image, for instance).
 */

const num = (v: number) => (Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(4))))
const same = (a: unknown, b: unknown) => canonicalJson(a) === canonicalJson(b)

type Named = { id: string; name: string }

/** Added, removed and changed elements of one collection; `fields` names what changed inside one element. */
function collectionChanges<T extends Named>(noun: string, before: readonly T[], after: readonly T[], fields: (a: T, b: T) => string[]): string[] {
  const out: string[] = []
  const old = new Map(before.map((e) => [e.id, e]))
  const now = new Map(after.map((e) => [e.id, e]))
  for (const e of after) if (!old.has(e.id)) out.push(`${noun} ${e.name} added`)
  for (const e of before) if (!now.has(e.id)) out.push(`${noun} ${e.name} removed`)
  for (const b of after) {
    const a = old.get(b.id)
    if (!a || same(a, b)) continue
    const named = a.name !== b.name ? `${noun} ${a.name} (now ${b.name})` : `${noun} ${b.name}`
    const what = fields(a, b)
    out.push(...(what.length ? what.map((w) => `${named}'s ${w}`) : a.name !== b.name ? [`${noun} ${a.name} renamed to ${b.name}`] : [`${named} changed`]))
  }
  return out
}

const changedFrom = (label: string, a: unknown, b: unknown, show: (v: never) => string = (v) => String(v)) =>
  same(a, b) ? [] : [`${label} changed from ${show(a as never)} to ${show(b as never)}`]
const moved = (label: string, a: unknown, b: unknown) => (same(a, b) ? [] : [`${label} moved`])

const ventText = (v: Plan['rooms'][number]['ventilation']) =>
  v.mode === 'ach' ? `${num(v.airChangesPerHour)} air changes per hour` : `downflow ${num(v.downflowSpeedMS)} m/s, ${num(v.exhaustFraction * 100)} % exhausted`

/** What changed between two versions of a floor's plan (and its ceiling height), in the words of the page. */
export function describeFloorChanges(before: { plan: Plan; ceilingM: number }, after: { plan: Plan; ceilingM: number }): string[] {
  const a = before.plan, b = after.plan
  const out: string[] = [...changedFrom('ceiling height', before.ceilingM, after.ceilingM, (v: number) => `${num(v)} m`)]
  out.push(...collectionChanges('room', a.rooms, b.rooms, (x, y) => [
    ...(x.ventilation.mode === 'ach' && y.ventilation.mode === 'ach'
      ? changedFrom('air changes', x.ventilation.airChangesPerHour, y.ventilation.airChangesPerHour, num)
      : changedFrom('ventilation', x.ventilation, y.ventilation, ventText)),
    ...moved('outline', x.polygon, y.polygon),
    ...changedFrom('kind', x.kind, y.kind),
  ]))
  out.push(...collectionChanges('opening', a.openings, b.openings, (x, y) => [
    ...changedFrom('state', x.open, y.open, (v: boolean) => (v ? 'open' : 'closed')),
    ...moved('position', x.segment, y.segment),
    ...changedFrom('exit marking', x.exit ?? null, y.exit ?? null, (v: string | null) => v ?? 'none'),
    ...changedFrom('kind', x.kind, y.kind),
  ]))
  out.push(...collectionChanges('source', a.sources, b.sources, (x, y) => [
    ...changedFrom('gas', x.gasId, y.gasId),
    ...moved('position', x.position, y.position),
    ...changedFrom('pressure', x.pressurePa, y.pressurePa, (v: number) => `${num(v / 1e5)} bar(g)`),
    ...changedFrom('inventory', x.inventoryKg, y.inventoryKg, (v: number | null) => (v === null ? 'unknown' : `${num(v)} kg`)),
    ...changedFrom('restriction', x.restriction, y.restriction, (v: { kind: string; diameterM: number }) => `${v.kind === 'rfo' ? 'RFO' : 'orifice'} ${num(v.diameterM * 1000)} mm`),
    ...changedFrom('release height', x.releaseHeightM, y.releaseHeightM, (v: number) => `${num(v)} m`),
    ...(same([x.liquefied, x.waterVolumeM3, x.dischargeCoefficient, x.kind], [y.liquefied, y.waterVolumeM3, y.dischargeCoefficient, y.kind]) ? [] : ['container settings changed']),
  ]))
  out.push(...collectionChanges('detector', a.detectors, b.detectors, (x, y) => [
    ...moved('position', x.position, y.position),
    ...changedFrom('set points', [x.alarmLowPpm, x.alarmHighPpm], [y.alarmLowPpm, y.alarmHighPpm], (v: number[]) => `${num(v[0]!)}/${num(v[1]!)} ppm`),
    ...changedFrom('gas', x.gasId, y.gasId),
    ...changedFrom('mounting height', x.mountingHeightM, y.mountingHeightM, (v: number) => `${num(v)} m`),
  ]))
  out.push(...collectionChanges('exhaust', a.exhausts, b.exhausts, (x, y) => [
    ...changedFrom('flow', x.flowM3S, y.flowM3S, (v: number) => `${num(v)} m³/s`),
    ...moved('position', x.position, y.position),
    ...changedFrom('height', x.heightM, y.heightM, (v: number) => `${num(v)} m`),
  ]))
  out.push(...collectionChanges('workstation', a.workstations, b.workstations, (x, y) => [
    ...moved('position', x.position, y.position),
    ...changedFrom('breathing height', x.breathingHeightM, y.breathingHeightM, (v: number) => `${num(v)} m`),
  ]))
  out.push(...collectionChanges('assembly point', a.assemblyPoints ?? [], b.assemblyPoints ?? [], (x, y) => moved('position', x.position, y.position)))
  return out
}

/** What changed in a saved scenario. */
export function describeScenarioChanges(before: ScenarioConfig, after: ScenarioConfig): string[] {
  return [
    ...changedFrom('name', before.name, after.name),
    ...changedFrom('leaking sources', [...before.sourceIds].sort(), [...after.sourceIds].sort(), (v: string[]) => v.join(', ')),
    ...changedFrom('release basis', before.release, after.release),
    ...changedFrom('constant rate', before.constantRateM3S ?? null, after.constantRateM3S ?? null, (v: number | null) => (v === null ? 'none' : `${num(v)} m³/s`)),
    ...changedFrom('duration', before.durationS, after.durationS, (v: number) => `${num(v)} s`),
    ...changedFrom('ventilation state', before.ventilationState, after.ventilationState, (v: keyof typeof VENTILATION_STATE_LABELS) => VENTILATION_STATE_LABELS[v]),
    ...changedFrom('doors held open', [...before.proppedOpeningIds].sort(), [...after.proppedOpeningIds].sort(), (v: string[]) => (v.length ? v.join(', ') : 'none')),
    ...changedFrom('eddy diffusivity', before.diffusivityM2S ?? null, after.diffusivityM2S ?? null, (v: number | null) => (v === null ? 'the engine estimate' : `${num(v)} m²/s`)),
    ...changedFrom('cell size', before.cellM, after.cellM, (v: number) => `${num(v)} m`),
    ...changedFrom('layers', before.layers, after.layers, num),
    ...changedFrom('output interval', before.outputIntervalS, after.outputIntervalS, (v: number) => `${num(v)} s`),
  ]
}

/** "a, b and 3 more changes": a reason line stays readable when many things changed at once. */
export function joinChanges(changes: readonly string[], max = 3): string {
  if (changes.length <= max) return changes.length > 1 ? `${changes.slice(0, -1).join(', ')} and ${changes.at(-1)}` : (changes[0] ?? '')
  return `${changes.slice(0, max).join(', ')} and ${changes.length - max} more change${changes.length - max > 1 ? 's' : ''}`
}

/** "on 2 Dec by Name" (UTC date: the same words on every screen and in every e-mail). */
export function whenBy(at: Date, who: string | null): string {
  const d = at.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' })
  return `on ${d}${who ? ` by ${who}` : ''}`
}

/** One time to a limit, old against new, for "what changed in the numbers". */
export interface TimeChange {
  /** "Bench A: IDLH 300 ppm". */
  what: string
  beforeS: number | null
  afterS: number | null
}

/**
 * Earliest time each workstation and room crosses each limit, over a set of results, compared old against new.
 * Only the changed ones are listed, earliest first (the ones that matter most for the plan).
 */
export function compareTimesToLimits(before: readonly RunSummary[], after: readonly RunSummary[]): TimeChange[] {
  const earliest = (sums: readonly RunSummary[]) => {
    const m = new Map<string, number | null>()
    const put = (key: string, t: number | null) => {
      const cur = m.get(key)
      if (cur === undefined) m.set(key, t)
      else if (t !== null && (cur === null || t < cur)) m.set(key, t)
    }
    for (const s of sums) {
      const label = (k: string) => s.limits.find((l) => l.key === k)?.label ?? k
      for (const r of s.receptors) if (r.kind === 'workstation') for (const [k, t] of Object.entries(r.firstExceedS)) put(`${r.name}: ${label(k)}`, t)
      for (const r of s.rooms) for (const [k, t] of Object.entries(r.firstExceedS)) put(`room ${r.name}: ${label(k)}`, t)
      if (s.firstAlarm) put('first detector alarm', s.firstAlarm.timeS)
    }
    return m
  }
  const a = earliest(before), b = earliest(after)
  const out: TimeChange[] = []
  for (const what of new Set([...a.keys(), ...b.keys()])) {
    const beforeS = a.get(what) ?? null, afterS = b.get(what) ?? null
    if (beforeS === afterS) continue
    out.push({ what, beforeS, afterS })
  }
  const key = (c: TimeChange) => Math.min(c.beforeS ?? Infinity, c.afterS ?? Infinity)
  return out.sort((x, y) => key(x) - key(y) || x.what.localeCompare(y.what))
}

/** "Bench A: IDLH 300 ppm: 150 s → 120 s (30 s sooner)". */
export function timeChangeText(c: TimeChange): string {
  const t = (s: number | null) => (s === null ? 'not reached' : `${Math.round(s)} s`)
  const delta = c.beforeS !== null && c.afterS !== null
    ? ` (${Math.abs(Math.round(c.afterS - c.beforeS))} s ${c.afterS < c.beforeS ? 'sooner' : 'later'})`
    : c.afterS !== null ? ' (now reached)' : ' (no longer reached)'
  return `${c.what}: ${t(c.beforeS)} → ${t(c.afterS)}${delta}`
}
