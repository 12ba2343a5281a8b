import { spawn, type ChildProcess } from 'node:child_process'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startRunWorkers, type RunWorkers } from '../../server/jobs/runs-worker'
import { countResults, findRunById } from '../../server/repositories/runs.repo'
import type { Runtime } from '../../server/runtime'
import { databaseUrl, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, demoFloorAndScenario, waitForRun } from './runs-fixtures'

let rt: Runtime
let officer: ApiAgent
let floorId: number
let child: ChildProcess | null = null
let local: RunWorkers | null = null

beforeAll(async () => {
  // No workers in the web process: the separate worker process takes the job first.
  rt = await startTestRuntime({ inProcessWorkers: 0 }, { background: true })
  ;({ floorId } = await demoFloorAndScenario(rt))
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(async () => {
  if (child && child.exitCode === null) child.kill('SIGKILL')
  await local?.stop()
  await rt.close()
})

function startWorkerProcess(): Promise<ChildProcess> {
  const p = spawn(process.execPath, ['--import', 'tsx', 'server/worker-main.ts'], {
    env: { ...process.env, DATABASE_URL: databaseUrl(), WORKERS: '1', RUN_STALE_S: '3' }, stdio: ['ignore', 'pipe', 'pipe'],
  })
  return new Promise((resolve, reject) => {
    let out = ''
    p.stdout!.on('data', (d: Buffer) => { out += d; if (/working the engine-runs queue/.test(out)) resolve(p) })
    p.stderr!.on('data', (d: Buffer) => { out += d })
    p.on('exit', (code) => reject(new Error(`worker exited early (${code}): ${out}`)))
  })
}

describe('a worker killed mid-run', () => {
  it('leaves the job to another worker, which finishes it once: one result row, run succeeded', async () => {
    child = await startWorkerProcess()
    const sc = await officer.post(`/api/floors/${floorId}/scenarios`).send({
      name: 'NH3 slow run for the kill test', sourceIds: ['nh3-cabinet'], durationS: 3600, outputIntervalS: 60, cellM: 0.12, layers: 10,
    }).expect(201)
    const started = await officer.post(`/api/scenarios/${sc.body.id}/runs`).expect(202)
    await waitForRun(officer, started.body.id, (r) => r.status === 'running' && r.progress > 0.05, 60_000)
    const before = await findRunById(rt.ctx.db, started.body.id)
    expect(before!.holder).toContain(`:${child.pid}:`)

    child.kill('SIGKILL')
    await new Promise((r) => child!.once('exit', r))
    // Another worker (here: in this process) notices the silent holder and takes the job over.
    local = await startRunWorkers(rt.ctx.db, rt.ctx.jobs, { concurrency: 1, staleAfterS: 3, name: 'rescuer' })
    const { run } = await waitForRun(officer, started.body.id, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status), 120_000)
    expect(run.status).toBe('succeeded')
    expect(run.attempts).toBe(2)
    expect(await countResults(rt.ctx.db, run.id)).toBe(1)
    const after = await findRunById(rt.ctx.db, run.id)
    expect(after!.holder).toContain(local.holderPrefix)
  }, 180_000)

  it('a separate worker exits cleanly on SIGTERM', async () => {
    const p = await startWorkerProcess()
    p.kill('SIGTERM')
    const code = await new Promise((r) => p.once('exit', r))
    expect(code).toBe(0)
  }, 60_000)
})
