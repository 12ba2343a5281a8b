import { inject } from 'vitest'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent'
import { CookieAccessInfo } from 'cookiejar'
import { CSRF_COOKIE, CSRF_HEADER } from '../../shared/contract/csrf'
import { loadConfig, type Config } from '../../server/config'
import { startRuntime, type Runtime } from '../../server/runtime'
import { seedDemo } from '../../server/seed/demo'
import { startBackground } from '../../server/background'
import type { Db } from '../../server/db/database'
import { insertOrg } from '../../server/repositories/orgs.repo'
import { insertUser } from '../../server/repositories/users.repo'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import { hashPassword } from '../../server/services/passwords'
import type { Role } from '../../shared/schemas/common'

/** Settings for tests: cheap argon2id, a fake SMTP server on a free port, no listening HTTP unless asked. */
export function testConfig(over: Partial<Config> = {}): Config {
  return {
    ...loadConfig({}),
    fakeSmtpPort: 0,
    port: 0,
    argon2: { memoryCost: 4096, timeCost: 1 },
    publicUrl: 'http://127.0.0.1:9',
    ...over,
  }
}

export const databaseUrl = () => inject('databaseUrl')

/** A full server runtime on the test database; pass { background: true } to start job workers too. */
export async function startTestRuntime(over: Partial<Config> = {}, opts: { clientDir?: string | null; background?: boolean; seed?: boolean } = {}): Promise<Runtime> {
  const config = testConfig(over)
  const rt = await startRuntime(config, databaseUrl(), { clientDir: opts.clientDir ?? null })
  if (opts.seed !== false) await seedDemo(rt.ctx.db, config)
  if (opts.background) await startBackground(rt)
  return rt
}

/** A supertest agent that keeps cookies and sends the CSRF header on every write. */
export async function apiAgent(rt: Runtime) {
  const agent = request.agent(rt.app)
  const res = await agent.get('/api/auth/csrf').expect(200)
  const token = res.body.csrfToken as string
  return withCsrf(agent, token)
}

export type ApiAgent = ReturnType<typeof withCsrf>

function withCsrf(agent: TestAgent, first: string) {
  // The token rotates at sign-in (issue 14): send the one the cookie holds now, as the client does.
  const jar = (agent as unknown as { jar: { getCookie(name: string, access: unknown): { value: string } | undefined } }).jar
  const token = () => { const c = jar.getCookie(CSRF_COOKIE, CookieAccessInfo.All); return c ? decodeURIComponent(c.value) : first }
  return {
    raw: agent,
    get token() { return token() },
    get: (url: string) => agent.get(url),
    post: (url: string) => agent.post(url).set(CSRF_HEADER, token()),
    put: (url: string) => agent.put(url).set(CSRF_HEADER, token()),
    patch: (url: string) => agent.patch(url).set(CSRF_HEADER, token()),
    delete: (url: string) => agent.delete(url).set(CSRF_HEADER, token()),
  }
}

export async function signIn(rt: Runtime, email: string, password: string) {
  const a = await apiAgent(rt)
  await a.post('/api/auth/login').send({ email, password }).expect(200)
  return a
}

let orgCounter = 0
/** Another organization with one user per role, for isolation tests. Password for all: "other-org-pass-1". */
export async function createOtherOrg(db: Db, config: Config) {
  const org = await insertOrg(db, `Other Org ${Date.now()}-${++orgCounter}`)
  const hash = await hashPassword('other-org-pass-1', config.argon2)
  const users: Record<Role, { id: number; email: string }> = {} as never
  for (const role of ['admin', 'ehs_officer', 'lab_manager', 'staff'] as const) {
    const email = `${role}.${org.id}@other-org.example`
    const u = await insertUser(db, { orgId: org.id, email, name: `${role} of ${org.name}`, role, status: 'active', passwordHash: hash })
    users[role] = { id: u.id, email }
  }
  return { orgId: org.id, users, password: 'other-org-pass-1' }
}

/** Polls the fake SMTP store for a message to `to` whose subject matches. */
export async function waitForMail(db: Db, to: string, subject: RegExp, timeoutMs = 15_000) {
  const t0 = Date.now()
  for (;;) {
    const rows = await listCapturedTo(db, to)
    const hit = rows.find((r) => subject.test(r.subject))
    if (hit) return hit
    if (Date.now() - t0 > timeoutMs) throw new Error(`No mail to ${to} matching ${subject} within ${timeoutMs} ms`)
    await new Promise((r) => setTimeout(r, 200))
  }
}

/** The first link in a captured message's text that contains `path`. */
export function linkFrom(text: string, path: string): string {
  const m = text.match(new RegExp(`https?://\\S*${path.replace(/[/?]/g, (c) => `\\${c}`)}\\S*`))
  if (!m) throw new Error(`No ${path} link in: ${text}`)
  return m[0]
}
