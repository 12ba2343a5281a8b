import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { CSRF_HEADER } from '../../shared/contract/csrf'
import type { Runtime } from '../../server/runtime'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import { findUserByEmail, insertUser } from '../../server/repositories/users.repo'
import { hashPassword } from '../../server/services/passwords'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { apiAgent, linkFrom, signIn, startTestRuntime, waitForMail } from '../support/test-runtime'

const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
const staff = DEMO_ACCOUNTS.find((a) => a.role === 'staff')!

let rt: Runtime
beforeAll(async () => {
  rt = await startTestRuntime({ loginRateLimit: 4 })
})
afterAll(() => rt.close())

describe('POST /api/auth/login', () => {
  it('with the right password, answers the session user and sets an httpOnly SameSite session cookie', async () => {
    const a = await apiAgent(rt)
    const res = await a.post('/api/auth/login').send({ email: admin.email, password: admin.password }).expect(200)
    expect(res.body).toMatchObject({ email: admin.email, role: 'admin' })
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c: string) => c.startsWith('dw_sid='))!
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    await a.get('/api/auth/me').expect(200)
  })

  it('with a wrong password, answers 401 and no session', async () => {
    const a = await apiAgent(rt)
    const res = await a.post('/api/auth/login').send({ email: staff.email, password: 'not-the-password' }).expect(401)
    expect(res.body.error.code).toBe('bad_credentials')
    await a.get('/api/auth/me').expect(401)
  })

  it('regenerates the session id at sign-in (no fixation)', async () => {
    const a = await apiAgent(rt)
    await a.post('/api/auth/login').send({ email: staff.email, password: 'wrong-once' }).expect(401)
    const first = await a.post('/api/auth/login').send({ email: staff.email, password: staff.password }).expect(200)
    const sid1 = (first.headers['set-cookie'] as unknown as string[]).find((c: string) => c.startsWith('dw_sid='))!
    const second = await a.post('/api/auth/login').send({ email: staff.email, password: staff.password }).expect(200)
    const sid2 = (second.headers['set-cookie'] as unknown as string[]).find((c: string) => c.startsWith('dw_sid='))!
    expect(sid1.split(';')[0]).not.toBe(sid2.split(';')[0])
  })

  it('malformed bodies get 400 naming the field', async () => {
    const a = await apiAgent(rt)
    const res = await a.post('/api/auth/login').send({ email: 'not-an-email', password: '' }).expect(400)
    expect(res.body.error.fields).toHaveProperty('email')
    expect(res.body.error.fields).toHaveProperty('password')
    const bad = await a.post('/api/auth/login').set('content-type', 'application/json').send('{"email": ').expect(400)
    expect(bad.body.error.code).toBe('malformed_json')
  })

  it('after too many failures answers 429', async () => {
    const a = await apiAgent(rt)
    const email = 'nobody-here@calder-ridge.example'
    for (let i = 0; i < 4; i++) await a.post('/api/auth/login').send({ email, password: `guess-${i}` }).expect(401)
    const res = await a.post('/api/auth/login').send({ email, password: 'guess-last' }).expect(429)
    expect(res.body.error.code).toBe('rate_limited')
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0)
  })
})

describe('CSRF', () => {
  it('refuses a cookie-authenticated write without the token header', async () => {
    const a = await signIn(rt, admin.email, admin.password)
    const res = await a.raw.patch('/api/auth/preferences').send({ unitSystem: 'imperial' }).expect(403)
    expect(res.body.error.code).toBe('csrf_failed')
    await a.raw.patch('/api/auth/preferences').set(CSRF_HEADER, 'x'.repeat(32)).send({ unitSystem: 'imperial' }).expect(403)
    await a.patch('/api/auth/preferences').send({ unitSystem: 'imperial' }).expect(200)
    await a.patch('/api/auth/preferences').send({ unitSystem: 'metric' }).expect(200)
  })
  it('refuses a write from a client that never got the cookie', async () => {
    await request(rt.app).post('/api/auth/login').send({ email: admin.email, password: admin.password }).expect(403)
  })
})

