import fc from 'fast-check'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { planFixture } from './plans-fixtures'

// Issue 14 item 7: inputs that answered 500 (71 in the issue's fuzz run). Property-based over every route of the
// server's own OpenAPI document: path parameters, query strings and text fields; plus the reported cases, each a
// 400 naming the field. Never a 5xx.
let rt: Runtime
let admin: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>
type Op = { method: 'get' | 'post' | 'put' | 'patch' | 'delete'; path: string; query: string[]; body?: { properties?: Record<string, { type?: string | string[] }> }; contentType?: string; roles: string[] }
let ops: Op[]
const SKIP = new Set(['post /api/auth/logout', 'post /api/auth/login'])

beforeAll(async () => {
  rt = await startTestRuntime()
  fx = await planFixture(rt)
  admin = await signIn(rt, DEMO_ACCOUNTS[0]!.email, DEMO_ACCOUNTS[0]!.password)
  const doc = (await request(rt.app).get('/api/openapi.json').expect(200)).body
  ops = []
  for (const [path, byMethod] of Object.entries<Record<string, any>>(doc.paths)) {
    for (const [method, op] of Object.entries<any>(byMethod)) {
      if (SKIP.has(`${method} ${path}`)) continue
      const content = op.requestBody?.content ?? {}
      const contentType = Object.keys(content)[0]
      ops.push({ method: method as Op['method'], path, roles: op['x-roles'], contentType, body: contentType ? content[contentType].schema : undefined,
        query: (op.parameters ?? []).filter((p: { in: string }) => p.in === 'query').map((p: { name: string }) => p.name) })
    }
  }
})
afterAll(async () => {
  const total = Object.values(tally).reduce((a, b) => a + b, 0)
  console.log(`[fuzz-inputs] ${total} requests; statuses ${JSON.stringify(tally)}`)
  await rt.close()
})

const BAD_IDS = ['2147483648', '9999999999999', '99999999999999999999', '%201', '0x10', '1e3', '-1', '0', '1.5', 'abc', '%00', '%F0%9F%92%A5', '01', '+1', '1%20']
// Requests sent and statuses seen, printed at the end for the README's reliability figures.
const tally: Record<number, number> = {}
const count = <T extends { status: number }>(res: T) => { tally[res.status] = (tally[res.status] ?? 0) + 1; return res }
const send = async (op: Op, url: string) => {
  const r = admin[op.method](url)
  return count(await (op.method === 'get' || op.method === 'delete' ? r : r.set('content-type', 'application/json').send('{}')))
}
const mayCall = (op: Op) => op.roles.includes('admin') || op.roles.includes('public')

describe('path parameters on every route', () => {
  it('ids that are not plain digits, or beyond 2^31 - 1, answer 400 naming the parameter (never read leniently, never 5xx)', async () => {
    const withParams = ops.filter((o) => o.path.includes('{') && mayCall(o))
    expect(withParams.length).toBeGreaterThan(20)
    const wrong: string[] = []
    for (const op of withParams) {
      const names = [...op.path.matchAll(/\{([^}]+)\}/g)].map((m) => m[1]!)
      for (const bad of BAD_IDS) {
        for (const name of names) {
          const url = op.path.replace(/\{([^}]+)\}/g, (_m, n: string) => (n === name ? bad : '1'))
          const res = await send(op, url)
          if (res.status !== 400 || !res.body?.error?.fields?.[`params.${name}`]) wrong.push(`${op.method} ${url} → ${res.status} ${JSON.stringify(res.body?.error?.fields ?? res.body?.error?.code ?? '')}`)
        }
      }
    }
    expect(wrong.slice(0, 15)).toEqual([])
  }, 120_000)

  it('generated path values never get a 5xx (fast-check)', async () => {
    const withParams = ops.filter((o) => o.path.includes('{'))
    const failures: string[] = []
    const value = fc.oneof(fc.string({ unit: 'binary', maxLength: 12 }), fc.bigInt({ min: 2n ** 31n, max: 10n ** 20n }).map(String), fc.integer({ min: -5, max: 0 }).map(String))
    await fc.assert(fc.asyncProperty(fc.constantFrom(...withParams), value, async (op, value) => {
      // Never a real id: the database is shared with other test files (a DELETE must not hit their rows).
      const url = op.path.replace(/\{([^}]+)\}/g, () => (/^\d{1,6}$/.test(value) ? '999999' : encodeURIComponent(value) || '999999'))
      const res = await send(op, url)
      if (res.status >= 500) failures.push(`${op.method} ${url} → ${res.status}`)
      return true
    }), { numRuns: 300, seed: 20261214 })
    expect(failures.slice(0, 10)).toEqual([])
  }, 120_000)
})

