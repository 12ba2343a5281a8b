import type { Plan, Room } from '../floorplan/plan-schema'
import { EXIT_KIND_LABELS } from '../floorplan/plan-schema'
import { segmentOnPolygonEdge } from '../geometry/polygon'
import type { EgressResult, EgressRoute } from '../schemas/egress'
import type { ReceptorSummary, RunSummary } from '../schemas/runs'
import { VENTILATION_STATE_LABELS } from '../schemas/runs'
import type {
  AlarmLevel, ChecklistStep, DerivedFrom, EvacuationRoom, HazardItem, PlanContent, PlanLine, PlanRole, TimelineRow,
} from '../schemas/plans'
import { atEventTime, doorLabel, formatPpm, formatSeconds } from './format'

/**
 * The documented rules that turn scenario results (run summaries) into a response-plan draft.
 * Pure functions: no clock, no database, no randomness; the same inputs give the same plan (and hash).
 * The readable version of every rule is RULES in ./rule-list.ts; keep the two in step.
 */

/** One scenario result as the rules read it. */
export interface PlanRunInput {
  id: number
  label: string
  summary: RunSummary
  /** Computed egress routes of this run (shared/egress); absent when the run has no stored fields. */
  egress?: EgressResult | null
}

export interface PlanFloorInput {
  name: string
  siteName: string
  plan: Plan
}

/**
 * Assumed time from a detector crossing its set point to people hearing the alarm (sensor response plus
 * signalling). Common practice: sensors take roughly 10–120 s to respond; 30 s is our default.
 */
export const DETECTOR_LAG_S = 30

/** Limit keys that mean "get out now": immediately dangerous, a quarter of the LEL, oxygen-deficient air. */
export const CRITICAL_KEYS = ['idlh', 'lel_25', 'o2_19_5'] as const
const CRITICAL = new Set<string>(CRITICAL_KEYS)
/** Detector set points tracked by the run ("alarm_<ppm>", "setpoint_<ppm>"): not limits. */
export const isSetPointKey = (key: string) => /^(alarm|setpoint)_/.test(key)
/** Exposure limits: NIOSH REL and OSHA PEL lines (TWA, STEL, ceiling). Set points, LEL fractions and oxygen levels are not. */
export const isExposureKey = (key: string) => key === 'ceiling' || /^(rel|pel)_/.test(key)
export const isCriticalKey = (key: string) => CRITICAL.has(key)

const CRITICAL_LABEL: Record<string, string> = { idlh: 'IDLH', lel_25: '25 % LEL', o2_19_5: 'oxygen below 19.5 %' }

const from = (run: PlanRunInput, rule: string, subjectKind: DerivedFrom['subjectKind'], subjectId: string | null, subjectName: string | null): DerivedFrom =>
  ({ runId: run.id, runLabel: run.label, subjectKind, subjectId, subjectName, rule })

const minOrNull = (values: (number | null | undefined)[]): number | null => {
  const f = values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v))
  return f.length ? Math.min(...f) : null
}

/** Earliest critical level at a workstation: at the workstation itself or anywhere at breathing height in its room. */
export function criticalTimeAt(summary: RunSummary, ws: ReceptorSummary): { timeS: number | null; key: string | null; where: 'workstation' | 'room' | null } {
  let best: { timeS: number | null; key: string | null; where: 'workstation' | 'room' | null } = { timeS: null, key: null, where: null }
  const room = ws.roomId ? summary.rooms.find((r) => r.id === ws.roomId) : undefined
  for (const key of CRITICAL_KEYS) {
    for (const [t, where] of [[ws.firstExceedS[key], 'workstation'], [room?.firstExceedS[key], 'room']] as const) {
      if (typeof t === 'number' && (best.timeS === null || t < best.timeS)) best = { timeS: t, key, where }
    }
  }
  return best
}

/** When the first alarm is heard: the first detector alarm plus DETECTOR_LAG_S; null when no detector alarms. */
export function warningTimeS(summary: RunSummary): number | null {
  return summary.firstAlarm ? summary.firstAlarm.timeS + DETECTOR_LAG_S : null
}

/**
 * The one definition of "time left for egress": seconds from the alarm being heard to the earliest critical level
 * (zero when the critical level comes first). Null means "not predicted": there is no critical level, or no
 * detector alarm to count from (then nobody is warned, and a drill has no target to be measured against: never 0 s).
 */
export function timeLeftForEgressS(criticalS: number | null | undefined, alarmHeardS: number | null): number | null {
  if (criticalS === null || criticalS === undefined || alarmHeardS === null) return null
  return Math.max(0, criticalS - alarmHeardS)
}

