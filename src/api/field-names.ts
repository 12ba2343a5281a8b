import type { Plan } from '../../shared/floorplan/plan-schema'

/**
 * Server field paths ("plan.sources.1.releaseHeightM", "ownerId") turned into the words the screen uses
 * ("Release height of source “Cylinder A”", "Owner"), so no message shows an internal name.
 */
const ELEMENT_NOUN: Record<string, string> = {
  rooms: 'room', openings: 'door', sources: 'source', detectors: 'detector', exhausts: 'exhaust', workstations: 'workstation', assemblyPoints: 'assembly point',
}
const PROPERTY_LABEL: Record<string, string> = {
  name: 'Name', kind: 'Kind', gasId: 'Gas', position: 'Position', polygon: 'Corners', segment: 'Position on the wall',
  releaseHeightM: 'Release height', inventoryKg: 'Inventory', liquefied: 'Liquefied gas', pressurePa: 'Pressure (gauge)', waterVolumeM3: 'Cylinder water volume',
  restriction: 'Flow restriction', diameterM: 'Diameter', dischargeCoefficient: 'Discharge coefficient',
  mountingHeightM: 'Mounting height', alarmLowPpm: 'Alarm 1', alarmHighPpm: 'Alarm 2', heightM: 'Height', flowM3S: 'Exhaust flow',
  breathingHeightM: 'Breathing height', airChangesPerHour: 'Air changes per hour', downflowSpeedMS: 'Downflow speed', exhaustFraction: 'Exhausted share of recirculated air',
  ventilation: 'Ventilation', open: 'Open by default', exit: 'Exit',
}

/** The element a plan path points at, for selecting it in the editor: `{ collection, index, id }`. */
export function planElementOf(path: string, plan: Plan | null | undefined): { collection: string; index: number; id: string | null } | null {
  const m = /^(?:plan\.)?(rooms|openings|sources|detectors|exhausts|workstations|assemblyPoints)\.(\d+)/.exec(path)
  if (!m) return null
  const index = Number(m[2])
  const list = (plan as Record<string, unknown> | null | undefined)?.[m[1]!] as { id?: string }[] | undefined
  return { collection: m[1]!, index, id: list?.[index]?.id ?? null }
}

/** "Release height of source “Cylinder A”" for "plan.sources.1.releaseHeightM". */
export function planFieldLabel(path: string, plan: Plan | null | undefined): string {
  const m = /^(?:plan\.)?(rooms|openings|sources|detectors|exhausts|workstations|assemblyPoints)\.(\d+)(?:\.(.+))?$/.exec(path)
  if (!m) return PROPERTY_LABEL[path.replace(/^plan\./, '')] ?? 'The floor plan'
  const noun = ELEMENT_NOUN[m[1]!]!
  const index = Number(m[2])
  const list = (plan as Record<string, unknown> | null | undefined)?.[m[1]!] as { name?: string; id?: string }[] | undefined
  const el = list?.[index]
  const who = el?.name ? `${noun} “${el.name}”` : `${noun} ${index + 1}`
  const prop = m[3]?.split('.').filter((p) => !/^\d+$/.test(p)).pop()
  return prop ? `${PROPERTY_LABEL[prop] ?? 'A value'} of ${who}` : who.charAt(0).toUpperCase() + who.slice(1)
}

/** Zod's English defaults in plain words (the schemas' own messages are already plain and pass through). */
export function plainMessage(message: string): string {
  return message
    .replace(/^Too big: expected number to be <=\s*(\S+)$/, 'At most $1')
    .replace(/^Too big: expected number to be <\s*(\S+)$/, 'Less than $1')
    .replace(/^Too small: expected number to be >=\s*(\S+)$/, 'At least $1')
    .replace(/^Too small: expected number to be >\s*(\S+)$/, 'More than $1')
    .replace(/^Too small: expected string to have >=1 characters?$/, 'Required')
    .replace(/^Invalid input: expected number, received \w+$/, 'Enter a number')
    .replace(/^Invalid input: expected \w+, received (undefined|null)$/, 'Required')
}

/** One sentence naming every field with its problem: "Owner: Required; Due date: Enter a date". */
export function describeFields(fields: Record<string, string>, labelOf: (path: string) => string): string {
  const seen = new Map<string, string[]>()
  for (const [path, message] of Object.entries(fields)) {
    const label = labelOf(path)
    seen.set(label, [...(seen.get(label) ?? []), plainMessage(message)])
  }
  // A message that already names its element ("The release height of source “A” is above…") needs no label in front.
  const named = (label: string, msg: string) => [...label.matchAll(/“[^”]+”/g)].some((q) => msg.includes(q[0]))
  return [...seen].map(([label, msgs]) => {
    const unique = [...new Set(msgs)]
    return unique.every((m) => named(label, m)) ? unique.join('; ') : `${label}: ${unique.join('; ')}`
  }).join(' · ')
}

/** A label map with a fallback that never shows a raw path. */
export const labelsFrom = (labels: Record<string, string>, fallback = 'A field') => (path: string) =>
  labels[path] ?? labels[path.split('.')[0]!] ?? fallback