describe('query strings on every route that takes them', () => {
  it('generated query values (NUL, broken surrogates, huge numbers, repeats) never get a 5xx', async () => {
    const withQuery = ops.filter((o) => o.query.length)
    expect(withQuery.length).toBeGreaterThan(1)
    // Already percent-encoded: '%ED%A0%80' is a lone surrogate as CESU-8, '%FF' not UTF-8 at all.
    const safe = (v: string) => { try { return encodeURIComponent(v) } catch { return 'x' } }
    const odd = fc.oneof(fc.constantFrom('a%00b', '%ED%A0%80', '%FF', '1e309', '-0', 'NaN', 'Infinity', '99999999999999999999', '', '%'), fc.string({ unit: 'binary', maxLength: 10 }).map(safe))
    const failures: string[] = []
    await fc.assert(fc.asyncProperty(fc.constantFrom(...withQuery), odd, fc.boolean(), async (op, value, twice) => {
      const url = op.path.replace(/\{([^}]+)\}/g, () => String(fx.floorId))
      const qs = op.query.map((n) => `${n}=${value}${twice ? `&${n}=2` : ''}`).join('&')
      const res = await send(op, `${url}?${qs}`)
      if (res.status >= 500) failures.push(`${op.method} ${url}?${qs} → ${res.status}`)
      return true
    }), { numRuns: 200, seed: 20261215 })
    expect(failures.slice(0, 10)).toEqual([])
  }, 120_000)
})

describe('text fields of every JSON body', () => {
  it('a NUL byte or a lone surrogate in any string field answers 400 naming that field', async () => {
    const wrong: string[] = []
    let tried = 0
    for (const op of ops.filter((o) => o.contentType === 'application/json' && mayCall(o))) {
      const url = op.path.replace(/\{([^}]+)\}/g, () => String(fx.floorId))
      for (const [name, prop] of Object.entries(op.body?.properties ?? {})) {
        const type = Array.isArray(prop.type) ? prop.type[0] : prop.type
        if (type !== 'string') continue
        for (const bad of ['a\u0000b', 'a\ud800b', '\udc00']) {
          tried++
          const res = count(await admin[op.method](url).set('content-type', 'application/json').send(JSON.stringify({ [name]: bad })))
          if (res.status !== 400 || !res.body?.error?.fields?.[name]) wrong.push(`${op.method} ${url} ${name}=${JSON.stringify(bad)} → ${res.status} ${JSON.stringify(res.body?.error?.fields ?? '')}`)
        }
      }
    }
    expect(tried).toBeGreaterThan(20)
    expect(wrong.slice(0, 15)).toEqual([])
  }, 120_000)

  it('nested text (a room name inside a plan, a guest inside a drill) is caught too, with its full path', async () => {
    const floor = (await admin.get(`/api/floors/${fx.floorId}`).expect(200)).body
    const plan = structuredClone(floor.plan)
    plan.rooms[1].name = 'Lab\u0000B'
    const res = await admin.put(`/api/floors/${fx.floorId}/plan`).send({ version: floor.version, plan }).expect(400)
    expect(res.body.error.fields).toHaveProperty(['plan.rooms.1.name'])
  })
})

describe('the cases the issue reported', () => {
  const BIG = 2 ** 31
  it('ids of 2^31 in bodies answer 400 naming the field', async () => {
    const floor = (await admin.get(`/api/floors/${fx.floorId}`).expect(200)).body
    const cases: [string, string, unknown, string][] = [
      ['post', '/api/plans', { floorId: BIG, runIds: [fx.runId], title: 'x' }, 'floorId'],
      ['post', '/api/plans', { floorId: fx.floorId, runIds: [BIG], title: 'x' }, 'runIds.0'],
      ['patch', `/api/floors/${fx.floorId}`, { managerIds: [BIG] }, 'managerIds.0'],
      ['put', `/api/floors/${fx.floorId}/plan`, { version: BIG, plan: floor.plan }, 'version'],
      ['post', `/api/floors/${fx.floorId}/advisor`, { runIds: [BIG], count: 1, gridSpacingM: 2 }, 'runIds.0'],
      ['post', '/api/drills', { planId: BIG, planVersion: BIG }, 'planId'],
    ]
    for (const [method, url, body, field] of cases) {
      const res = await admin[method as 'post'](url).send(body as object)
      expect(res.status, `${method} ${url}`).toBe(400)
      expect(res.body.error.fields, `${method} ${url}`).toHaveProperty([field])
    }
  })

  it('a due date in year 0 answers 400 naming dueDate', async () => {
    const res = await admin.post('/api/drills/1/findings').send({ finding: 'f', action: 'a', ownerId: 1, dueDate: '0000-01-01' })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty(['dueDate'])
  })

  it('multipart without a boundary, or cut short, answers 400 naming file', async () => {
    const url = `/api/floors/${fx.floorId}/images`
    const noBoundary = await admin.post(url).set('content-type', 'multipart/form-data').send('--x\r\nContent-Disposition: form-data; name="file"\r\n\r\nabc')
    expect(noBoundary.status).toBe(400)
    expect(noBoundary.body.error.fields).toHaveProperty(['file'])
    const cut = await admin.post(url).set('content-type', 'multipart/form-data; boundary=XYZ')
      .send('--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\nContent-Type: image/png\r\n\r\n\x89PNG\r\n\x1a\n')
    expect(cut.status).toBe(400)
    expect(cut.body.error.fields).toHaveProperty(['file'])
  })
})
