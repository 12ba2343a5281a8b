import { Plan } from '../../shared/floorplan/plan-schema'
import { defaultAlarmSetPoints } from '../../shared/gases/alarm-setpoints'
import { findGas } from '../../shared/gases/library'
import { pointInPolygon } from '../../shared/geometry/polygon'
import {
  awayFromSources, chooseCoverage, chooseMinMax, COVERAGE_GUARANTEE, gridCandidates, MINMAX_GUARANTEE, mountingHeightFor, SOURCE_CLEARANCE_M,
} from '../../shared/runs/advisor'
import { limitIndexAt } from '../../shared/runs/limits'
import { sampleAt } from '../../shared/runs/summarize'
import { RunFieldsMeta, RunSummary, type AdvisorAccept, type AdvisorProposal, type AdvisorRequest } from '../../shared/schemas/runs'
import { AppError } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import { bundleMembers } from '../repositories/bundles.repo'
import { findResultFronts, findRunInOrg } from '../repositories/runs.repo'
import type { ServiceContext } from './context'
import { requireVisibleFloor, savePlan } from './floors.service'

const bad = (field: string, message: string) => new AppError(400, 'validation_failed', `Some fields are not valid: ${field}`, { [field]: message })

/** Grid points the advisor may lay over the rooms' extent (it keeps at most 2000 inside rooms anyway). */
export const MAX_GRID_POINTS = 10_000

/** Refuses a grid whose loop would hold the server (issue 14: 1 m room 1 km away at 0.25 m took 4.8 s). */
function checkGridSize(plan: Plan, spacing: number) {
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity
  for (const r of plan.rooms) for (const [x, y] of r.polygon) { x0 = Math.min(x0, x); x1 = Math.max(x1, x); y0 = Math.min(y0, y); y1 = Math.max(y1, y) }
  if (!Number.isFinite(x0)) return
  const points = Math.ceil((x1 - x0) / spacing) * Math.ceil((y1 - y0) / spacing)
  if (points > MAX_GRID_POINTS) {
    const least = Math.ceil(Math.sqrt(((x1 - x0) * (y1 - y0)) / MAX_GRID_POINTS) * 105) / 100
    throw bad('gridSpacingM', `A grid this fine over ${Math.round(x1 - x0)} m × ${Math.round(y1 - y0)} m has ${points} points (at most ${MAX_GRID_POINTS}): use at least ${least} m, or pick points on the plan`)
  }
}

