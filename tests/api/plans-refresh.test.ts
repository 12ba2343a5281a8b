import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { fixtureSummary } from '../unit/plans-fixtures'
import { acct, insertFinishedRun, planFixture } from './plans-fixtures'

let rt: Runtime
let officer: ApiAgent, manager: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>
let planId: number, newRunId: number, otherFloorRunId: number

beforeAll(async () => {
  rt = await startTestRuntime()
  fx = await planFixture(rt)
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
  manager = await signIn(rt, acct('lab_manager').email, acct('lab_manager').password)
  // Version 1: generated from the first result, one officer line added, published.
  const created = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId] }).expect(201)).body
  planId = created.id
  const content = created.current.content
  content.actions.items.push({ id: 'officer-lifts', text: 'Send the lifts to the ground floor.', who: 'Security', from: null })
  content.evacuation.assemblyPoint = 'Car park P2'
  await officer.put(`/api/plans/${planId}/draft`).send({ content }).expect(200)
  await officer.post(`/api/plans/${planId}/publish`).send({ ackDueDays: 7 }).expect(200)
  // A newer result of the same floor: the detector alarms at 55 s instead of 40 s.
  const later = fixtureSummary({
    firstAlarm: { detectorId: 'det-a', level: 'low', timeS: 55 },
    receptors: fixtureSummary().receptors.map((r) => (r.id === 'det-a' ? { ...r, alarmLowS: 55, alarmHighS: 90 } : r)),
  })
  newRunId = (await insertFinishedRun(rt, { orgId: fx.orgId, floorId: fx.floorId, userId: fx.officerId, label: 'NH3 cylinder, exhaust upgraded', summary: later })).id
  otherFloorRunId = (await insertFinishedRun(rt, { orgId: fx.orgId, floorId: fx.floor2Id, userId: fx.officerId, label: 'Level 2 leak', summary: later })).id
})
afterAll(() => rt.close())

describe('refreshing a published plan from a newer result', () => {
  it('refuses lab managers, other organizations, and results that are not of the floor (naming the field)', async () => {
    await manager.post(`/api/plans/${planId}/refresh`).send({ runIds: [newRunId] }).expect(403)
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const otherOfficer = await signIn(rt, other.users.ehs_officer.email, other.password)
    await otherOfficer.post(`/api/plans/${planId}/refresh`).send({ runIds: [newRunId] }).expect(404)
    const empty = await officer.post(`/api/plans/${planId}/refresh`).send({ runIds: [] }).expect(400)
    expect(Object.keys(empty.body.error.fields)).toEqual(['runIds'])
    const wrong = await officer.post(`/api/plans/${planId}/refresh`).send({ runIds: [otherFloorRunId] }).expect(400)
    expect(wrong.body.error.fields).toEqual({ 'runIds.0': 'No finished result with this id on this floor' })
  })

  it("writes the draft of version 2 from the new result, keeps the officer's text, leaves version 1 frozen", async () => {
    const v1 = (await officer.get(`/api/plans/${planId}/versions/1`).expect(200)).body
    const res = await officer.post(`/api/plans/${planId}/refresh`).send({ runIds: [newRunId] }).expect(200)
    const c = res.body.current
    expect(c).toMatchObject({ version: 2, status: 'draft' })
    expect(res.body.runIds).toEqual([newRunId])
    expect(c.content.predicted.firstAlarmS).toBe(55)
    expect(c.content.timeline.rows.filter((r: { from: unknown }) => r.from).every((r: { from: { runId: number } }) => r.from.runId === newRunId)).toBe(true)
    expect(c.content.actions.items.at(-1)).toMatchObject({ id: 'officer-lifts', who: 'Security', from: null })
    expect(c.content.evacuation.assemblyPoint).toBe('Car park P2')

    const again = (await officer.get(`/api/plans/${planId}/versions/1`).expect(200)).body
    expect(again).toEqual(v1)
    expect(again.content.predicted.firstAlarmS).toBe(40)

    const audit = (await officer.get(`/api/plans/${planId}/audit`).expect(200)).body.entries
    const entry = audit.find((e: { action: string }) => e.action === 'plan.refreshed')
    expect(entry.detail).toMatchObject({ version: 2, runIds: [newRunId], kept: 1 })
  })

  it('a second refresh updates the open draft instead of starting another version', async () => {
    const res = await officer.post(`/api/plans/${planId}/refresh`).send({ runIds: [fx.runId, newRunId] }).expect(200)
    expect(res.body.current.version).toBe(2)
    expect(res.body.versions.map((v: { version: number }) => v.version)).toEqual([2, 1])
    expect(res.body.current.content.hazard.items.map((h: { from: { runId: number } }) => h.from.runId)).toEqual([fx.runId, newRunId])
  })
})
