import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { polygonsOverlap, type Point } from '../../shared/geometry/polygon'
import { mayOverlap } from '../../shared/floorplan/overlap-prefilter'
import type { Runtime } from '../../server/runtime'
import { fixtureFloor } from '../unit/plans-fixtures'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, planFixture } from './plans-fixtures'

// Issue 14 item 2: one request must not freeze the server for everyone. While the worst input the API accepts (or
// refuses) is being processed, /api/health keeps answering within 200 ms (the issue's own yardstick).
let rt: Runtime
let base: string
let officer: ApiAgent
let fx: Awaited<ReturnType<typeof planFixture>>

beforeAll(async () => {
  rt = await startTestRuntime()
  base = await rt.listen(0, '127.0.0.1')
  fx = await planFixture(rt)
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

/** Parallel thin diagonal strips: no two overlap, but every bounding box overlaps every other (the probe). */
function strips(n: number, corners: number, at: [number, number] = [0, 0]) {
  return Array.from({ length: n }, (_, k) => {
    const half = corners / 2, pts: [number, number][] = [], L = 100, off = k * 0.5
    for (let i = 0; i < half; i++) { const t = (i / (half - 1)) * L; pts.push([at[0] + t + off, at[1] + t - off]) }
    for (let i = half - 1; i >= 0; i--) { const t = (i / (half - 1)) * L; pts.push([at[0] + t + off + 0.2, at[1] + t - off - 0.2]) }
    return { id: `strip-${k}`, name: `Strip ${k}`, kind: 'lab' as const, polygon: pts, ventilation: { mode: 'ach' as const, airChangesPerHour: 6 } }
  })
}

/** Runs `work` while polling /api/health; answers the work's response and the slowest health answer, ms. */
async function whileHealthPolled<T>(work: () => Promise<T>): Promise<{ res: T; slowestMs: number; polls: number }> {
  let done = false, slowest = 0, polls = 0
  const poll = (async () => {
    while (!done) {
      const t0 = performance.now()
      const r = await fetch(`${base}/api/health`)
      await r.arrayBuffer()
      slowest = Math.max(slowest, performance.now() - t0)
      polls++
      await new Promise((r) => setTimeout(r, 10))
    }
  })()
  await new Promise((r) => setTimeout(r, 50))
  const res = await work()
  done = true
  await poll
  return { res, slowestMs: slowest, polls }
}

const version = async () => (await officer.get(`/api/floors/${fx.floorId}`).expect(200)).body.version as number

describe('plan saves', () => {
  it('refuses coordinates no building has, naming the field', async () => {
    const plan = fixtureFloor()
    plan.rooms[0]!.polygon[2] = [1e300, 4]
    const res = await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: await version(), plan }).expect(400)
    expect(res.body.error.fields['plan.rooms.0.polygon.2.0']).toMatch(/Within 5000 m/)
  })

  it('refuses more room corners than a plan may have, and rooms spread beyond 2 km, naming plan.rooms', async () => {
    const many = { ...fixtureFloor(), rooms: strips(26, 200) }
    const r1 = await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: await version(), plan: many }).expect(400)
    expect(r1.body.error.fields['plan.rooms']).toMatch(/At most 5000 room corners/)
    const far = fixtureFloor()
    far.rooms.push({ id: 'far', name: 'Far shed', kind: 'other', polygon: [[2500, 0], [2501, 0], [2501, 1], [2500, 1]], ventilation: { mode: 'ach', airChangesPerHour: 1 } })
    const r2 = await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: await version(), plan: far }).expect(400)
    expect(r2.body.error.fields['plan.rooms']).toMatch(/2000 m/)
  })

  for (const [n, c] of [[25, 200], [500, 10]] as const) {
    it(`checks the worst accepted plan (${n} thin rooms of ${c} corners, boxes all overlapping) while /api/health answers within 200 ms`, async () => {
      const plan = { ...fixtureFloor(), rooms: strips(n, c) }
      const v = await version()
      const t0 = performance.now()
      const { res, slowestMs, polls } = await whileHealthPolled(() => officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: v, plan }))
      const tookMs = performance.now() - t0
      expect(res.status).toBe(200)
      expect(res.body.problems.some((p: { code: string }) => p.code === 'room_overlap')).toBe(false)
      expect(polls).toBeGreaterThan(1)
      expect(slowestMs).toBeLessThan(200)
      console.log(`[reliability] ${n}×${c} plan saved in ${tookMs.toFixed(0)} ms; slowest health ${slowestMs.toFixed(0)} ms over ${polls} polls`)
    }, 60_000)
  }
})

describe('the detector advisor', () => {
  it('refuses a grid too fine for the rooms\' extent (1 m room 1 km away), naming gridSpacingM, without holding other requests', async () => {
    const plan = fixtureFloor()
    plan.rooms.push({ id: 'far', name: 'Far store', kind: 'other', polygon: [[1000, 1000], [1001, 1000], [1001, 1001], [1000, 1001]], ventilation: { mode: 'ach', airChangesPerHour: 1 } })
    await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: await version(), plan }).expect(200)
    const { res, slowestMs } = await whileHealthPolled(() => officer.post(`/api/floors/${fx.floorId}/advisor`).send({ runIds: [fx.runId], count: 1, gridSpacingM: 0.25 }))
    expect(res.status).toBe(400)
    expect(res.body.error.fields.gridSpacingM).toMatch(/at most 10000/)
    expect(slowestMs).toBeLessThan(200)
    // The largest grid it accepts is answered, and health stays prompt.
    const ok = await whileHealthPolled(() => officer.post(`/api/floors/${fx.floorId}/advisor`).send({ runIds: [fx.runId], count: 1, gridSpacingM: 10.2 }))
    expect(ok.res.status).toBe(200)
    expect(ok.slowestMs).toBeLessThan(200)
  }, 60_000)
})

describe('the overlap pre-test', () => {
  it('never skips a pair the full test finds overlapping (random quadrilaterals, fast-check)', () => {
    const pt = fc.tuple(fc.integer({ min: 0, max: 20 }), fc.integer({ min: 0, max: 20 })).map(([x, y]) => [x / 2, y / 2] as Point)
    const quad = fc.tuple(pt, fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 12 })).map(([[x, y], w, h]) => [[x, y], [x + w / 2, y], [x + w / 2, y + h / 2], [x, y + h / 2]] as Point[])
    fc.assert(fc.property(quad, quad, (a, b) => !polygonsOverlap(a, b, 0.005) || mayOverlap(a, b, 0.005)), { numRuns: 3000 })
  })
})
