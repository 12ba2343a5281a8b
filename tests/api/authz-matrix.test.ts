import { sql } from 'kysely'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ROLES } from '../../shared/schemas/common'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { documentedRoutes, fillPath, type OpenApiRoute } from '../support/openapi-routes'
import { apiAgent, createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'

// Routes whose side effects would end the caller's session or need a one-time link; covered in auth.test.ts.
const SKIP = new Set(['post /api/auth/logout'])
const ROLE_GATE = /Your role does not allow this/

let rt: Runtime
let routes: OpenApiRoute[]
const agents: Record<string, ApiAgent> = {}
let otherAdmin: ApiAgent

beforeAll(async () => {
  rt = await startTestRuntime()
  routes = (await documentedRoutes(rt)).filter((r) => !SKIP.has(`${r.method} ${r.path}`))
  for (const a of DEMO_ACCOUNTS) agents[a.role] = await signIn(rt, a.email, a.password)
  agents.anonymous = await apiAgent(rt)
  const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
  otherAdmin = await signIn(rt, other.users.admin.email, other.password)
})
afterAll(() => rt.close())

const send = (a: ApiAgent, r: OpenApiRoute, url: string) => {
  const req = a[r.method](url)
  return r.method === 'get' || r.method === 'delete' ? req : req.send({})
}

describe('authorization matrix over every documented route', () => {
  it('lists routes with their roles', () => {
    expect(routes.length).toBeGreaterThan(10)
    for (const r of routes) expect(r.roles.length, `${r.method} ${r.path}`).toBeGreaterThan(0)
  })

  it('each role gets exactly what x-roles grants: 401 anonymous, 403 from the role gate, never the gate when granted', async () => {
    const problems: string[] = []
    for (const r of routes) {
      if (r.roles.includes('public')) continue
      const url = fillPath(r.path)
      const anon = await send(agents.anonymous!, r, url)
      if (anon.status !== 401) problems.push(`${r.method} ${r.path} anonymous → ${anon.status}`)
      for (const role of ROLES) {
        const res = await send(agents[role]!, r, url)
        const gated = res.status === 403 && ROLE_GATE.test(res.body?.error?.message ?? '')
        const granted = r.roles.includes(role)
        if (granted && (gated || res.status === 401)) problems.push(`${r.method} ${r.path} ${role} granted but got ${res.status}`)
        if (!granted && !gated) problems.push(`${r.method} ${r.path} ${role} not granted but got ${res.status}`)
        if (res.status >= 500) problems.push(`${r.method} ${r.path} ${role} → ${res.status}`)
      }
    }
    expect(problems).toEqual([])
  })

  it("a user of another organization gets 404 for this organization's records", async () => {
    const demoOrg = (await agents.admin!.get('/api/auth/me')).body.orgId as number
    // Path segment → table; only tables scoped by org_id are probed generically.
    const tables = (await sql<{ table_name: string }>`select table_name from information_schema.columns where column_name = 'org_id' and table_schema = 'public'`.execute(rt.ctx.db)).rows.map((r) => r.table_name)
    const checked: string[] = []
    const problems: string[] = []
    for (const r of routes) {
      if (r.method !== 'get' || r.roles.includes('public')) continue
      const m = r.path.match(/^\/api\/([a-z-]+)\/\{id\}(\/[a-z-]+)?$/)
      if (!m) continue
      const table = m[1]!.replace(/-/g, '_')
      if (!tables.includes(table)) continue
      const row = (await sql<{ id: number }>`select id from ${sql.table(table)} where org_id = ${demoOrg} order by id limit 1`.execute(rt.ctx.db)).rows[0]
      if (!row) continue
      const url = fillPath(r.path, { id: row.id })
      const mine = await agents.admin!.get(url)
      if (mine.status !== 200) continue
      const theirs = await otherAdmin.get(url)
      checked.push(url)
      if (theirs.status !== 404) problems.push(`${url} other org → ${theirs.status}`)
      if (JSON.stringify(theirs.body).includes('calder-ridge')) problems.push(`${url} leaks data`)
    }
    expect(problems).toEqual([])
    expect(checked.length).toBeGreaterThanOrEqual(0)
  })
})
