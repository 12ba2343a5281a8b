import type { Plan } from '../floorplan/plan-schema'
import { pointInPolygon, type Point } from '../geometry/polygon'
import { formatSeconds } from '../plans/format'
import type { EgressResult, EgressRoute } from '../schemas/egress'
import type { LimitLine, RunFieldsMeta, RunSummary } from '../schemas/runs'
import { SCREENING_CAUTION } from '../ui/cautions'
import { buildEgressGraph, candidateRoutes, roomStartPoint, type CandidateRoute } from './graph'
import { DEFAULT_DISCOVERY_S, REACTION_S, REDUCED_MOBILITY_SPEED_M_S, SAMPLE_STEP_M, WALK_SPEED_M_S } from './walking'

/**
 * Time-dependent egress: for each room and workstation, every route to a marked exit is walked at a stated
 * speed from a stated start time through the run's stored breathing-height fields (the concentration at the
 * walker's place and time). The chosen route is the lowest-dose one that never crosses the critical limit;
 * when no such route exists the answer says so (safe: false) with when the routes closed, never a fallback.
 */

/** Breathing-height snapshots of a run: meta.timesS.length planes of nx·ny ppm, concatenated. */
export interface EgressField {
  meta: Pick<RunFieldsMeta, 'nx' | 'ny' | 'cellM' | 'originM' | 'timesS'>
  frames: Float32Array
}

export interface EgressOptions {
  discoveryS?: number
  reactionS?: number
  mobility?: 'unimpeded' | 'reduced'
  limitKey?: string
}

/** The limit keys that mean "get out now" (same list as the plan rules). */
const CRITICAL_KEYS = ['idlh', 'lel_25', 'o2_19_5']
const isSetPoint = (key: string) => /^(alarm|setpoint)_/.test(key)

export function criticalLimitOf(summary: RunSummary, limitKey?: string): LimitLine | null {
  if (limitKey) return summary.limits.find((l) => l.key === limitKey) ?? null
  const crit = summary.limits.filter((l) => CRITICAL_KEYS.includes(l.key)).sort((a, b) => a.ppm - b.ppm)
  return crit[0] ?? null
}

/** Concentration lookup at plan points and times; per-room maxima per frame for "room above the limit". */
class FieldSampler {
  private readonly nPlan: number
  private readonly roomMax: Float32Array[]
  readonly roomIndex = new Map<string, number>()
  readonly endS: number
  constructor(private readonly f: EgressField, plan: Plan) {
    const { nx, ny, cellM, originM, timesS } = f.meta
    this.nPlan = nx * ny
    this.endS = timesS[timesS.length - 1] ?? 0
    plan.rooms.forEach((r, i) => this.roomIndex.set(r.id, i))
    const cellRoom = new Int32Array(this.nPlan).fill(-1)
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const p: Point = [originM[0] + (i + 0.5) * cellM, originM[1] + (j + 0.5) * cellM]
        cellRoom[i + nx * j] = plan.rooms.findIndex((r) => pointInPolygon(p, r.polygon))
      }
    }
    this.roomMax = timesS.map((_, k) => {
      const m = new Float32Array(plan.rooms.length)
      const plane = f.frames.subarray(k * this.nPlan, (k + 1) * this.nPlan)
      for (let c = 0; c < this.nPlan; c++) {
        const r = cellRoom[c]!
        const v = plane[c]!
        if (r >= 0 && v > m[r]!) m[r] = v
      }
      return m
    })
  }

  /** Frame indices and weight for time t (linear in time; held at the last frame after the run). */
  private bracket(t: number): [number, number, number] {
    const ts = this.f.meta.timesS
    if (t <= ts[0]!) return [0, 0, 0]
    if (t >= this.endS) return [ts.length - 1, ts.length - 1, 0]
    let lo = 0, hi = ts.length - 1
    while (hi - lo > 1) { const m = (lo + hi) >> 1; if (ts[m]! <= t) lo = m; else hi = m }
    return [lo, hi, (t - ts[lo]!) / (ts[hi]! - ts[lo]!)]
  }

  at(x: number, y: number, t: number): number {
    const { nx, ny, cellM, originM } = this.f.meta
    const i = Math.min(nx - 1, Math.max(0, Math.floor((x - originM[0]) / cellM)))
    const j = Math.min(ny - 1, Math.max(0, Math.floor((y - originM[1]) / cellM)))
    const [a, b, w] = this.bracket(t)
    const va = this.f.frames[a * this.nPlan + i + nx * j]!, vb = this.f.frames[b * this.nPlan + i + nx * j]!
    const v = va + w * (vb - va)
    return Number.isFinite(v) ? v : 0
  }

  roomMaxAt(roomId: string, t: number): number {
    const r = this.roomIndex.get(roomId)
    if (r === undefined) return 0
    const [a, b, w] = this.bracket(t)
    const va = this.roomMax[a]![r]!, vb = this.roomMax[b]![r]!
    return va + w * (vb - va)
  }

  /** Highest value the room reaches in the whole run. */
  roomPeak(roomId: string): number {
    const r = this.roomIndex.get(roomId)
    return r === undefined ? 0 : Math.max(0, ...this.roomMax.map((m) => m[r]!))
  }
}

