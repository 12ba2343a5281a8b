import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, planFixture } from './plans-fixtures'

// Issue 14 item 4: racing writes. Unique-key races answer 409 (never a 500), and the floor's own fields can be
// saved with the version they were read at (409 stale_version with the current version when someone saved since).
let rt: Runtime
let officer: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>

beforeAll(async () => {
  rt = await startTestRuntime()
  fx = await planFixture(rt)
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

describe('racing writes', () => {
  it('six parallel draft saves right after a publish: one new draft, the others 200 or 409, none 500', async () => {
    const plan = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Race plan' }).expect(201)).body
    await officer.post(`/api/plans/${plan.id}/publish`).send({}).expect(200)
    const content = (await officer.get(`/api/plans/${plan.id}`).expect(200)).body
    const body = content.current.content
    expect(body).toBeTruthy()
    const statuses = (await Promise.all(Array.from({ length: 6 }, (_, i) => officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...body, title: `Race plan, edit ${i}` } })))).map((r) => r.status)
    expect(statuses.filter((s) => s !== 200 && s !== 409)).toEqual([])
    expect(statuses).toContain(200)
  })
})