/** How a time left for egress reads: "not predicted" (no alarm) is never shown as 0 s. */
export function timeLeftText(s: number | null, hasAlarm: boolean, noCritical = 'no critical level'): string {
  if (!hasAlarm) return 'not predicted (no detector alarm)'
  return formatSeconds(s, noCritical)
}

/** R2e: seconds of egress left at a workstation (timeLeftForEgressS). */
export function egressMarginS(summary: RunSummary, ws: ReceptorSummary): number | null {
  return timeLeftForEgressS(criticalTimeAt(summary, ws).timeS, warningTimeS(summary))
}

/** R7b: the first time any workstation exceeds an exposure limit, measured from the alarm being heard. */
export function isolationTargetS(summary: RunSummary): number | null {
  const warn = warningTimeS(summary)
  if (warn === null) return null
  const t = minOrNull(summary.receptors.filter((r) => r.kind === 'workstation')
    .flatMap((r) => Object.entries(r.firstExceedS).filter(([k]) => isExposureKey(k)).map(([, v]) => v)))
  return t === null ? null : Math.max(0, t - warn)
}

// ── R1 hazard ─────────────────────────────────────────────────────────────────────────────────────────

export function hazardItems(runs: PlanRunInput[], plan: Plan): HazardItem[] {
  const roomName = (id: string | null) => (id ? plan.rooms.find((r) => r.id === id)?.name ?? id : 'outside any room')
  return runs.map((run) => {
    const s = run.summary
    const props = [
      s.gas.flammable ? 'flammable' : null, s.gas.pyrophoric ? 'pyrophoric' : null, s.gas.asphyxiant ? 'asphyxiant' : null,
      s.limits.some((l) => isExposureKey(l.key) || l.key === 'idlh') ? 'toxic (has exposure limits)' : null,
      s.gas.molarMassGMol > 29 ? 'heavier than air' : 'lighter than or close to air',
    ].filter((p): p is string => !!p)
    return {
      id: `hz-${run.id}`,
      gasId: s.gas.id,
      gasName: s.gas.name,
      properties: props,
      sources: s.sources.map((src) => ({
        name: src.name, roomName: roomName(src.roomId), inventoryM3: src.inventoryM3, releasedM3: src.releasedM3, description: src.description,
      })),
      release: `${VENTILATION_STATE_LABELS[s.ventilationState]}; release followed for ${formatSeconds(s.durationS)}; ${s.massBalance.releasedM3.toPrecision(3)} m³ of gas released in the run.`,
      limits: s.limits.filter((l) => !isSetPointKey(l.key)).map((l) => ({ key: l.key, label: l.label, ppm: l.ppm, source: l.source })),
      from: from(run, 'R1', 'run', null, null),
    }
  })
}

// ── R2 timeline ───────────────────────────────────────────────────────────────────────────────────────

