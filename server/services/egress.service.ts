import { computeEgress, criticalLimitOf, type EgressOptions } from '../../shared/egress/compute'
import { Plan } from '../../shared/floorplan/plan-schema'
import type { EgressQuery, EgressResult } from '../../shared/schemas/egress'
import { SCREENING_CAUTION } from '../../shared/ui/cautions'
import { RunFieldsMeta, RunSummary } from '../../shared/schemas/runs'
import { AppError } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { findResultBinary, findResultMeta } from '../repositories/runs.repo'
import type { ServiceContext } from './context'
import { requireVisibleFloor } from './floors.service'
import { requireRun } from './runs.service'

const toFloat32 = (buf: Buffer) => new Float32Array(buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength))

/** The stored result of a run as egress input, or null when it has none (not finished, or unreadable). */
export async function egressInput(ctx: ServiceContext, runId: number) {
  const [bin, res] = await Promise.all([findResultBinary(ctx.db, runId), findResultMeta(ctx.db, runId)])
  if (!bin || !res) return null
  const meta = RunFieldsMeta.safeParse(res.meta)
  const summary = RunSummary.safeParse(res.summary)
  if (!meta.success || !summary.success) return null
  const frames = toFloat32(bin.frames as Buffer)
  if (frames.length !== meta.data.timesS.length * meta.data.nx * meta.data.ny) return null
  return { summary: summary.data, field: { meta: meta.data, frames } }
}

/** Default-assumption egress of a run for the plan rules; null when the run has no usable stored fields. */
export async function egressOfRun(ctx: ServiceContext, runId: number, plan: Plan, summary: RunSummary): Promise<EgressResult | null> {
  const input = await egressInput(ctx, runId)
  if (!input) return null
  return computeEgress({ runId, plan, summary, field: input.field })
}

/** The answer for a result without stored snapshots: no routes, and why, never a guess. */
function noFieldsEgress(runId: number, plan: Plan, summary: RunSummary): EgressResult {
  const c = criticalLimitOf(summary)
  return {
    runId, speedMS: 0, speedBasis: 'not used', startS: 0, startBasis: 'not used', criticalLimit: c ? { key: c.key, label: c.label, ppm: c.ppm } : null,
    exitIds: plan.openings.filter((o) => o.kind === 'door' && o.exit).map((o) => o.id),
    assemblyPoints: (plan.assemblyPoints ?? []).map((a) => ({ id: a.id, name: a.name, position: [a.position[0], a.position[1]] as [number, number] })),
    routes: [], limits: [], roomsReachingCriticalIds: [],
    notes: ['This result was stored without its concentration snapshots, so no route can be walked through it: re-run the scenario to get the ways out.'],
    caution: `Planning advice for drills, not live guidance during an incident. ${SCREENING_CAUTION.summary}`,
  }
}

/** Egress routes of one run over the floor as drawn now (exits may be marked after the run). */
export async function getRunEgress(ctx: ServiceContext, actor: Actor, id: number, query: EgressQuery): Promise<EgressResult> {
  const run = await requireRun(ctx, actor, id)
  if (run.status !== 'succeeded') throw new AppError(409, 'not_ready', 'This run has no result yet')
  const floor = await requireVisibleFloor(ctx.db, actor, run.floor_id)
  const plan = Plan.safeParse(floor.plan)
  if (!plan.success) throw new AppError(409, 'floor_unreadable', 'The floor plan of this run cannot be read')
  const input = await egressInput(ctx, id)
  if (!input) {
    // A finished result stored without snapshots (an imported or older result): nothing to walk through, said plainly.
    const meta = await findResultMeta(ctx.db, id)
    const summary = meta ? RunSummary.safeParse(meta.summary) : null
    if (!summary?.success) throw new AppError(409, 'not_ready', 'This run has no stored fields to walk through')
    return noFieldsEgress(id, plan.data, summary.data)
  }
  if (query.limitKey && !input.summary.limits.some((l) => l.key === query.limitKey)) {
    throw new AppError(400, 'validation_failed', 'Some fields are not valid: limitKey', { limitKey: 'Not one of the limits of this run' })
  }
  const out = computeEgress({ runId: id, plan: plan.data, summary: input.summary, field: input.field, options: query as EgressOptions })
  if (Number(floor.version) > Number(run.floor_version)) {
    out.notes.push(`The floor was changed after this run (version ${run.floor_version} → ${floor.version}): routes use the current drawing with this run's concentrations; re-run for both to match.`)
  }
  return out
}
