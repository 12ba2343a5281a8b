import { execFileSync } from 'node:child_process'
import path from 'node:path'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { startRunWorkers, type RunWorkers } from '../../server/jobs/runs-worker'
import { countResults, findRunById } from '../../server/repositories/runs.repo'
import { startRuntime, type Runtime } from '../../server/runtime'
import { seedDemo } from '../../server/seed/demo'
import { signIn, testConfig, type ApiAgent } from '../support/test-runtime'
import { acct, demoFloorAndScenario, waitForRun } from './runs-fixtures'

// Issue 14 item 1: a job handler ending while PostgreSQL is down. pg-boss 10 records the outcome with an unawaited
// complete()/fail(); that rejection used to be unhandled and end the process, and the computed result was lost.
// A cluster of its own, so stopping it does not disturb the other test files.
const env = { ...process.env, DW_PG_PORT: '54347', DW_PG_DIR: path.resolve('.pg-reliability') }
const pg = (...args: string[]) => execFileSync('bash', ['server/cli/pg.sh', ...args], { env, encoding: 'utf8' }).trim().split('\n').pop()!
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

let rt: Runtime
let workers: RunWorkers | null = null
let officer: ApiAgent
let floorId: number
const unhandled: unknown[] = []
const onUnhandled = (e: unknown) => unhandled.push(e)

beforeAll(async () => {
  process.on('unhandledRejection', onUnhandled)
  const url = pg('start', 'reliability')
  const config = testConfig({ inProcessWorkers: 0 })
  rt = await startRuntime(config, url, { clientDir: null })
  await seedDemo(rt.ctx.db, config)
  ;({ floorId } = await demoFloorAndScenario(rt))
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
}, 120_000)
afterAll(async () => {
  process.off('unhandledRejection', onUnhandled)
  await workers?.stop()
  await rt?.close()
  pg('stop')
})

describe('a job that ends while PostgreSQL is down', () => {
  it('an unawaited pg-boss complete() that fails does not become an unhandled rejection', async () => {
    const queue = 'reliability-probe'
    await rt.ctx.jobs.ensureQueue(queue)
    let ran = false
    const id = await rt.ctx.jobs.boss.work(queue, { pollingIntervalSeconds: 0.5 }, async () => {
      pg('stop') // the database goes away while the handler runs; pg-boss then records the completion unawaited
      ran = true
      return { done: true }
    })
    await rt.ctx.jobs.boss.send(queue, { probe: 1 })
    await expect.poll(() => ran, { timeout: 15_000 }).toBe(true)
    await sleep(1500)
    await rt.ctx.jobs.boss.offWork(id).catch(() => undefined)
    pg('start', 'reliability')
    expect(unhandled.map(String)).toEqual([])
    await expect.poll(async () => (await request(rt.app).get('/api/health')).status, { timeout: 20_000, interval: 250 }).toBe(200)
  }, 60_000)

  it('keeps the finished result, stores it once the database is back: run succeeded on its first attempt', async () => {
    const logs: string[] = []
    const spy = vi.spyOn(console, 'log').mockImplementation((...a: unknown[]) => { logs.push(a.map(String).join(' ')) })
    try {
      // staleAfterS 3: the outage outlasts the heartbeat limit, so the reaper may hand the run on meanwhile.
      workers = await startRunWorkers(rt.ctx.db, rt.ctx.jobs, { concurrency: 1, staleAfterS: 3, heartbeatMs: 300, name: 'outage' })
      const sc = await officer.post(`/api/floors/${floorId}/scenarios`).send({
        name: `NH3 run across a database outage ${Date.now()}`, sourceIds: ['nh3-cabinet'], durationS: 3600, outputIntervalS: 60, cellM: 0.12, layers: 10,
      }).expect(201)
      const started = await officer.post(`/api/scenarios/${sc.body.id}/runs`).expect(202)
      await waitForRun(officer, started.body.id, (r) => r.status === 'running' && r.progress > 0.02, 60_000)
      pg('stop')
      // The engine finishes during the outage; its store fails and is retried (the old code threw to pg-boss instead).
      const down = Date.now()
      await expect.poll(() => Date.now() - down > 60_000 || logs.some((l) => l.includes(`run ${started.body.id}: result not stored yet`)), { timeout: 70_000, interval: 200 }).toBe(true)
      await sleep(6000)
      pg('start', 'reliability')
      await expect.poll(async () => (await findRunById(rt.ctx.db, started.body.id).catch(() => null))?.status, { timeout: 60_000, interval: 300 }).toBe('succeeded')
      const run = (await findRunById(rt.ctx.db, started.body.id))!
      expect(run.attempts).toBe(1) // not computed a second time
      expect(await countResults(rt.ctx.db, run.id)).toBe(1)
      expect(unhandled.map(String)).toEqual([])
      expect((await request(rt.app).get('/api/health')).status).toBe(200)
    } finally {
      spy.mockRestore()
    }
  }, 240_000)
})