export function timelineRows(runs: PlanRunInput[]): TimelineRow[] {
  const rows: TimelineRow[] = []
  for (const run of runs) {
    const s = run.summary
    const receptor = (id: string) => s.receptors.find((r) => r.id === id)
    const levelText = (level: 'low' | 'high') => (level === 'low' ? 'Low (warning)' : 'High (evacuation)')
    if (s.firstAlarm) {
      // One event, one row: the first alarm is also that detector's set-point crossing, so that row is not repeated below.
      const d = receptor(s.firstAlarm.detectorId)
      rows.push({ id: `tl-${run.id}-first`, kind: 'first_alarm', event: `First detector alarm: ${levelText(s.firstAlarm.level).toLowerCase()} set point`, where: d?.name ?? s.firstAlarm.detectorId,
        limitKey: `alarm_${s.firstAlarm.level}`, timeS: s.firstAlarm.timeS, from: from(run, 'R2a', 'detector', s.firstAlarm.detectorId, d?.name ?? null) })
    } else {
      rows.push({ id: `tl-${run.id}-first`, kind: 'first_alarm', event: 'No detector reaches its alarm set point within the run', where: '',
        limitKey: null, timeS: null, from: from(run, 'R2a', 'run', null, null) })
    }
    for (const d of s.receptors.filter((r) => r.kind === 'detector')) {
      for (const [level, t] of [['low', d.alarmLowS], ['high', d.alarmHighS]] as const) {
        if (t === null) continue
        if (s.firstAlarm && s.firstAlarm.detectorId === d.id && s.firstAlarm.level === level && s.firstAlarm.timeS === t) continue
        rows.push({ id: `tl-${run.id}-${d.id}-${level}`, kind: 'detector_alarm', event: `${levelText(level)} alarm`,
          where: d.name, limitKey: `alarm_${level}`, timeS: t, from: from(run, 'R2a', 'detector', d.id, d.name) })
      }
    }
    for (const w of s.receptors.filter((r) => r.kind === 'workstation')) {
      for (const l of s.limits.filter((x) => !isSetPointKey(x.key))) {
        const t = w.firstExceedS[l.key] ?? null
        rows.push({ id: `tl-${run.id}-${w.id}-${l.key}`, kind: 'receptor_limit', event: `${l.label} exceeded`, where: w.name, limitKey: l.key,
          timeS: t, from: from(run, 'R2b', 'receptor', w.id, w.name) })
      }
    }
    for (const room of s.rooms) {
      for (const key of CRITICAL_KEYS) {
        if (!s.limits.some((l) => l.key === key)) continue
        rows.push({ id: `tl-${run.id}-${room.id}-${key}`, kind: 'room_limit', event: `Room exceeds ${CRITICAL_LABEL[key]}`, where: room.name, limitKey: key,
          timeS: room.firstExceedS[key] ?? null, from: from(run, 'R2c', 'room', room.id, room.name) })
      }
    }
    for (const w of s.receptors.filter((r) => r.kind === 'workstation')) {
      const crit = criticalTimeAt(s, w)
      const warn = warningTimeS(s)
      let event: string
      let t: number | null = null
      if (crit.timeS === null) event = 'Time left for egress: no critical level within the run'
      else if (warn === null) event = `Time left for egress: not predicted, ${CRITICAL_LABEL[crit.key!]} ${atEventTime(crit.timeS)} with no detector alarm to warn people`
      else {
        t = Math.max(0, crit.timeS - warn)
        event = crit.timeS < warn
          ? `Time left for egress: none, ${CRITICAL_LABEL[crit.key!]} ${formatSeconds(warn - crit.timeS)} before the alarm is heard`
          : `Time left for egress before ${CRITICAL_LABEL[crit.key!]} (${crit.where === 'room' ? 'in the room' : 'at the workstation'})`
      }
      rows.push({ id: `tl-${run.id}-${w.id}-egress`, kind: 'egress', event, where: w.name, limitKey: crit.key, timeS: t,
        from: from(run, 'R2d', 'receptor', w.id, w.name) })
    }
  }
  // Events in time order; "never" rows after the timed ones, egress margins last.
  const rank = (r: TimelineRow) => (r.kind === 'egress' ? 2 : r.timeS === null ? 1 : 0)
  return rows.sort((a, b) => rank(a) - rank(b) || (a.timeS ?? 0) - (b.timeS ?? 0) || a.id.localeCompare(b.id))
}

// ── R3 evacuation ─────────────────────────────────────────────────────────────────────────────────────

const LEVEL_ORDER: Record<AlarmLevel, number> = { low: 0, high: 1, none: 2 }

/** The room's doors from the floor plan: door openings lying on the room's outline, with where they lead. */
export function doorsOfRoom(plan: Plan, room: Room): { openingId: string; name: string; leadsTo: Room | null }[] {
  return plan.openings
    .filter((o) => o.kind === 'door' && segmentOnPolygonEdge(o.segment[0], o.segment[1], room.polygon, 0.05) >= 0)
    .map((o) => ({
      openingId: o.id, name: o.name,
      leadsTo: plan.rooms.find((r) => r.id !== room.id && segmentOnPolygonEdge(o.segment[0], o.segment[1], r.polygon, 0.05) >= 0) ?? null,
    }))
}

/** The evacuation level a room needs in one run, with the reason. */
export function roomLevel(run: PlanRunInput, roomId: string): { level: AlarmLevel; reason: string } {
  const s = run.summary
  const room = s.rooms.find((r) => r.id === roomId)
  const wss = s.receptors.filter((r) => r.kind === 'workstation' && r.roomId === roomId)
  const crit = minOrNull([...CRITICAL_KEYS.map((k) => room?.firstExceedS[k]), ...wss.map((w) => criticalTimeAt(s, w).timeS)])
  if (crit !== null) {
    const key = CRITICAL_KEYS.find((k) => room?.firstExceedS[k] === crit) ?? wss.map((w) => criticalTimeAt(s, w)).find((c) => c.timeS === crit)?.key ?? 'idlh'
    return { level: 'low', reason: `${CRITICAL_LABEL[key]} reached ${atEventTime(crit)}: leave at the first alarm` }
  }
  const exp = minOrNull([
    ...Object.entries(room?.firstExceedS ?? {}).filter(([k]) => isExposureKey(k)).map(([, v]) => v),
    ...wss.flatMap((w) => Object.entries(w.firstExceedS).filter(([k]) => isExposureKey(k)).map(([, v]) => v)),
  ])
  if (exp !== null) return { level: 'high', reason: `An exposure limit is exceeded ${atEventTime(exp)} but no critical level: leave at the high alarm (or at once if you smell or feel the gas)` }
  return { level: 'none', reason: 'No limit exceeded within the run: stay alert and follow the incident lead' }
}

