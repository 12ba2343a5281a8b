import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import type { Runtime } from '../../server/runtime'
import { insertFloor, replaceFloorMembers } from '../../server/repositories/floors.repo'
import { insertResultOnce, insertRun } from '../../server/repositories/runs.repo'
import { insertSite } from '../../server/repositories/sites.repo'
import { insertUser } from '../../server/repositories/users.repo'
import { hashPassword } from '../../server/services/passwords'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { sql } from 'kysely'
import { ENGINE_VERSION } from '../../shared/engine-version'
import { fixtureFloor, fixtureSummary } from '../unit/plans-fixtures'
import type { RunSummary } from '../../shared/schemas/runs'

export const acct = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!
export const EXTRA_PASSWORD = 'plan-tests-pass-1'

let n = 0
/**
 * A floor drawn from the hand-made fixture, its lab managers (the demo one plus a second), a lab manager of
 * another floor, the demo staff as a member, and one finished run whose stored result is the fixture summary.
 */
export async function planFixture(rt: Runtime) {
  const db = rt.ctx.db
  const k = `${Date.now()}-${++n}`
  const demo = await db.selectFrom('users').select(['id', 'role', 'org_id', 'email']).where('email', 'in', DEMO_ACCOUNTS.map((a) => a.email)).execute()
  const orgId = demo[0]!.org_id
  const id = (role: string) => demo.find((u) => u.role === role)!.id
  const hash = await hashPassword(EXTRA_PASSWORD, rt.ctx.config.argon2)
  const mk = async (name: string, role: 'lab_manager' | 'staff') => {
    const email = `${role}.${k}.${name.replace(/[^a-z]/gi, "").toLowerCase()}@calder-ridge.example`
    const u = await insertUser(db, { orgId, email, name, role, status: 'active', passwordHash: hash })
    return { id: u.id, email }
  }
  const manager2 = await mk('Ana <i>Second</i> Manager', 'lab_manager')
  const otherManager = await mk('Olu Otherfloor', 'lab_manager')
  const site = await insertSite(db, { orgId, name: `Plan test site ${k}`, address: '' })
  const plan = fixtureFloor()
  const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
  const floor = await insertFloor(db, { orgId, siteId: site.id, name: `Level 1 ${k}`, ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: null })
  await replaceFloorMembers(db, floor.id, 'manager', [id('lab_manager'), manager2.id])
  await replaceFloorMembers(db, floor.id, 'member', [id('staff')])
  const floor2 = await insertFloor(db, { orgId, siteId: site.id, name: `Level 2 ${k}`, ceilingHeightM: 3, plan, planValid: true, problems: [], userId: null })
  await replaceFloorMembers(db, floor2.id, 'manager', [otherManager.id])

  const run = await insertFinishedRun(rt, { orgId, floorId: floor.id, userId: id('ehs_officer'), label: 'NH3 cylinder, normal ventilation', summary: fixtureSummary() })
  return { orgId, floorId: floor.id, floor2Id: floor2.id, runId: run.id, officerId: id('ehs_officer'), manager2, otherManager, staffId: id('staff'), managerId: id('lab_manager') }
}

/**
 * A finished run of a floor whose stored result is `summary`, with simple synthetic fronts (arrival time
 * grows 10 s per metre from the cylinder; 14 s for STEL, 30 s for IDLH).
 */
export async function insertFinishedRun(rt: Runtime, r: { orgId: number; floorId: number; userId: number; label: string; summary: RunSummary }) {
  const db = rt.ctx.db
  // The scenario settings such a run would have had (the result below is what matters to the tests).
  const config = {
    name: r.label, sourceIds: r.summary.sources.map((x) => x.id), release: 'blowdown', durationS: r.summary.durationS, outputIntervalS: r.summary.outputIntervalS,
    ventilationState: r.summary.ventilationState, proppedOpeningIds: [], cellM: 0.5, layers: 6,
  }
  const run = await insertRun(db, { orgId: r.orgId, floorId: r.floorId, scenarioId: null, batchId: null, label: r.label, config, floorVersion: 1, userId: r.userId })
  const nx = 20, ny = 12, cellM = 0.5
  const limits = r.summary.limits
  const fronts = new Float32Array(limits.length * nx * ny)
  limits.forEach((l, li) => {
    const factor = l.key === 'idlh' ? 30 : l.key === 'rel_stel' ? 14 : 10
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const d = Math.hypot((i + 0.5) * cellM - 1, (j + 0.5) * cellM - 1)
      fronts[li * nx * ny + i + nx * j] = d * factor
    }
  })
  const meta = { nx, ny, cellM, originM: [0, 0], breathingHeightM: 1.5, timesS: [0, 600], limits, roomIds: ['A', 'B', 'C'] }
  await insertResultOnce(db, { runId: run.id, summary: r.summary, meta, series: { timesS: [], series: {} }, frames: Buffer.alloc(0), fronts: Buffer.from(fronts.buffer), peak: Buffer.alloc(0) })
  // Computed "now": by the engine version in force, as the worker records it (an engine bump must not mark fixture plans).
  await sql`update run_results set engine_version = ${ENGINE_VERSION} where run_id = ${run.id}`.execute(db)
  await sql`update runs set status = 'succeeded', finished_at = now(), progress = 1 where id = ${run.id}`.execute(db)
  return run
}