/** Proposes detector positions from stored fronts (no re-run): see shared/runs/advisor.ts for what it guarantees. */
export async function propose(ctx: ServiceContext, actor: Actor, floorId: number, req: AdvisorRequest): Promise<AdvisorProposal> {
  const floor = await requireVisibleFloor(ctx.db, actor, floorId)
  const plan = Plan.parse(floor.plan)
  if (!req.candidates.length && req.gridSpacingM) checkGridSize(plan, req.gridSpacingM)
  const runs: NonNullable<Awaited<ReturnType<typeof findRunInOrg>>>[] = []
  for (const [i, id] of req.runIds.entries()) {
    const run = await findRunInOrg(ctx.db, actor.orgId, id)
    if (!run || run.floor_id !== floorId) throw bad(`runIds.${i}`, 'No such run on this floor')
    if (run.status !== 'succeeded') throw bad(`runIds.${i}`, 'This run has no result (not finished)')
    runs.push(run)
  }
  // Sensitivity bundles (issue 17): each finished case counts as a scenario of its own, so the min-max placement
  // answers for the worst of them (the conservative end); the nominal stays listed beside them in perRun.
  const bundled: string[] = []
  for (const run of [...runs]) {
    const cases = (await bundleMembers(ctx.db, actor.orgId, run.id)).filter((m) => m.status === 'succeeded' && !runs.some((r) => r.id === m.run_id))
    for (const m of cases) { const r = await findRunInOrg(ctx.db, actor.orgId, m.run_id); if (r) runs.push(r) }
    if (cases.length) bundled.push(`${run.label} (${cases.length} sensitivity cases)`)
  }
  const results = new Map((await findResultFronts(ctx.db, runs.map((r) => r.id))).map((r) => [r.run_id, r]))
  const parsed = runs.map((run) => {
    const r = results.get(run.id)!
    return { run, meta: RunFieldsMeta.parse(r.meta), summary: RunSummary.parse(r.summary), fronts: r.fronts }
  })
  const gasId = parsed[0]!.summary.gas.id
  const mixed = parsed.findIndex((p) => p.summary.gas.id !== gasId)
  if (mixed >= 0) throw bad(`runIds.${mixed}`, `All runs must be of one gas (${gasId})`)
  const gas = findGas(gasId)!

  // The set point: a limit tracked by every run, by key, or the gas's default alarm 1.
  const first = parsed[0]!.meta.limits
  const defaultPpm = defaultAlarmSetPoints(gas).find((a) => a.level === 'alarm1')?.ppm
  const limit = req.limitKey ? first.find((l) => l.key === req.limitKey) : first[limitIndexAt(first, defaultPpm ?? NaN)] ?? first[0]
  if (!limit) throw bad('limitKey', 'Not one of the limits of these runs')
  const limitIdx = parsed.map((p) => limitIndexAt(p.meta.limits, limit.ppm))
  const missing = limitIdx.findIndex((k) => k < 0)
  if (missing >= 0) throw bad(`runIds.${missing}`, `This run did not track ${limit.label}`)

  const candidates = req.candidates.length ? req.candidates : req.gridSpacingM ? gridCandidates(plan, req.gridSpacingM) : []
  if (!candidates.length) throw bad('candidates', 'Pick candidate points on the plan or give a grid spacing')
  const inside = candidates.filter(([x, y]) => plan.rooms.some((r) => pointInPolygon([x, y], r.polygon)))
  if (!inside.length) throw bad('candidates', 'No candidate point is inside a room')
  const near = awayFromSources(inside, plan.sources)
  if (!near.kept.length) throw bad('candidates', `Every candidate point is within ${SOURCE_CLEARANCE_M} m of a leak source: detectors go near the leak point, not on it (common practice). Pick points a little farther away.`)

  // times[c][s]: the stored front plane of run s at the candidate's cell.
  const times = near.kept.map(([x, y]) => parsed.map((p, s) => {
    const nPlan = p.meta.nx * p.meta.ny
    const plane = new Float32Array(p.fronts.buffer, p.fronts.byteOffset + limitIdx[s]! * nPlan * 4, nPlan)
    const t = sampleAt(p.meta, plane, x, y)
    return Number.isNaN(t) ? Infinity : t
  }))
  const choice = chooseMinMax(times, parsed.length, req.count, req.deadlineS)
  const coverage = chooseCoverage(times, parsed.length, req.count, req.deadlineS)
  const mount = mountingHeightFor(gas, floor.ceiling_height_m)
  const roomOf = (x: number, y: number) => plan.rooms.find((r) => pointInPolygon([x, y], r.polygon)) ?? null
  const alarm = defaultAlarmSetPoints(gas).find((a) => Math.abs(a.ppm - limit.ppm) <= 1e-9 * limit.ppm)
  // First hazard's pair of defaults (toxic for NH3, oxygen for N2...).
  const all = defaultAlarmSetPoints(gas)
  const hz = all[0]?.hazard
  const defaults = all.filter((a) => a.hazard === hz)
  const fin = (t: number) => (Number.isFinite(t) ? t : null)
  return {
    method: choice.method,
    guarantee: `${MINMAX_GUARANTEE[choice.method]} ${COVERAGE_GUARANTEE}`,
    limit,
    setPointBasis: alarm ? alarm.basis : `${limit.label} (${limit.source}); set points follow the site's own rules`,
    deadlineS: req.deadlineS,
    mountingHeightM: mount.heightM,
    mountingBasis: mount.basis,
    chosen: choice.chosen.map((c) => { const [x, y] = near.kept[c]!; const room = roomOf(x, y); return { position: [x, y] as [number, number], roomId: room?.id ?? null, roomName: room?.name ?? null } }),
    worstTimeS: fin(choice.worst),
    coverage: choice.covered,
    perRun: parsed.map((p, s) => ({ runId: p.run.id, label: p.run.label, timeS: fin(choice.perScenario[s]!.time), byIndex: choice.perScenario[s]!.by })),
    coverageChoice: { positions: coverage.chosen.map((c) => near.kept[c]!), covered: coverage.covered },
    candidatesEvaluated: near.kept.length,
    gasId,
    alarmLowPpm: defaults[0]?.ppm ?? limit.ppm,
    alarmHighPpm: defaults[1]?.ppm ?? defaults[0]?.ppm ?? limit.ppm,
    notes: [
      ...(bundled.length ? [`Placed for the conservative end: the sensitivity cases of ${bundled.join(', ')} count as scenarios of their own, so the worst time is the worst over them; each is listed with the nominal in the times per run.`] : []),
      ...(near.excluded ? [`${near.excluded} candidate point${near.excluded === 1 ? ' was' : 's were'} left out for lying within ${SOURCE_CLEARANCE_M} m of a leak source: common practice puts detectors near the leak point, not on it.`] : []),
      `Times are read from the stored fronts at the breathing-height plane (${parsed[0]!.meta.breathingHeightM} m) of each run, on its ${parsed[0]!.meta.cellM} m grid; they do not include the detector's own response time (T90) or sample transport.`,
      `Mounting height when accepted: ${mount.heightM} m. ${mount.basis}.`,
      'Default set points are common practice, not a code requirement: use the site\'s own set points and the authority having jurisdiction.',
    ],
  }
}

/** Adds the proposed detectors to the plan through the floors service (optimistic version: 409 if someone saved since). */
export async function acceptProposal(ctx: ServiceContext, actor: Actor, floorId: number, body: AdvisorAccept) {
  const floor = await requireVisibleFloor(ctx.db, actor, floorId)
  const gas = findGas(body.gasId)
  if (!gas) throw bad('gasId', 'Not a gas of the library')
  if (body.alarmHighPpm < body.alarmLowPpm && !gas.asphyxiant) throw bad('alarmHighPpm', 'The second alarm must not be below the first')
  const plan = Plan.parse(floor.plan)
  const ids = new Set(plan.detectors.map((d) => d.id))
  body.positions.forEach(([x, y], i) => {
    if (!plan.rooms.some((r) => pointInPolygon([x, y], r.polygon))) throw bad(`positions.${i}`, 'Not inside a room')
    let n = plan.detectors.length + 1 + i
    while (ids.has(`det-adv-${n}`)) n++
    ids.add(`det-adv-${n}`)
    plan.detectors.push({
      id: `det-adv-${n}`, name: `${gas.id} detector (advisor) ${i + 1}`, gasId: gas.id, position: [x, y],
      mountingHeightM: Math.min(body.mountingHeightM, floor.ceiling_height_m), alarmLowPpm: body.alarmLowPpm, alarmHighPpm: body.alarmHighPpm,
    })
  })
  const saved = await savePlan(ctx, actor, floorId, body.version, plan)
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'advisor.accepted', targetType: 'floor', targetId: floorId, detail: { added: body.positions.length } })
  return saved
}