/** Rooms that reach a critical level in any of the results, with the earliest time and the run. */
function criticalRooms(runs: PlanRunInput[]): Map<string, { timeS: number; key: string; run: PlanRunInput }> {
  const out = new Map<string, { timeS: number; key: string; run: PlanRunInput }>()
  for (const run of runs) {
    for (const r of run.summary.rooms) {
      for (const key of CRITICAL_KEYS) {
        const t = r.firstExceedS[key]
        if (typeof t !== 'number') continue
        const prev = out.get(r.id)
        if (!prev || t < prev.timeS) out.set(r.id, { timeS: t, key, run })
      }
    }
  }
  return out
}

/** The computed route of a room (or of its workstations) in each result that has routes. */
function routesOfRoom(runs: PlanRunInput[], roomId: string): { run: PlanRunInput; route: EgressRoute }[] {
  return runs.flatMap((run) => (run.egress?.routes ?? []).filter((r) => r.fromRoomId === roomId).map((route) => ({ run, route })))
}

export function evacuationRooms(runs: PlanRunInput[], plan: Plan): EvacuationRoom[] {
  const critical = criticalRooms(runs)
  const openingName = (id: string) => plan.openings.find((o) => o.id === id)?.name || id
  const roomNameOf = (id: string) => plan.rooms.find((r) => r.id === id)?.name || id
  const decided = new Map<string, { level: AlarmLevel; reason: string; run: PlanRunInput; name: string }>()
  for (const run of runs) {
    for (const r of run.summary.rooms) {
      const lv = roomLevel(run, r.id)
      const prev = decided.get(r.id)
      if (!prev || LEVEL_ORDER[lv.level] < LEVEL_ORDER[prev.level]) decided.set(r.id, { ...lv, run, name: r.name })
    }
  }
  const out: EvacuationRoom[] = []
  for (const [roomId, d] of decided) {
    const room = plan.rooms.find((r) => r.id === roomId)
    const all = room ? doorsOfRoom(plan, room) : []
    // Never list a door into a room that reaches a critical level in any result: it sends people towards the gas.
    const intoCritical = all.filter((door) => door.leadsTo && critical.has(door.leadsTo.id))
    const usable = all.filter((door) => !intoCritical.includes(door))
    const routed = routesOfRoom(runs, roomId)
    const safeFirstDoors = new Set(routed.filter((x) => x.route.safe && x.route.doorIds[0]).map((x) => x.route.doorIds[0]!))
    const anyRoutes = routed.some((x) => x.route.exitOpeningId !== null)
    // With computed routes the doors are the first doors of the safe routes; without, every door not into a critical room.
    const listed = anyRoutes ? usable.filter((door) => safeFirstDoors.has(door.openingId)) : usable
    const doors = listed.map((door) => {
      const opening = plan.openings.find((o) => o.id === door.openingId)
      const exitKind = opening?.exit ?? null
      const note = exitKind
        ? EXIT_KIND_LABELS[exitKind]
        : !door.leadsTo
          ? 'Leads outside the drawn rooms'
          : `Leads into ${door.leadsTo.name}`
      return { openingId: door.openingId, name: doorLabel(door.name, door.leadsTo?.name ?? null), note }
    })
    const avoid = intoCritical.length
      ? `Do not use: ${intoCritical.map((door) => { const c = critical.get(door.leadsTo!.id)!; return `${door.name || door.openingId} (leads into ${door.leadsTo!.name}, ${CRITICAL_LABEL[c.key]} ${atEventTime(c.timeS)}, ${c.run.label})` }).join('; ')}`
      : undefined
    const routeLines: string[] = []
    const roomRoutes = routed.filter((x) => x.route.fromWorkstationId === null)
    for (const { run, route } of roomRoutes) {
      if (route.exitOpeningId === null) { routeLines.push(`${run.label}: ${route.reason}`); continue }
      const passesCritical = route.viaRoomIds.filter((id) => critical.has(id))
      if (!route.safe) routeLines.push(`${run.label}: ${route.reason}`)
      else {
        routeLines.push(`${run.label}: by ${route.doorIds.map(openingName).join(', then ')}${route.viaRoomIds.length ? ` via ${route.viaRoomIds.map(roomNameOf).join(', ')}` : ''}, about ${formatSeconds(route.walkS)} on foot${passesCritical.length ? ` (passes ${passesCritical.map(roomNameOf).join(', ')} before it reaches a critical level: only when leaving on time)` : ''}.`)
      }
    }
    const unsafeWs = routed.filter((x) => x.route.fromWorkstationId !== null && !x.route.safe && x.route.exitOpeningId !== null)
    for (const { run, route } of unsafeWs) routeLines.push(`${run.label}, workstation ${route.fromWorkstationId}: ${route.reason}`)
    if (!anyRoutes) {
      routeLines.push(routed.length || runs.some((r) => r.egress)
        ? 'No route to a marked exit: mark the exit doors (outdoors, stair, protected corridor) on the floor plan and refresh this plan.'
        : 'Routes not computed for these results: mark the exit doors on the floor plan; the doors listed only avoid rooms that reach a critical level.')
    } else if (!doors.length) {
      routeLines.unshift('No safe route out of this room is predicted under these conditions: see below, and plan earlier warning, a refuge or rescue by protected responders.')
    }
    out.push({ roomId, roomName: room?.name ?? d.name, alarmLevel: d.level, reason: `${d.reason} (${d.run.label})`, doors,
      route: routeLines.join('\n').slice(0, 2000), ...(avoid ? { avoid: avoid.slice(0, 1000) } : {}),
      from: from(d.run, 'R3', 'room', roomId, room?.name ?? d.name) })
  }
  return out.sort((a, b) => LEVEL_ORDER[a.alarmLevel] - LEVEL_ORDER[b.alarmLevel] || a.roomName.localeCompare(b.roomName))
}