interface Walked {
  walkS: number
  peakPpm: number
  doseppmS: number
  timeAboveS: Record<string, number>
  criticalRoomIds: string[]
  metCriticalOnWay: boolean
  beyondRun: boolean
}

/** Walks one route from startS at speed v through the field. */
function walkRoute(route: CandidateRoute, startS: number, v: number, field: FieldSampler, limits: LimitLine[], critical: LimitLine | null): Walked {
  let t = startS, peak = 0, dose = 0
  const above: Record<string, number> = Object.fromEntries(limits.map((l) => [l.key, 0]))
  const critRooms = new Set<string>()
  let metCritical = false
  route.legs.forEach((leg, k) => {
    const roomId = route.roomIds[k]!
    for (let s = 1; s < leg.length; s++) {
      const [x0, y0] = leg[s - 1]!, [x1, y1] = leg[s]!
      const len = Math.hypot(x1 - x0, y1 - y0)
      const n = Math.max(1, Math.ceil(len / SAMPLE_STEP_M))
      const dt = len / n / v
      for (let q = 0; q < n; q++) {
        // Midpoint rule: the walker's place and time in the middle of each step.
        const f = (q + 0.5) / n
        const tm = t + dt / 2
        const c = field.at(x0 + f * (x1 - x0), y0 + f * (y1 - y0), tm)
        if (c > peak) peak = c
        dose += c * dt
        for (const l of limits) if (c >= l.ppm) above[l.key]! += dt
        if (critical && c >= critical.ppm) { metCritical = true; critRooms.add(roomId) }
        if (critical && k > 0 && field.roomMaxAt(roomId, tm) >= critical.ppm) critRooms.add(roomId)
        t += dt
      }
    }
  })
  return { walkS: t - startS, peakPpm: peak, doseppmS: dose, timeAboveS: above, criticalRoomIds: [...critRooms], metCriticalOnWay: metCritical, beyondRun: t > field.endS + 1e-9 }
}

const isSafe = (w: Walked) => w.criticalRoomIds.length === 0 && !w.metCriticalOnWay

/** Earliest start time (on the run's output times, from 0) at which the route is not safe; null when it stays safe. */
function closingTime(route: CandidateRoute, v: number, field: FieldSampler, times: number[], limits: LimitLine[], critical: LimitLine | null): number | null {
  if (!critical) return null
  for (const t of times) if (!isSafe(walkRoute(route, t, v, field, limits, critical))) return t
  return null
}

