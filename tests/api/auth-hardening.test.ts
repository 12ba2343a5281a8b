import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { CSRF_HEADER } from '../../shared/contract/csrf'
import { contract, pathOf } from '../../shared/contract'
import type { Runtime } from '../../server/runtime'
import { findUserByEmail, insertUser } from '../../server/repositories/users.repo'
import { hashPassword } from '../../server/services/passwords'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { apiAgent, linkFrom, signIn, startTestRuntime, waitForMail } from '../support/test-runtime'
import { planFixture } from './plans-fixtures'

// Issue 14 item 8: weak passwords, image dimensions, the CSRF token at sign-in, COOKIE_SECURE behind a proxy.
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
const officerAcct = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!
let rt: Runtime
beforeAll(async () => { rt = await startTestRuntime() })
afterAll(() => rt.close())

describe('new passwords', () => {
  it('ten spaces, one letter ten times, a digit run, a common password are refused on reset, naming password', async () => {
    const email = `weakpw.${Date.now()}@calder-ridge.example`
    const orgId = (await findUserByEmail(rt.ctx.db, admin.email))!.org_id
    await insertUser(rt.ctx.db, { orgId, email, name: 'Weak Password', role: 'staff', status: 'active', passwordHash: await hashPassword('old-password-here-1', rt.ctx.config.argon2) })
    const a = await apiAgent(rt)
    await a.post('/api/auth/forgot-password').send({ email }).expect(200)
    const mail = await waitForMail(rt.ctx.db, email, /reset your driftwarden password/i)
    const token = new URL(linkFrom(mail.text_body, '/reset-password?token=')).searchParams.get('token')!
    for (const weak of [' '.repeat(10), 'aaaaaaaaaa', '1234567890', 'password12', 'qwertyuiop', 'abcabcabcabc', 'P@ssw0rd2024']) {
      const res = await a.post('/api/auth/reset-password').send({ token, password: weak })
      expect(res.status, JSON.stringify(weak)).toBe(400)
      expect(res.body.error.fields.password, JSON.stringify(weak)).toBeTruthy()
    }
    // The link is still good for a real password.
    await a.post('/api/auth/reset-password').send({ token, password: 'tidal-copper-lantern-7' }).expect(200)
  })
})

describe('CSRF token at sign-in', () => {
  const sidOf = (a: Awaited<ReturnType<typeof apiAgent>>) =>
    (a.raw as unknown as { jar: { getCookie(n: string, x: unknown): { value: string } } }).jar.getCookie('dw_sid', { domain: '127.0.0.1', path: '/', secure: false, script: false })?.value

  it('is new after sign-in: the token from before no longer works', async () => {
    const a = await apiAgent(rt)
    const before = a.token
    await a.post('/api/auth/login').send({ email: admin.email, password: admin.password }).expect(200)
    expect(a.token).not.toBe(before)
    await a.raw.patch('/api/auth/preferences').set(CSRF_HEADER, before).send({ unitSystem: 'metric' }).expect(403)
    await a.patch('/api/auth/preferences').send({ unitSystem: 'metric' }).expect(200)
  })

  it("is bound to the session: another session's token (cookie and header both) is refused", async () => {
    const a = await signIn(rt, admin.email, admin.password)
    const b = await signIn(rt, officerAcct.email, officerAcct.password)
    const sidA = sidOf(a)
    expect(sidA).toBeTruthy()
    const as = (token: string) => request(rt.app).patch('/api/auth/preferences').set('Cookie', `dw_sid=${sidA}; dw_csrf=${token}`).set(CSRF_HEADER, token).send({ unitSystem: 'metric' })
    expect((await as(b.token)).status).toBe(403)
    expect((await as(a.token)).status).toBe(200)
  })
})

describe('COOKIE_SECURE=1', () => {
  it('over plain HTTP sign-in explains itself instead of answering 200 without a cookie; over HTTPS (proxy header) it sets a Secure cookie', async () => {
    const secure = await startTestRuntime({ secureCookies: true }, { seed: false })
    try {
      const a = await apiAgent(secure)
      const plain = await a.post('/api/auth/login').send({ email: admin.email, password: admin.password })
      expect(plain.status).toBe(400)
      expect(plain.body.error.code).toBe('https_required')
      expect(plain.body.error.message).toMatch(/X-Forwarded-Proto/)
      // Behind a proxy that says https: the Secure cookies are set and sign-in works (the test client is plain HTTP,
      // so it hands the CSRF cookie back by hand, as a browser on https would).
      const csrf = await request(secure.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https').expect(200)
      expect((csrf.headers['set-cookie'] as unknown as string[]).join()).toMatch(/dw_csrf=[^;]+;.*Secure/i)
      const t = csrf.body.csrfToken as string
      const viaProxy = await request(secure.app).post('/api/auth/login').set('X-Forwarded-Proto', 'https').set('Cookie', `dw_csrf=${t}`).set(CSRF_HEADER, t)
        .send({ email: admin.email, password: admin.password }).expect(200)
      const sid = (viaProxy.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('dw_sid='))
      expect(sid).toMatch(/Secure/i)
    } finally {
      await secure.close()
    }
  })
})

describe('floor-plan image dimensions', () => {
  const png = (w: number, h: number) => {
    const ihdr = Buffer.alloc(25)
    ihdr.writeUInt32BE(13, 0); ihdr.write('IHDR', 4, 'latin1'); ihdr.writeUInt32BE(w, 8); ihdr.writeUInt32BE(h, 12)
    ihdr[16] = 8; ihdr[17] = 2 // 8-bit RGB
    return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), ihdr, Buffer.from('0000000049454e44ae426082', 'hex')])
  }
  const jpeg = (w: number, h: number) => {
    const app0 = Buffer.from('ffe000104a46494600010100000100010000', 'hex')
    const sof = Buffer.from([0xff, 0xc0, 0x00, 0x11, 0x08, h >> 8, h & 0xff, w >> 8, w & 0xff, 0x03, 0x01, 0x22, 0x00, 0x02, 0x11, 0x01, 0x03, 0x11, 0x01])
    return Buffer.concat([Buffer.from([0xff, 0xd8]), app0, sof, Buffer.from([0xff, 0xd9])])
  }
  it('a PNG or JPEG header claiming 50 000 × 50 000 px is refused naming file; ordinary sizes are stored', async () => {
    const fx = await planFixture(rt)
    const officer = await signIn(rt, officerAcct.email, officerAcct.password)
    for (const [bytes, name] of [[png(50_000, 50_000), 'huge.png'], [jpeg(50_000, 50_000), 'huge.jpg'], [png(20_000, 100), 'long.png']] as const) {
      const res = await officer.post(pathOf(contract.floors.uploadImage, { id: fx.floorId })).attach('file', bytes, { filename: name })
      expect(res.status, name).toBe(400)
      expect(res.body.error.fields.file, name).toBeTruthy()
    }
    await officer.post(pathOf(contract.floors.uploadImage, { id: fx.floorId })).attach('file', png(4000, 3000), { filename: 'plan.png' }).expect(201)
    await officer.post(pathOf(contract.floors.uploadImage, { id: fx.floorId })).attach('file', jpeg(6000, 4000), { filename: 'plan.jpg' }).expect(201)
  })
})