// ── R4 immediate actions ──────────────────────────────────────────────────────────────────────────────

export function immediateActions(runs: PlanRunInput[], evac: EvacuationRoom[]): PlanLine[] {
  const lines: PlanLine[] = []
  const first = runs[0]!
  lines.push({ id: 'act-raise', text: 'Raise the alarm and call the site emergency number; do not wait to be sure.', who: 'Whoever hears the alarm or notices the gas', from: from(first, 'R4d', 'run', null, null) })
  lines.push({ id: 'act-call', text: 'Call the emergency services; tell them the gas, the rooms affected, and who may still be inside.', who: 'Incident lead', from: from(first, 'R4d', 'run', null, null) })
  lines.push({ id: 'act-inform', text: 'Inform the EHS officer and the lab managers of the floor.', who: 'Incident lead', from: from(first, 'R4d', 'run', null, null) })
  const seenSource = new Set<string>()
  for (const run of runs) {
    const s = run.summary
    const dets = s.receptors.filter((r) => r.kind === 'detector' && r.alarmHighS !== null).sort((a, b) => a.alarmHighS! - b.alarmHighS!)
    const names = s.sources.map((x) => x.name).join(', ')
    if (dets.length) {
      const d = dets[0]!
      lines.push({ id: `act-${run.id}-shutoff`, text: `High alarm of ${d.name} (predicted ${atEventTime(d.alarmHighS!)}) should close the automatic shut-off valve of ${names}. Confirm the interlock exists and has been tested.`,
        who: 'Gas detection system (automatic); gas technician confirms', from: from(run, 'R4a', 'detector', d.id, d.name) })
    } else {
      lines.push({ id: `act-${run.id}-shutoff`, text: `No detector reaches its high alarm in this result, so an automatic shut-off would not trip on its own: isolate ${names} by hand.`,
        who: 'Gas technician', from: from(run, 'R4a', 'run', null, null) })
    }
    for (const src of s.sources) {
      if (seenSource.has(src.id)) continue
      seenSource.add(src.id)
      lines.push({ id: `act-${run.id}-isolate-${src.id}`, text: `Isolate ${src.name} (${s.gas.name}) at the cylinder or cabinet valve, or with the remote emergency stop, only if it can be reached without entering air above the exposure limit.`,
        who: 'Gas technician (trained, protected)', from: from(run, 'R4b', 'source', src.id, src.name) })
    }
    if (s.ventilationState === 'exhaust_failed') {
      lines.push({ id: `act-${run.id}-exhaust-failed`, text: 'This result assumes the exhaust has failed: check the exhaust status at once and call facilities to restore it; the times in this plan are for that condition.',
        who: 'Incident lead', from: from(run, 'R4c', 'run', null, null) })
    }
    if (s.gas.flammable) {
      lines.push({ id: `act-${run.id}-ignition`, text: `${s.gas.name} is flammable: do not operate switches or equipment in the affected rooms; remove ignition sources only if it is safe to do so.`,
        who: 'Everyone', from: from(run, 'R4e', 'run', null, null) })
    }
    if (s.gas.pyrophoric) {
      lines.push({ id: `act-${run.id}-pyro`, text: `${s.gas.name} can ignite in air: do not try to put out a fire at the source before the supply is isolated; keep clear and let responders handle it.`,
        who: 'Everyone', from: from(run, 'R4f', 'run', null, null) })
    }
  }
  for (const room of evac.filter((r) => r.alarmLevel !== 'none')) {
    lines.push({ id: `act-exhaust-${room.roomId}`, text: `Keep the exhaust of ${room.roomName} running (never switch ventilation off to "contain" the gas); start the emergency purge where one is fitted.`,
      who: 'Gas technician / facilities', from: room.from })
  }
  return lines
}

