import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, planFixture } from './plans-fixtures'

// Issue 14 item 4, the rest: PUT /api/scenarios/:id and PUT /api/plans/:id/draft take the updatedAt the client read.
// Of two saves from the same read one wins and the other is 409 stale_version saying what to do; without updatedAt
// a save goes through as before.
let rt: Runtime
let officer: ApiAgent
let admin: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>

const scenarioBody = (name: string, over: Record<string, unknown> = {}) =>
  ({ name, sourceIds: ['cyl'], release: 'blowdown', durationS: 60, outputIntervalS: 10, ventilationState: 'normal', cellM: 0.5, layers: 3, ...over })

beforeAll(async () => {
  rt = await startTestRuntime()
  fx = await planFixture(rt)
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
  admin = await signIn(rt, acct('admin').email, acct('admin').password)
})
afterAll(() => rt.close())

describe('scenario saves with the version read', () => {
  it('two racing PUT /api/scenarios/:id from one read: one 200, one 409 stale_version naming the changed setting; stale reads refused, fresh and version-less saves pass', async () => {
    const created = (await officer.post(`/api/floors/${fx.floorId}/scenarios`).send(scenarioBody('Versioned cylinder')).expect(201)).body
    const read = (await officer.get(`/api/scenarios/${created.id}`).expect(200)).body
    const [a, b] = await Promise.all([
      officer.put(`/api/scenarios/${created.id}`).send({ ...scenarioBody('Versioned cylinder', { durationS: 120 }), updatedAt: read.updatedAt }),
      admin.put(`/api/scenarios/${created.id}`).send({ ...scenarioBody('Versioned cylinder', { durationS: 300 }), updatedAt: read.updatedAt }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const won = a.status === 200 ? a : b
    const lost = a.status === 409 ? a : b
    expect(lost.body.error.code).toBe('stale_version')
    expect(lost.body.error.message).toMatch(/reload/i)
    expect(lost.body.error.message).toContain('durationS')
    const now = (await officer.get(`/api/scenarios/${created.id}`).expect(200)).body
    expect(now.config.durationS).toBe(won.body.config.durationS)
    expect(now.updatedAt).not.toBe(read.updatedAt)

    // A stale read later is refused too and leaves the saved settings; a fresh read saves.
    await officer.put(`/api/scenarios/${created.id}`).send({ ...scenarioBody('Versioned cylinder', { durationS: 600 }), updatedAt: read.updatedAt }).expect(409)
    expect((await officer.get(`/api/scenarios/${created.id}`).expect(200)).body.config.durationS).toBe(won.body.config.durationS)
    const fresh = await officer.put(`/api/scenarios/${created.id}`).send({ ...scenarioBody('Versioned cylinder', { durationS: 600 }), updatedAt: now.updatedAt }).expect(200)
    expect(fresh.body.config.durationS).toBe(600)
    // The version is not stored as a setting.
    expect(fresh.body.config).not.toHaveProperty('updatedAt')
    // Without updatedAt: last write as before.
    await officer.put(`/api/scenarios/${created.id}`).send(scenarioBody('Versioned cylinder', { durationS: 90 })).expect(200)
    const bad = await officer.put(`/api/scenarios/${created.id}`).send({ ...scenarioBody('Versioned cylinder'), updatedAt: 'yesterday' }).expect(400)
    expect(bad.body.error.fields).toHaveProperty('updatedAt')
  })
})

describe('plan draft saves with the version read', () => {
  const versionOf = (plan: { current: { version: number }; versions: { version: number; updatedAt: string }[] }) =>
    plan.versions.find((v) => v.version === plan.current.version)!.updatedAt

  it('two racing PUT /api/plans/:id/draft from one read: one 200, one 409 stale_version saying who saved and to reload; version-less saves pass', async () => {
    const plan = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Versioned plan' }).expect(201)).body
    const read = (await officer.get(`/api/plans/${plan.id}`).expect(200)).body
    const seen = versionOf(read)
    const content = read.current.content
    const [a, b] = await Promise.all([
      officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'Versioned plan (officer)' }, updatedAt: seen }),
      admin.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'Versioned plan (admin)' }, updatedAt: seen }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const won = a.status === 200 ? a : b
    const lost = a.status === 409 ? a : b
    expect(lost.body.error.code).toBe('stale_version')
    expect(lost.body.error.message).toMatch(/reload/i)
    expect(lost.body.error.message).toContain(a.status === 200 ? acct('ehs_officer').name : acct('admin').name)
    const now = (await officer.get(`/api/plans/${plan.id}`).expect(200)).body
    expect(now.current.content.title).toBe(won.body.current.content.title)

    // A save from the read before is still refused; from the fresh read it passes.
    await officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'Late' }, updatedAt: seen }).expect(409)
    const saved = (await officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'Fresh' }, updatedAt: versionOf(now) }).expect(200)).body

    // A publish since the read is a change too: the edit of the published text would otherwise start version 2 silently.
    await officer.post(`/api/plans/${plan.id}/publish`).send({}).expect(200)
    const stale = await officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'After publish' }, updatedAt: versionOf(saved) }).expect(409)
    expect(stale.body.error.message).toMatch(/published version 1/)
    const published = (await officer.get(`/api/plans/${plan.id}`).expect(200)).body
    const v2 = (await officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'Version 2' }, updatedAt: versionOf(published) }).expect(200)).body
    expect(v2.current).toMatchObject({ version: 2, status: 'draft' })
    // Without updatedAt: saves as before.
    await officer.put(`/api/plans/${plan.id}/draft`).send({ content: { ...content, title: 'No version' } }).expect(200)
    const bad = await officer.put(`/api/plans/${plan.id}/draft`).send({ content, updatedAt: 'soon' }).expect(400)
    expect(bad.body.error.fields).toHaveProperty('updatedAt')
  })
})
