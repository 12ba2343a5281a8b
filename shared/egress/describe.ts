import type { Plan } from '../floorplan/plan-schema'
import { EXIT_KIND_LABELS } from '../floorplan/plan-schema'
import { formatPpm, formatSeconds } from '../plans/format'
import type { EgressResult, EgressRoute } from '../schemas/egress'

/**
 * Plain words for one computed route, shared by the results page, the plan page and the PDF so all three say the
 * same: where it starts, the way out, when people start, how long they walk, and the dose along the way against
 * the gas's limits (issue 13, item 4).
 */

export const startName = (plan: Plan, r: Pick<EgressRoute, 'fromRoomId' | 'fromWorkstationId'>) => {
  const room = plan.rooms.find((x) => x.id === r.fromRoomId)?.name || r.fromRoomId
  if (!r.fromWorkstationId) return room
  const ws = plan.workstations.find((w) => w.id === r.fromWorkstationId)?.name || r.fromWorkstationId
  return `${ws} (${room})`
}

/** "Door A, then Stair door (Exit to a stair)" (no arrow glyph: the PDF font has none) or the reason there is none. */
export function wayOutText(plan: Plan, r: EgressRoute): string {
  if (!r.doorIds.length) return 'no route to a marked exit'
  const name = (id: string) => plan.openings.find((o) => o.id === id)?.name || id
  const exit = plan.openings.find((o) => o.id === r.exitOpeningId)
  const via = r.viaRoomIds.length ? ` via ${r.viaRoomIds.map((id) => plan.rooms.find((x) => x.id === id)?.name || id).join(', ')}` : ''
  return `${r.doorIds.map(name).join(', then ')}${exit?.exit ? ` (${EXIT_KIND_LABELS[exit.exit]})` : ''}${via}`
}

/** A short-term limit to compare the 15-minute average with: the REL STEL, else a ceiling, else null. */
function shortTermLimit(limits: NonNullable<EgressResult['limits']>) {
  return limits.find((l) => l.key === 'rel_stel') ?? limits.find((l) => l.key === 'ceiling' || l.key === 'pel_ceiling') ?? null
}

/** Dose along the route: peak met, ∫C dt and its 15-minute average against a short-term limit, time above each limit. */
export function doseLines(egress: Pick<EgressResult, 'limits' | 'criticalLimit'>, r: EgressRoute): string[] {
  if (!r.doorIds.length) return []
  const limits = egress.limits ?? []
  const out = [`Peak met on the way: ${formatPpm(r.peakPpm)} ppm.`]
  const st = shortTermLimit(limits)
  const avg = `${formatPpm(r.stelEquivalentPpm)} ppm`
  out.push(`Dose along the walk: ${formatPpm(r.doseppmS)} ppm·s, ${avg} averaged over 15 minutes (no other exposure assumed)${st ? `: ${r.stelEquivalentPpm < st.ppm ? 'below' : 'at or above'} the ${st.label} of ${formatPpm(st.ppm)} ppm` : ''}.`)
  const above = limits.filter((l) => (r.timeAboveS[l.key] ?? 0) > 0).map((l) => `${l.label} for ${r.timeAboveS[l.key]! < 0.5 ? 'under 1 s' : formatSeconds(r.timeAboveS[l.key]!)}`)
  out.push(above.length ? `Above ${above.join(', ')} while walking.` : 'Below every limit of the gas for the whole walk.')
  if (egress.criticalLimit && !above.length) out[out.length - 1] = `Below every limit of the gas for the whole walk, ${egress.criticalLimit.label} included.`
  return out
}

/** The one-line verdict shown beside each route. */
export const verdictText = (r: EgressRoute) =>
  r.safe ? `Safe way out: ${formatSeconds(r.walkS)} on foot from ${formatSeconds(r.startS)}` : 'No safe route under these conditions'