// ── R5 protection and re-entry ────────────────────────────────────────────────────────────────────────

export function protection(runs: PlanRunInput[]): { ppe: PlanLine[]; reentry: PlanLine[] } {
  const ppe: PlanLine[] = []
  const reentry: PlanLine[] = []
  const first = runs[0]!
  for (const run of runs) {
    const s = run.summary
    const critRoom = s.rooms.find((r) => CRITICAL_KEYS.some((k) => r.firstExceedS[k] != null))
    if (critRoom) {
      const key = CRITICAL_KEYS.find((k) => critRoom.firstExceedS[k] != null)!
      ppe.push({ id: `ppe-${run.id}-scba`, text: `${critRoom.name} reaches ${CRITICAL_LABEL[key]}: no entry without positive-pressure self-contained breathing apparatus, in pairs with a standby person outside (common practice).`,
        who: 'Responders', from: from(run, 'R5a', 'room', critRoom.id, critRoom.name) })
    }
    ppe.push({ id: `ppe-${run.id}-sds`, text: `Choose gloves, eye and body protection against ${s.gas.name} from its safety data sheet; when the concentration is unknown, treat it as above IDLH.`,
      who: 'Responders', from: from(run, 'R5a', 'run', null, null) })

    const exposure = s.limits.filter((l) => isExposureKey(l.key)).sort((a, b) => a.ppm - b.ppm)[0]
    const heights = s.gas.molarMassGMol > 29 ? 'including low points near the floor (the gas is heavier than air)' : 'including high points near the ceiling (the gas is lighter than or close to air)'
    if (exposure) {
      reentry.push({ id: `re-${run.id}-below`, text: `${s.gas.name} readings confirmed below ${formatPpm(exposure.ppm)} ppm (${exposure.label}) with a calibrated, bump-tested meter, at several heights and places, ${heights}.`,
        who: 'Qualified person with a meter', from: from(run, 'R5b', 'run', null, null) })
    }
    if (s.gas.asphyxiant) {
      reentry.push({ id: `re-${run.id}-o2`, text: 'Oxygen reads between 19.5 % and 23.5 % everywhere people will go.', who: 'Qualified person with a meter', from: from(run, 'R5b', 'run', null, null) })
    }
    const lel10 = s.limits.find((l) => l.key === 'lel_10')
    if (s.gas.flammable) {
      reentry.push({ id: `re-${run.id}-lel`, text: `Flammable gas below 10 % LEL${lel10 ? ` (${formatPpm(lel10.ppm)} ppm)` : ''}, and preferably zero.`, who: 'Qualified person with a meter', from: from(run, 'R5b', 'run', null, null) })
    }
  }
  reentry.push({ id: 're-isolated', text: 'The source is isolated and the isolation is checked (valve closed, cylinder in an exhausted enclosure or removed).', who: 'Gas technician', from: from(first, 'R5b', 'run', null, null) })
  reentry.push({ id: 're-stable', text: 'Readings stay steady or keep falling over a period the incident lead sets; ventilation runs; detectors are reset and working.', who: 'Incident lead', from: from(first, 'R5b', 'run', null, null) })
  reentry.push({ id: 're-allclear', text: 'Only the incident lead declares the all-clear; the first people back in wear the protection the readings call for.', who: 'Incident lead', from: from(first, 'R5b', 'run', null, null) })
  return { ppe, reentry }
}

