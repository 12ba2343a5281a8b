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

  it('two simultaneous PATCH /api/floors/:id from the same read: one wins, the other is 409 stale_version; without updatedAt it still saves', async () => {
    const floor = (await officer.get(`/api/floors/${fx.floorId}`).expect(200)).body
    const [a, b] = await Promise.all([
      officer.patch(`/api/floors/${fx.floorId}`).send({ name: 'Level 1 (east wing)', updatedAt: floor.updatedAt }),
      officer.patch(`/api/floors/${fx.floorId}`).send({ name: 'Level 1 (west wing)', updatedAt: floor.updatedAt }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const lost = a.status === 409 ? a : b
    expect(lost.body.error.code).toBe('stale_version')
    const now = (await officer.get(`/api/floors/${fx.floorId}`).expect(200)).body
    expect(now.name).toBe((a.status === 200 ? a : b).body.name)
    // A stale read later is refused too; a fresh one saves.
    await officer.patch(`/api/floors/${fx.floorId}`).send({ ceilingHeightM: 3.2, updatedAt: floor.updatedAt }).expect(409)
    await officer.patch(`/api/floors/${fx.floorId}`).send({ ceilingHeightM: 3.2, updatedAt: now.updatedAt }).expect(200)
    await officer.patch(`/api/floors/${fx.floorId}`).send({ name: 'Level 1' }).expect(200)
    await officer.patch(`/api/floors/${fx.floorId}`).send({ updatedAt: 'yesterday' }).expect(400)
  })
})
