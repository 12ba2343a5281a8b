import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { documentedRoutes, fillPath, type OpenApiRoute } from '../support/openapi-routes'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'

/**
 * Property-based: every route that takes a JSON body, fed generated invalid bodies by a signed-in admin,
 * answers 4xx in the one error shape and never 500. Valid-looking bodies are avoided by giving every
 * declared property a value of the wrong type.
 */
const SKIP = new Set(['post /api/auth/logout', 'post /api/auth/login', 'post /api/auth/forgot-password'])

let rt: Runtime
let admin: ApiAgent
let routes: OpenApiRoute[]
beforeAll(async () => {
  rt = await startTestRuntime()
  admin = await signIn(rt, DEMO_ACCOUNTS[0]!.email, DEMO_ACCOUNTS[0]!.password)
  routes = (await documentedRoutes(rt)).filter((r) => r.bodySchema && r.contentType === 'application/json' && !SKIP.has(`${r.method} ${r.path}`))
})
afterAll(() => rt.close())

const wrongFor = (type: string | string[] | undefined): fc.Arbitrary<unknown> => {
  const t = Array.isArray(type) ? type[0] : type
  switch (t) {
    case 'string': return fc.oneof(fc.integer(), fc.boolean(), fc.constant(null), fc.array(fc.integer(), { maxLength: 3 }))
    case 'number': case 'integer': return fc.oneof(fc.string({ maxLength: 20 }), fc.constant(null), fc.constant(-1e308), fc.boolean())
    case 'boolean': return fc.oneof(fc.string({ maxLength: 5 }), fc.integer())
    case 'array': return fc.oneof(fc.string(), fc.integer(), fc.dictionary(fc.string({ maxLength: 5 }), fc.integer(), { maxKeys: 3 }))
    case 'object': return fc.oneof(fc.string(), fc.integer(), fc.array(fc.integer(), { maxLength: 3 }))
    default: return fc.oneof(fc.string({ maxLength: 8 }), fc.integer(), fc.constant(null))
  }
}

const invalidBody = (r: OpenApiRoute): fc.Arbitrary<unknown> => {
  const props = r.bodySchema?.properties ?? {}
  const names = Object.keys(props)
  const wrongTyped = names.length
    ? fc.record(Object.fromEntries(names.map((n) => [n, wrongFor(props[n]!.type)])), { requiredKeys: [names[0]!] })
    : fc.constant({ unexpected: 1 })
  return fc.oneof(wrongTyped, fc.anything({ maxDepth: 2 }).filter((v) => typeof v !== 'object' || v === null || Array.isArray(v)))
}

describe('generated invalid bodies on every JSON route', () => {
  it('never get a 5xx; 400s name what is wrong', async () => {
    expect(routes.length).toBeGreaterThan(3)
    const failures: string[] = []
    for (const r of routes) {
      await fc.assert(
        fc.asyncProperty(invalidBody(r), async (body) => {
          const res = await admin[r.method as 'post'](fillPath(r.path)).set('content-type', 'application/json').send(JSON.stringify(body))
          if (res.status >= 500 || res.status < 400) failures.push(`${r.method} ${r.path} ${JSON.stringify(body)} → ${res.status}`)
          if (res.status === 400 && !(res.body?.error?.fields || res.body?.error?.message)) failures.push(`${r.method} ${r.path} 400 without a reason`)
          return true
        }),
        { numRuns: 12, seed: 20261201 },
      )
    }
    expect(failures.slice(0, 20)).toEqual([])
  })

  it('bodies that are too large get 413', async () => {
    const big = JSON.stringify({ name: 'x'.repeat(3 * 1024 * 1024) })
    const res = await admin.post('/api/users/invitations').set('content-type', 'application/json').send(big)
    expect(res.status).toBe(413)
  })
})