// ── R6 after the incident ─────────────────────────────────────────────────────────────────────────────

export function afterIncident(runs: PlanRunInput[]): PlanLine[] {
  const f = from(runs[0]!, 'R6', 'run', null, null)
  return [
    { id: 'after-medical', text: 'Anyone who may have been exposed is seen by occupational health, even without symptoms.', who: 'Incident lead', from: f },
    { id: 'after-report', text: 'Record the incident in the site reporting system and notify the authorities where the rules require it.', who: 'EHS officer', from: f },
    { id: 'after-hotwash', text: 'Hold a short debrief the same day; then an after-action review with findings and corrective actions, each with an owner and a due date.', who: 'EHS officer', from: f },
    { id: 'after-detectors', text: 'Bump-test or recalibrate the detectors that saw the gas; replace cylinders, fittings or seals that leaked.', who: 'Gas technician', from: f },
    { id: 'after-review', text: 'Review this plan; a changed plan is published as a new version and acknowledged again by the lab managers.', who: 'EHS officer', from: f },
  ]
}

// ── R7 checklist ──────────────────────────────────────────────────────────────────────────────────────

export function checklist(runs: PlanRunInput[], evac: EvacuationRoom[]): { steps: ChecklistStep[]; predicted: PlanContent['predicted'] } {
  const steps: ChecklistStep[] = []
  const first = runs[0]!
  const firstAlarmS = minOrNull(runs.map((r) => r.summary.firstAlarm?.timeS))
  const alarmRun = runs.find((r) => r.summary.firstAlarm?.timeS === firstAlarmS) ?? first
  steps.push({ id: 'ck-alarm', who: 'Anyone in the area', what: 'Recognise the alarm and call out the evacuation', targetS: 0,
    basis: firstAlarmS === null ? 'No detector alarm is predicted: the drill starts when someone notices the gas' : `Start of the drill; the first detector alarm is predicted ${atEventTime(firstAlarmS)} after the release, heard about ${DETECTOR_LAG_S} s later`,
    measure: 'none', from: from(alarmRun, 'R7a', 'run', null, null) })

  // Per evacuated room: the smallest egress margin of its workstations, over every result.
  let overallEgress: number | null = null
  for (const room of evac.filter((r) => r.alarmLevel !== 'none')) {
    let margin: number | null = null
    let src: { run: PlanRunInput; ws: ReceptorSummary } | null = null
    for (const run of runs) {
      for (const ws of run.summary.receptors.filter((r) => r.kind === 'workstation' && r.roomId === room.roomId)) {
        const m = egressMarginS(run.summary, ws)
        if (m !== null && (margin === null || m < margin)) { margin = m; src = { run, ws } }
      }
    }
    // No workstation margin (none drawn, or none reached): the room's own critical time drives the target.
    let roomSrc: { run: PlanRunInput; critS: number; key: string; warnS: number | null } | null = null
    if (margin === null) {
      for (const run of runs) {
        const r = run.summary.rooms.find((x) => x.id === room.roomId)
        for (const key of CRITICAL_KEYS) {
          const t = r?.firstExceedS[key]
          if (typeof t !== 'number') continue
          const warn = warningTimeS(run.summary)
          const m = timeLeftForEgressS(t, warn)
          // No alarm: the time left is not predicted (never 0 s), but the room's critical level is still named in the basis.
          if (!roomSrc || (m !== null && (margin === null || m < margin))) { margin = m ?? margin; roomSrc = { run, critS: t, key, warnS: warn } }
        }
      }
    }
    if (margin !== null) overallEgress = overallEgress === null ? margin : Math.min(overallEgress, margin)
    const walk = routesOfRoom(runs, room.roomId).filter((x) => x.route.safe).map((x) => x.route.walkS)
    const walkText = walk.length ? `; predicted walk by the computed route: ${formatSeconds(Math.max(...walk))}` : ''
    const basis = (src
      ? `Time left for egress at ${src.ws.name} (${src.run.label})`
      : roomSrc
        ? `${CRITICAL_LABEL[roomSrc.key]} is reached in the room ${atEventTime(roomSrc.critS)}${roomSrc.warnS === null ? ' with no detector alarm' : roomSrc.critS <= roomSrc.warnS ? ', before the alarm is heard: no time is left' : `, ${formatSeconds(roomSrc.critS - roomSrc.warnS)} after the alarm is heard`} (${roomSrc.run.label})`
        : 'No critical level in this room within the results') + walkText
    const when = `at the ${room.alarmLevel === 'low' ? 'first' : 'high'} alarm`
    const what = room.doors.length
      ? `Leave ${room.roomName} by ${room.doors.map((d) => d.name).join(', ')} ${when}, closing doors behind you`
      : room.route && /No safe route/.test(room.route)
        ? `Leave ${room.roomName} ${when}: no safe route is predicted under these conditions (see the Evacuation section); follow the incident lead`
        : `Leave ${room.roomName} ${when} by a door that does not lead towards the gas, closing doors behind you`
    steps.push({ id: `ck-evac-${room.roomId}`, who: `Occupants of ${room.roomName}; floor warden`,
      what,
      targetS: margin,
      basis: basis.slice(0, 500),
      measure: 'alarm_to_evacuated', from: src ? from(src.run, 'R7b', 'receptor', src.ws.id, src.ws.name) : roomSrc ? from(roomSrc.run, 'R7b', 'room', room.roomId, room.roomName) : room.from })
  }

  const iso = minOrNull(runs.map((r) => isolationTargetS(r.summary)))
  const isoRun = runs.find((r) => isolationTargetS(r.summary) === iso) ?? first
  steps.push({ id: 'ck-isolate', who: 'Gas technician', what: 'Confirm the automatic shut-off closed, or isolate the source by hand if it is safe',
    targetS: iso, basis: iso === null ? 'No exposure limit is exceeded at a workstation within the results' : `Before the first exposure limit is exceeded at a workstation (${isoRun.label})`,
    measure: 'alarm_to_isolation', from: from(isoRun, 'R7c', 'run', null, null) })
  steps.push({ id: 'ck-call', who: 'Incident lead', what: 'Call the emergency services and give the gas, the rooms and the head count so far', targetS: null,
    basis: 'As soon as the alarm is confirmed (not a result of the model)', measure: 'none', from: from(first, 'R7d', 'run', null, null) })
  steps.push({ id: 'ck-headcount', who: 'Floor warden', what: 'Count people at the assembly point and report anyone missing to the incident lead', targetS: null,
    basis: 'Measured in the drill; the results give no time for it', measure: 'alarm_to_headcount', from: from(first, 'R7d', 'run', null, null) })
  steps.push({ id: 'ck-reentry', who: 'Incident lead', what: 'Decide on re-entry against the re-entry criteria of this plan', targetS: null,
    basis: 'After the source is isolated and readings are confirmed', measure: 'none', from: from(first, 'R7d', 'run', null, null) })
  return { steps, predicted: { egressMarginS: overallEgress, isolationByS: iso, firstAlarmS } }
}