describe('sessions', () => {
  it('survive a server restart (stored in PostgreSQL) and end at sign-out', async () => {
    const a = await signIn(rt, staff.email, staff.password)
    const cookies = (await a.get('/api/auth/me').expect(200)).request.cookies as unknown as string
    const rt2 = await startTestRuntime({}, { seed: false })
    try {
      const jar = a.raw.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false } as never)
      const header = jar.map((c: { name: string; value: string }) => `${c.name}=${c.value}`).join('; ') || cookies
      const me = await request(rt2.app).get('/api/auth/me').set('Cookie', header).expect(200)
      expect(me.body.email).toBe(staff.email)
    } finally {
      await rt2.close()
    }
    await a.post('/api/auth/logout').expect(200)
    await a.get('/api/auth/me').expect(401)
  })
})

describe('password reset by e-mail', () => {
  it('mails a link over SMTP that works once, then no more', async () => {
    // A person of its own, so other test files keep the demo passwords.
    const email = `forgetful.${Date.now()}@calder-ridge.example`
    const orgId = (await findUserByEmail(rt.ctx.db, admin.email))!.org_id
    await insertUser(rt.ctx.db, { orgId, email, name: 'Forgetful Person', role: 'staff', status: 'active', passwordHash: await hashPassword('the-old-password-1', rt.ctx.config.argon2) })
    const a = await apiAgent(rt)
    await a.post('/api/auth/forgot-password').send({ email }).expect(200)
    // Unknown addresses get the same answer.
    await a.post('/api/auth/forgot-password').send({ email: 'ghost@calder-ridge.example' }).expect(200)
    const mail = await waitForMail(rt.ctx.db, email, /reset your driftwarden password/i)
    const token = new URL(linkFrom(mail.text_body, '/reset-password?token=')).searchParams.get('token')!
    const info = await a.get(`/api/auth/token-info?token=${encodeURIComponent(token)}`).expect(200)
    expect(info.body).toMatchObject({ purpose: 'reset', email })
    await a.post('/api/auth/reset-password').send({ token, password: 'a-brand-new-pass-1' }).expect(200)
    const again = await a.post('/api/auth/reset-password').send({ token, password: 'another-new-pass-2' }).expect(410)
    expect(again.body.error.message).toMatch(/already been used/)
    await signIn(rt, email, 'a-brand-new-pass-1')
    await (await apiAgent(rt)).post('/api/auth/login').send({ email, password: 'the-old-password-1' }).expect(401)
    expect(await listCapturedTo(rt.ctx.db, 'ghost@calder-ridge.example')).toHaveLength(0)
  })
  it('refuses a tampered link', async () => {
    const a = await apiAgent(rt)
    const res = await a.post('/api/auth/reset-password').send({ token: '1.abc.reset.9999999999.forged-signature', password: 'whatever-long-1' }).expect(410)
    expect(res.body.error.code).toBe('gone')
  })
})

describe('GET /api/health and /api/openapi.json', () => {
  it('reports the database up', async () => {
    const res = await request(rt.app).get('/api/health').expect(200)
    expect(res.body).toEqual({ status: 'ok', database: 'up' })
  })
  it('lists every route with its roles', async () => {
    const res = await request(rt.app).get('/api/openapi.json').expect(200)
    expect(res.body.openapi).toBe('3.1.0')
    expect(res.body.paths['/api/users/{id}'].patch['x-roles']).toEqual(['admin'])
    expect(res.body.paths['/api/auth/login'].post.requestBody.content['application/json'].schema.properties).toHaveProperty('email')
  })
  it('sends helmet headers and never a stack trace', async () => {
    const res = await request(rt.app).get('/api/nope').expect(404)
    expect(res.headers['content-security-policy']).toBeTruthy()
    expect(res.headers['x-powered-by']).toBeUndefined()
    expect(res.body.error.code).toBe('not_found')
  })
})
