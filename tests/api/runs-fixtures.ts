import type { Runtime } from '../../server/runtime'
import { seedDemoScenario } from '../../server/jobs/demo-scenario'
import { ensureDemoSite, seedDemoFloor } from '../../server/seed/demo-floor'
import { DEMO_ACCOUNTS, DEMO_SITE_NAME } from '../../server/seed/demo-accounts'
import type { ApiAgent } from '../support/test-runtime'

export const acct = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!

/** The demo floor (with the demo lab manager and staff as its people) and the demo scenario on it. */
export async function demoFloorAndScenario(rt: Runtime) {
  const db = rt.ctx.db
  const people = await db.selectFrom('users').select(['id', 'role', 'org_id']).where('email', 'in', DEMO_ACCOUNTS.map((a) => a.email)).execute()
  const orgId = people[0]!.org_id
  const byRole = (r: string) => people.filter((p) => p.role === r).map((p) => p.id)
  const siteId = await ensureDemoSite(db, orgId, DEMO_SITE_NAME)
  const { floorId } = await seedDemoFloor(db, { orgId, siteId, labManagerIds: byRole('lab_manager'), staffIds: byRole('staff') })
  const scenarioId = (await seedDemoScenario(db, { orgId }))!
  return { orgId, floorId, scenarioId }
}

export async function waitForRun(a: ApiAgent, id: number, until: (run: { status: string; progress: number }) => boolean, timeoutMs = 60_000) {
  const t0 = Date.now()
  const seen: { status: string; progress: number }[] = []
  for (;;) {
    const run = (await a.get(`/api/runs/${id}`).expect(200)).body
    seen.push({ status: run.status, progress: run.progress })
    if (until(run)) return { run, seen }
    if (Date.now() - t0 > timeoutMs) throw new Error(`run ${id} still ${run.status} (${run.progress}) after ${timeoutMs} ms`)
    await new Promise((r) => setTimeout(r, 150))
  }
}
