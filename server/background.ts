import { startRunWorkers } from './jobs/runs-worker'
import type { Runtime } from './runtime'
import { startDrillReminders } from './services/drill-notices.service'
import { startPlanUpdates } from './services/plan-updates.service'
import { startWeeklyDigest } from './services/stale-digest.service'
import { sweepCodeVersions } from './services/staleness.service'

/** Background services that run beside HTTP in the server process (job workers, schedulers). */
export const BACKGROUND: ((rt: Runtime) => Promise<void>)[] = []

// Engine runs (issue 5): config.inProcessWorkers threads in this process; 0 leaves the queue to `npm run worker`.
BACKGROUND.push(async (rt) => {
  if (rt.ctx.config.inProcessWorkers <= 0) return
  const workers = await startRunWorkers(rt.ctx.db, rt.ctx.jobs, { concurrency: rt.ctx.config.inProcessWorkers, name: 'in-process' })
  rt.onClose(() => workers.stop())
})

// Drill reminders (issue 7): a pg-boss tick every minute sends the reminders that are due.
BACKGROUND.push(startDrillReminders)

// Stale plans (issue 17): a new engine or gas library arrives with a deployment, so look once at start-up;
// "bring up to date" requests are finished by their own queue.
BACKGROUND.push(async (rt) => { await sweepCodeVersions(rt.ctx.db).catch((e) => console.warn('[staleness]', (e as Error).message)) })
BACKGROUND.push(startPlanUpdates)
// Weekly digest to officers (issue 17): stale plans and missing or old acknowledgments, Mondays 06:00 UTC.
BACKGROUND.push(startWeeklyDigest)

export async function startBackground(rt: Runtime) {
  for (const start of BACKGROUND) await start(rt)
}
