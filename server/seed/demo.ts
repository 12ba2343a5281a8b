import type { Config } from '../config'
import type { Db } from '../db/database'
import { findOrgByName, insertOrg } from '../repositories/orgs.repo'
import { findUserByEmail, insertUser } from '../repositories/users.repo'
import { hashPassword } from '../services/passwords'
import { DEMO_ACCOUNTS, DEMO_ORG_NAME, DEMO_SITE_NAME } from './demo-accounts'
import { ensureDemoSite, seedDemoFloor } from './demo-floor'
import { seedDemoScenario } from '../jobs/demo-scenario'

export interface DemoSeed {
  orgId: number
  userIds: Record<string, number>
}

/** Idempotent: running it again finds what exists and adds only what is missing. */
export async function seedDemo(db: Db, config: Config): Promise<DemoSeed> {
  const org = (await findOrgByName(db, DEMO_ORG_NAME)) ?? (await insertOrg(db, DEMO_ORG_NAME))
  const userIds: Record<string, number> = {}
  for (const a of DEMO_ACCOUNTS) {
    const existing = await findUserByEmail(db, a.email)
    const user =
      existing ??
      (await insertUser(db, { orgId: org.id, email: a.email, name: a.name, role: a.role, status: 'active', passwordHash: await hashPassword(a.password, config.argon2) }))
    userIds[a.role] = user.id
  }
  for (const step of DEMO_STEPS) await step(db, { orgId: org.id, userIds })
  return { orgId: org.id, userIds }
}

/** Features add their own idempotent demo data (sites, floors, scenarios) here. */
export const DEMO_STEPS: ((db: Db, seed: DemoSeed) => Promise<void>)[] = []

// Floor editor: the demo site and its floor, with the lab manager and staff member on it.
DEMO_STEPS.push(async (db, seed) => {
  const siteId = await ensureDemoSite(db, seed.orgId, DEMO_SITE_NAME)
  await seedDemoFloor(db, { orgId: seed.orgId, siteId, labManagerIds: [seed.userIds.lab_manager!], staffIds: [seed.userIds.staff!] })
})

// Runs and results (issue 5): the demo scenario on the demo floor (not run at seed time).
DEMO_STEPS.push(async (db, seed) => { await seedDemoScenario(db, seed) })
