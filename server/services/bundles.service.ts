import { bundleBand, frontsBand } from '../../shared/runs/bundle'
import type { RunBundle } from '../../shared/schemas/bundles'
import { RunFieldsMeta, RunSummary } from '../../shared/schemas/runs'
import { SCREENING_CAUTION } from '../../shared/ui/cautions'
import type { Actor } from '../domain/actor'
import { bundleMembers, nominalOf, runTiming } from '../repositories/bundles.repo'
import { AppError } from '../domain/errors'
import { findResultFronts, findResultMeta } from '../repositories/runs.repo'
import type { ServiceContext } from './context'
import { requireRun } from './runs.service'

const seconds = (a: Date | null, b: Date | null) => (a && b ? Math.max(0, (new Date(b).getTime() - new Date(a).getTime()) / 1000) : null)
const DONE = ['succeeded', 'failed', 'cancelled']

/**
 * A run's sensitivity bundle: its cases, the band of every time to a limit over the finished ones (nominal, earliest,
 * latest, the case driving the earliest), peaks with their range, and the cost against the nominal run alone.
 * Asked of a member, it answers for the member's nominal run. A run without cases is a bundle of one.
 */
export async function getRunBundle(ctx: ServiceContext, actor: Actor, id: number): Promise<RunBundle> {
  await requireRun(ctx, actor, id)
  const nominalId = (await nominalOf(ctx.db, actor.orgId, id))?.nominal_run_id ?? id
  const nominal = await requireRun(ctx, actor, nominalId)
  const [members, nominalRes, timing] = await Promise.all([bundleMembers(ctx.db, actor.orgId, nominalId), findResultMeta(ctx.db, nominalId), runTiming(ctx.db, nominalId)])
  const nominalS = seconds(timing?.started_at ?? null, timing?.finished_at ?? null)
  const cases = [
    { key: 'nominal', label: 'Nominal (the scenario as saved)', runId: nominalId, status: nominal.status, message: nominal.message, computeS: nominalS },
    ...members.map((m) => ({ key: m.case_key, label: m.case_label, runId: m.run_id, status: m.status, message: m.message, computeS: seconds(m.started_at, m.finished_at) })),
  ]
  const summaries = [
    ...(nominalRes ? [{ key: 'nominal', summary: RunSummary.parse(nominalRes.summary) }] : []),
    ...members.flatMap((m) => {
      const s = m.status === 'succeeded' ? RunSummary.safeParse(m.summary) : null
      return s?.success ? [{ key: m.case_key, summary: s.data }] : []
    }),
  ]
  const { rows, peaks } = nominalRes ? bundleBand(summaries) : { rows: [], peaks: [] }
  const complete = cases.every((c) => DONE.includes(c.status))
  const times = cases.map((c) => c.computeS)
  const computeS = complete && times.every((t) => t !== null) ? times.reduce((a, t) => a! + t!, 0)! : null
  const n = cases.length
  const costText = n === 1
    ? 'A single run: the sensitivity cases are off for this scenario (turn them on in its settings to get a band).'
    : computeS !== null && nominalS
      ? `${n} runs (the nominal and ${n - 1} sensitivity cases): ${computeS.toFixed(1)} s of worker time against ${nominalS.toFixed(1)} s for the nominal alone (×${(computeS / nominalS).toFixed(1)}); the cases run in parallel on as many workers as there are.`
      : `${n} runs (the nominal and ${n - 1} sensitivity cases), about ${n} times the worker time of the nominal alone; the cases run in parallel on as many workers as there are.`
  const notes: string[] = []
  const failed = cases.filter((c) => c.status === 'failed' || c.status === 'cancelled')
  if (failed.length) notes.push(`Left out of the band (${failed.map((c) => `${c.label}: ${c.status}`).join('; ')}): the band is narrower than it should be.`)
  if (!complete) notes.push('Some cases are still running: the band so far covers the finished ones only.')
  return {
    nominalRunId: nominalId, cases, complete, band: rows, peaks,
    cost: { runs: n, computeS, nominalS, text: costText }, notes,
    caution: `Each case is a screening estimate; the band shows how much the answer depends on the inputs least known, not a bound on reality. ${SCREENING_CAUTION.summary}`,
  }
}

/**
 * The fronts of a bundle for one limit as three Float32 planes (nx·ny each): the nominal, the earliest and the latest
 * first-crossing time over the finished cases. Every case shares the nominal's grid (only D, ventilation or the leak
 * position differ), so the planes line up cell for cell.
 */
export async function getBundleFronts(ctx: ServiceContext, actor: Actor, id: number, limitKey: string): Promise<{ bytes: Buffer; cases: number }> {
  await requireRun(ctx, actor, id)
  const nominalId = (await nominalOf(ctx.db, actor.orgId, id))?.nominal_run_id ?? id
  const members = await bundleMembers(ctx.db, actor.orgId, nominalId)
  const ids = [nominalId, ...members.filter((m) => m.status === 'succeeded').map((m) => m.run_id)]
  const rows = await findResultFronts(ctx.db, ids)
  const nominal = rows.find((r) => r.run_id === nominalId)
  if (!nominal) throw new AppError(409, 'not_ready', 'This run has no result yet')
  const meta = RunFieldsMeta.parse(nominal.meta)
  const k = meta.limits.findIndex((l) => l.key === limitKey)
  if (k < 0) throw new AppError(400, 'validation_failed', 'Some fields are not valid: limitKey', { limitKey: 'Not one of the limits of this run' })
  const nPlan = meta.nx * meta.ny
  const planeOf = (r: (typeof rows)[number]) => {
    const m = RunFieldsMeta.parse(r.meta)
    const j = m.limits.findIndex((l) => l.key === limitKey)
    if (m.nx !== meta.nx || m.ny !== meta.ny || j < 0) return null
    const buf = r.fronts as Buffer
    return new Float32Array(buf.buffer.slice(buf.byteOffset + j * nPlan * 4, buf.byteOffset + (j + 1) * nPlan * 4))
  }
  const planes = rows.map(planeOf).filter((p): p is Float32Array => p !== null)
  const { earliest, latest } = frontsBand(planes)
  const body = Buffer.concat([planeOf(nominal)!, earliest, latest].map((a) => Buffer.from(a.buffer, a.byteOffset, a.byteLength)))
  return { bytes: body, cases: planes.length }
}
