import type { Worker } from 'node:worker_threads'
import { checkPlan, type PlanProblem } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import type { Plan } from '../../shared/floorplan/plan-schema'
import { startWorker } from '../engine-thread/start-worker'
import { AppError } from '../domain/errors'

/**
 * Plan checks that cannot stall other requests (issue 14). Small plans (nearly all) are checked inline, which takes
 * well under a millisecond; bigger ones go to one long-lived worker thread, one at a time, so the event loop keeps
 * answering. A check that takes longer than PLAN_CHECK_TIMEOUT_MS is stopped and the save refused with 422.
 */
export const INLINE_CORNERS = 600
export const PLAN_CHECK_TIMEOUT_MS = 20_000

let worker: Worker | null = null
let nextId = 1
const waiting = new Map<number, { resolve(p: PlanProblem[]): void; reject(e: Error): void }>()
let queue: Promise<unknown> = Promise.resolve()

function thread(): Worker {
  if (worker) return worker
  const w = startWorker('./plan-checks.worker', import.meta.url)
  w.unref()
  w.on('message', (m: { id: number; problems?: PlanProblem[]; error?: string }) => {
    const p = waiting.get(m.id)
    waiting.delete(m.id)
    if (m.error !== undefined) p?.reject(new Error(m.error)); else p?.resolve(m.problems!)
  })
  const lost = (why: string) => {
    if (worker === w) worker = null
    for (const [id, p] of waiting) { waiting.delete(id); p.reject(new Error(why)) }
  }
  w.on('error', (e) => lost(e.message))
  w.on('exit', (code) => lost(`plan checks thread exited (${code})`))
  worker = w
  return w
}

const corners = (plan: Plan) => plan.rooms.reduce((n, r) => n + r.polygon.length, 0)
const itemCount = (plan: Plan) => plan.openings.length + plan.sources.length + plan.detectors.length + plan.exhausts.length + plan.workstations.length

function offThread(plan: Plan, ceilingM: number): Promise<PlanProblem[]> {
  const run = () => new Promise<PlanProblem[]>((resolve, reject) => {
    const id = nextId++
    const w = thread()
    const timer = setTimeout(() => {
      waiting.delete(id)
      void w.terminate()
      reject(new AppError(422, 'plan_too_complex', 'This plan is too complex to check: draw rooms with fewer corners or split the floor', { plan: 'Too complex to check in time' }))
    }, PLAN_CHECK_TIMEOUT_MS)
    waiting.set(id, { resolve: (p) => { clearTimeout(timer); resolve(p) }, reject: (e) => { clearTimeout(timer); reject(e) } })
    w.postMessage({ id, plan, ceilingM })
  })
  // One at a time: a second big plan waits for the first instead of competing for the same thread.
  const p = queue.then(run, run)
  queue = p.catch(() => undefined)
  return p
}

export async function checkPlanSafely(plan: Plan, ceilingM: number): Promise<PlanProblem[]> {
  if (corners(plan) <= INLINE_CORNERS && plan.rooms.length <= 60 && itemCount(plan) <= 400) {
    return checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM })
  }
  return offThread(plan, ceilingM)
}