export function computeEgress(input: { runId: number; plan: Plan; summary: RunSummary; field: EgressField; options?: EgressOptions }): EgressResult {
  const { plan, summary, field: raw } = input
  const o = input.options ?? {}
  const reduced = o.mobility === 'reduced'
  const v = reduced ? REDUCED_MOBILITY_SPEED_M_S : WALK_SPEED_M_S
  const speedBasis = reduced
    ? `${v} m/s, a reduced-mobility walking speed (figures of 0.5–0.8 m/s are commonly quoted; from memory, check locally)`
    : `${v} m/s, unimpeded adult walking speed as commonly used in egress hand calculations (common practice, from memory)`
  const reaction = o.reactionS ?? REACTION_S
  let startS: number
  let startBasis: string
  if (summary.firstAlarm) {
    startS = summary.firstAlarm.timeS + reaction
    startBasis = `First detector set-point crossing at ${formatSeconds(summary.firstAlarm.timeS)} plus ${formatSeconds(reaction)} to hear the alarm and start walking`
  } else {
    startS = o.discoveryS ?? DEFAULT_DISCOVERY_S
    startBasis = `No detector alarms in this result: people start walking when someone notices the gas, assumed at ${formatSeconds(startS)}${o.discoveryS === undefined ? ' (Driftwarden default; set the discovery time for this floor)' : ' (set by the officer)'}`
  }
  const critical = criticalLimitOf(summary, o.limitKey)
  const limits = summary.limits.filter((l) => !isSetPoint(l.key))
  const field = new FieldSampler(raw, plan)
  const times = raw.meta.timesS
  const g = buildEgressGraph(plan)
  const exitIds = g.doors.filter((d) => d.exit).map((d) => d.id)
  const notes: string[] = []
  if (!exitIds.length) notes.push('No door of this floor is marked as an exit: no route can be computed. Mark the exit doors on the floor plan.')
  if (!critical) notes.push('This gas has no critical limit (IDLH, 25 % LEL, oxygen below 19.5 %) in this result: routes are chosen by dose only.')
  const roomName = (id: string) => plan.rooms.find((r) => r.id === id)?.name || id
  const doorName = (id: string) => g.doors.find((d) => d.id === id)?.name || id

  const starts: { roomId: string; wsId: string | null; at: Point; label: string }[] = []
  for (const r of plan.rooms) starts.push({ roomId: r.id, wsId: null, at: roomStartPoint(r), label: r.name || r.id })
  for (const w of plan.workstations) {
    const r = plan.rooms.find((x) => pointInPolygon(w.position, x.polygon))
    if (r) starts.push({ roomId: r.id, wsId: w.id, at: w.position, label: w.name || w.id })
  }

  const routes: EgressRoute[] = []
  for (const st of starts) {
    const { routes: cands, truncated } = candidateRoutes(g, st.roomId, st.at)
    if (truncated) notes.push(`${st.label}: the route search stopped after ${cands.length} routes (a large floor); shorter routes were searched first.`)
    const base = { fromRoomId: st.roomId, fromWorkstationId: st.wsId, startS }
    if (!cands.length) {
      routes.push({ ...base, exitOpeningId: null, viaRoomIds: [], doorIds: [], walkS: 0, distanceM: 0, peakPpm: 0, doseppmS: 0, stelEquivalentPpm: 0, timeAboveS: {},
        crossesCriticalRoom: false, criticalRoomIds: [], safe: false, closesS: null, beyondRun: false, path: [[st.at[0], st.at[1]]],
        reason: `No route from ${st.label} to a marked exit: ${exitIds.length ? 'no chain of doors reaches one' : 'no door of the floor is marked as an exit'}. Mark the exits and the doors on the floor plan.` })
      continue
    }
    const walked = cands.map((c) => ({ c, w: walkRoute(c, startS, v, field, limits, critical) }))
    // Rooms that reach the critical limit at any time in the run: a route clear of them all stays usable even if people are late.
    const everCritical = (id: string) => !!critical && field.roomPeak(id) >= critical.ppm
    const clearAllRun = (c: CandidateRoute) => c.roomIds.slice(1).every((id) => !everCritical(id))
    const safe = walked.filter((x) => isSafe(x.w))
      .sort((a, b) => Number(clearAllRun(b.c)) - Number(clearAllRun(a.c)) || a.w.doseppmS - b.w.doseppmS || a.c.lengthM - b.c.lengthM)
    const toRoute = (x: (typeof walked)[number], ok: boolean, reason: string, closesS: number | null): EgressRoute => ({
      ...base, exitOpeningId: x.c.exitId, viaRoomIds: x.c.roomIds.slice(1), doorIds: x.c.doorIds,
      walkS: x.w.walkS, distanceM: x.c.lengthM, peakPpm: x.w.peakPpm, doseppmS: x.w.doseppmS, stelEquivalentPpm: x.w.doseppmS / 900,
      timeAboveS: x.w.timeAboveS, crossesCriticalRoom: x.w.criticalRoomIds.length > 0 || x.w.metCriticalOnWay, criticalRoomIds: x.w.criticalRoomIds,
      safe: ok, closesS, beyondRun: x.w.beyondRun, path: x.c.legs.flatMap((leg, k) => (k ? leg.slice(1) : leg)).map((p) => [p[0], p[1]] as [number, number]), reason,
    })
    const via = (c: CandidateRoute) => (c.roomIds.length > 1 ? ` via ${c.roomIds.slice(1).map(roomName).join(', ')}` : '')
    if (safe.length) {
      const best = safe[0]!
      const closes = closingTime(best.c, v, field, times.filter((t) => t >= startS), limits, critical)
      const shorter = walked.filter((x) => x.c.lengthM < best.c.lengthM - 1e-6 && !isSafe(x.w))
      const parts = [`Leave ${st.label} by ${best.c.doorIds.map(doorName).join(', then ')}${via(best.c)}: ${formatSeconds(best.w.walkS)} on foot, dose ${best.w.doseppmS.toPrecision(3)} ppm·s, peak ${best.w.peakPpm.toPrecision(3)} ppm.`]
      if (shorter.length) parts.push(`A shorter route${via(shorter[0]!.c)} crosses ${critical?.label ?? 'the critical limit'} (${shorter[0]!.w.criticalRoomIds.map(roomName).join(', ') || 'on the way'}) and is not used.`)
      if (!clearAllRun(best.c)) parts.push(`It passes ${best.c.roomIds.slice(1).filter(everCritical).map(roomName).join(', ')}, which later reaches ${critical!.label}: usable only when leaving on time.`)
      if (closes !== null) parts.push(`Leaving at ${formatSeconds(closes)} or later this route is no longer safe.`)
      if (best.w.beyondRun) parts.push('The walk ends after the end of the run: the last computed concentrations are used beyond it.')
      routes.push(toRoute(best, true, parts.join(' '), closes))
    } else {
      // No safe route: say so, with when the routes closed. The lowest-dose route is reported for the record, marked unsafe.
      const least = [...walked].sort((a, b) => a.w.doseppmS - b.w.doseppmS)[0]!
      // The 20 shortest are scanned: enough to say when the way out closed without stalling on a large floor.
      const closing = walked.slice(0, 20).map((x) => ({ x, t: closingTime(x.c, v, field, times, limits, critical) }))
      const open = closing.filter((c) => c.t !== null).sort((a, b) => b.t! - a.t!)
      const last = open[0]
      const lastText = last && last.t! > 0
        ? ` The last route to close (${last.x.c.doorIds.map(doorName).join(', then ')}${via(last.x.c)}) closed for people leaving at ${formatSeconds(last.t!)}; earlier routes closed from ${formatSeconds(Math.min(...open.map((c) => c.t!)))}.`
        : ' No route was open even for people leaving at the start of the release.'
      routes.push(toRoute(least, false,
        `No safe route from ${st.label} under these conditions: leaving at ${formatSeconds(startS)}, every route to an exit crosses ${critical?.label ?? 'the critical limit'}.${lastText} Plan for earlier warning (a detector in this room, see the detector advisor), a refuge or rescue by protected responders; do not send people this way.`,
        last?.t ?? 0))
    }
  }
  return {
    runId: input.runId, speedMS: v, speedBasis, startS, startBasis,
    criticalLimit: critical ? { key: critical.key, label: critical.label, ppm: critical.ppm } : null,
    exitIds,
    assemblyPoints: (plan.assemblyPoints ?? []).map((a) => ({ id: a.id, name: a.name, position: [a.position[0], a.position[1]] as [number, number] })),
    routes,
    limits: limits.map((l) => ({ key: l.key, label: l.label, ppm: l.ppm })),
    roomsReachingCriticalIds: critical ? plan.rooms.filter((r) => field.roomPeak(r.id) >= critical.ppm).map((r) => r.id) : [],
    notes,
    caution: `Planning advice for drills, not live guidance during an incident. ${SCREENING_CAUTION.summary}`,
  }
}