export const DEFAULT_ROLES: PlanRole[] = [
  { id: 'role-lead', duty: 'Incident lead', person: '', phone: '', email: '' },
  { id: 'role-warden', duty: 'Floor warden (evacuation and head count)', person: '', phone: '', email: '' },
  { id: 'role-gastech', duty: 'Gas technician (shut-off and isolation)', person: '', phone: '', email: '' },
  { id: 'role-ehs', duty: 'EHS officer', person: '', phone: '', email: '' },
]

/** Every rule applied in order: the draft of a new plan. */
export function generatePlan(floor: PlanFloorInput, runs: PlanRunInput[], title?: string): PlanContent {
  if (!runs.length) throw new Error('A plan needs at least one result')
  const evac = evacuationRooms(runs, floor.plan)
  const { steps, predicted } = checklist(runs, evac)
  const gases = [...new Set(runs.map((r) => r.summary.gas.name))].join(', ')
  const prot = protection(runs)
  return {
    title: title?.trim() || `${gases} release – ${floor.name}`,
    summary: `Generated from ${runs.length} result${runs.length > 1 ? 's' : ''} (${runs.map((r) => `#${r.id} ${r.label}`).join('; ')}) for ${floor.siteName}, ${floor.name}.`,
    hazard: { items: hazardItems(runs, floor.plan), notes: '' },
    timeline: { rows: timelineRows(runs), notes: `Times are from the start of the release. The alarm is assumed heard ${DETECTOR_LAG_S} s after a detector crosses its set point.` },
    evacuation: { rooms: evac, assemblyPoint: (floor.plan.assemblyPoints ?? []).map((a) => a.name || a.id).join('; ').slice(0, 500), notes: '' },
    actions: { items: immediateActions(runs, evac), notes: '' },
    protection: { ...prot, notes: '' },
    afterIncident: { items: afterIncident(runs), notes: '' },
    roles: DEFAULT_ROLES.map((r) => ({ ...r })),
    contacts: [],
    checklist: steps,
    predicted,
  }
}
