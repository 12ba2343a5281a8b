import { execFileSync } from 'node:child_process'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startFakeSmtp } from '../../server/mail/fake-smtp'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import type { Runtime } from '../../server/runtime'
import { seedDemo } from '../../server/seed/demo'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { startRuntime } from '../../server/runtime'
import { signIn, startTestRuntime, testConfig } from '../support/test-runtime'

const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

describe('SMTP server stopped', () => {
  let rt: Runtime
  beforeAll(async () => {
    rt = await startTestRuntime()
  })
  afterAll(() => rt.close())

  it('keeps notices queued while it is down and sends them when it returns', async () => {
    const port = rt.fakeSmtp!.port
    await rt.fakeSmtp!.close()
    const a = await signIn(rt, admin.email, admin.password)
    const email = `outage.${Date.now()}@calder-ridge.example`
    await a.post('/api/users/invitations').send({ email, name: 'Outage Test', role: 'staff' }).expect(202)

    // The dispatcher tries, fails, and keeps the message pending with the error recorded. (A claim counts
    // the attempt before the send is tried, so wait for the recorded error, not for the count.)
    const orgId = (await a.get('/api/auth/me')).body.orgId
    await expect.poll(async () => (await rt.ctx.mail.outgoing(orgId)).find((m) => m.to === email)?.lastError ?? null, { timeout: 10_000 }).not.toBeNull()
    const queued = (await a.get('/api/admin/outgoing-mail').expect(200)).body.messages.find((m: { to: string }) => m.to === email)
    expect(queued.status).toBe('pending')
    expect(queued.lastError).toMatch(/ECONNREFUSED|connect/i)
    expect(await listCapturedTo(rt.ctx.db, email)).toHaveLength(0)

    // The server comes back on the same port: the retry delivers it, once.
    const back = await startFakeSmtp(rt.ctx.db, port)
    try {
      await expect.poll(async () => (await listCapturedTo(rt.ctx.db, email)).length, { timeout: 20_000, interval: 250 }).toBe(1)
      // Captured once DATA ends; the sender records "sent" after the server's reply, a moment later.
      await expect.poll(async () => (await a.get('/api/admin/outgoing-mail').expect(200)).body.messages.find((m: { to: string }) => m.to === email)?.status, { timeout: 10_000 }).toBe('sent')
      await sleep(1500)
      expect(await listCapturedTo(rt.ctx.db, email)).toHaveLength(1)
    } finally {
      await back.close()
    }
  })
})

describe('PostgreSQL restarted under load', () => {
  // A cluster of its own, so restarting it does not disturb the other test files.
  const env = { ...process.env, DW_PG_PORT: '54341', DW_PG_DIR: path.resolve('.pg-faults') }
  const pg = (...args: string[]) => execFileSync('bash', ['server/cli/pg.sh', ...args], { env, encoding: 'utf8' }).trim().split('\n').pop()!
  let rt: Runtime
  let url: string

  beforeAll(async () => {
    url = pg('start', 'faults')
    const config = testConfig()
    rt = await startRuntime(config, url, { clientDir: null })
    await seedDemo(rt.ctx.db, config)
  }, 120_000)
  afterAll(async () => {
    await rt?.close()
    pg('stop')
  })

  it('recovers by itself: requests succeed again, sessions survive, nothing is lost', async () => {
    const a = await signIn(rt, admin.email, admin.password)
    const before = `kept.${Date.now()}@calder-ridge.example`
    await a.post('/api/users/invitations').send({ email: before, name: 'Kept Person', role: 'staff' }).expect(202)

    const statuses: number[] = []
    let stop = false
    const load = (async () => {
      while (!stop) {
        const res = await a.get('/api/users')
        statuses.push(res.status)
        await sleep(20)
      }
    })()
    await sleep(300)
    pg('stop')
    await sleep(800)
    pg('start', 'faults')
    // Give the pool a moment to replace its dead connections.
    await expect.poll(async () => (await a.get('/api/users')).status, { timeout: 20_000, interval: 250 }).toBe(200)
    await sleep(300)
    stop = true
    await load

    expect(statuses.filter((s) => s === 200).length).toBeGreaterThan(5)
    // During the outage the API answers 503 (never a 500 or a hang).
    expect(statuses.filter((s) => s !== 200 && s !== 503)).toEqual([])
    // Same session cookie, still signed in; the row written before the restart is there.
    const users = (await a.get('/api/users').expect(200)).body.users
    expect(users.map((u: { email: string }) => u.email)).toContain(before)
    const health = await a.get('/api/health').expect(200)
    expect(health.body.database).toBe('up')
  }, 120_000)
})
