import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import { findUserByEmail, insertUser } from '../../server/repositories/users.repo'
import { hashPassword } from '../../server/services/passwords'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { apiAgent, linkFrom, signIn, startTestRuntime, waitForMail } from '../support/test-runtime'

// Issue 14 items 5 and 6: sign-in and reset limits that cannot be walked around, and no account takeover through
// the admin's captured-mail view.
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
let rt: Runtime
let orgId: number
const LIMIT = 4

beforeAll(async () => {
  rt = await startTestRuntime({ loginRateLimit: LIMIT })
  orgId = (await findUserByEmail(rt.ctx.db, admin.email))!.org_id
})
afterAll(() => rt.close())

async function person(role: 'staff' | 'admin', password: string) {
  const email = `limits.${role}.${Date.now()}.${Math.random().toString(36).slice(2, 6)}@calder-ridge.example`
  await insertUser(rt.ctx.db, { orgId, email, name: `Limit ${role}`, role, status: 'active', passwordHash: await hashPassword(password, rt.ctx.config.argon2) })
  return email
}

describe('sign-in limits', () => {
  it('after lock-out, spaces, capitals, another X-Forwarded-For or a fresh cookie jar do not give more guesses, nor the right password', async () => {
    const email = await person('staff', 'right-password-1')
    const a = await apiAgent(rt)
    for (let i = 0; i < LIMIT; i++) await a.post('/api/auth/login').send({ email, password: `wrong-${i}` }).expect(401)
    for (const variant of [email, ` ${email}`, `${' '.repeat(41)}${email}`, email.toUpperCase(), `\t${email}\u00a0`]) {
      const res = await a.post('/api/auth/login').send({ email: variant, password: 'right-password-1' })
      expect(res.status, JSON.stringify(variant)).toBe(429)
    }
    // A different claimed client address (any header a client can set) is still this account's lock-out.
    let limited = 0
    for (let i = 0; i < 3 * LIMIT; i++) {
      const b = await apiAgent(rt)
      const res = await b.post('/api/auth/login').set('X-Forwarded-For', `198.51.100.${i + 1}`).set('User-Agent', `probe-${i}`).send({ email: ` ${email.toUpperCase()}`, password: `again-${i}` })
      if (res.status === 429) limited++
      else expect(res.status).toBe(401)
    }
    expect(limited).toBeGreaterThan(0)
    const last = await (await apiAgent(rt)).post('/api/auth/login').set('X-Forwarded-For', '198.51.100.250').send({ email, password: 'right-password-1' })
    expect(last.status).toBe(429)
  })

  it('one client trying many different addresses is limited too', async () => {
    const a = await apiAgent(rt)
    const statuses: number[] = []
    for (let i = 0; i < 30; i++) {
      const res = await a.post('/api/auth/login').set('X-Forwarded-For', '203.0.113.77').send({ email: `nobody.${i}.${Date.now()}@calder-ridge.example`, password: 'guess-guess' })
      statuses.push(res.status)
    }
    expect(statuses.slice(0, 2 * LIMIT).every((s) => s === 401)).toBe(true)
    expect(statuses.slice(2 * LIMIT)).toEqual(Array(30 - 2 * LIMIT).fill(429))
  })
})

describe('password-reset limits', () => {
  it('at most 3 reset mails an hour to one address, whatever its spelling; the 4th request answers 429', async () => {
    const email = await person('staff', 'reset-limit-pass-1')
    const a = await apiAgent(rt)
    const statuses: number[] = []
    for (const v of [email, ` ${email}`, email.toUpperCase(), `${email}  `, email]) {
      statuses.push((await a.post('/api/auth/forgot-password').set('X-Forwarded-For', `192.0.2.${statuses.length + 1}`).send({ email: v })).status)
    }
    expect(statuses).toEqual([200, 200, 200, 429, 429])
    await rt.ctx.mail.flush()
    await waitForMail(rt.ctx.db, email, /reset your driftwarden password/i)
    await new Promise((r) => setTimeout(r, 500))
    expect((await listCapturedTo(rt.ctx.db, email)).filter((m) => /reset/i.test(m.subject))).toHaveLength(3)
  })
})

describe('captured mail', () => {
  it("does not show an admin a working reset link for another person's account; the admin's own is shown, and other admins hear of an admin reset", async () => {
    const victim = await person('staff', 'victim-pass-1')
    const a = await signIn(rt, admin.email, admin.password)
    await a.post('/api/auth/forgot-password').send({ email: victim }).expect(200)
    await waitForMail(rt.ctx.db, victim, /reset your driftwarden password/i)
    const list = (await a.get('/api/admin/captured-mail').expect(200)).body.messages as { to: string[]; text: string }[]
    const seen = list.find((m) => m.to.includes(victim))!
    expect(seen.text).toMatch(/reset-password\?token=\[hidden/)
    expect(seen.text).not.toMatch(/reset-password\?token=[A-Za-z0-9]/)

    // A second admin's reset: the link is visible to them only, and the first admin is told when it is used.
    const pass2 = 'second-admin-pass-1'
    const admin2 = await person('admin', pass2)
    await (await apiAgent(rt)).post('/api/auth/forgot-password').send({ email: admin2 }).expect(200)
    const mail = await waitForMail(rt.ctx.db, admin2, /reset your driftwarden password/i)
    const viewAs2 = await signIn(rt, admin2, pass2)
    const own = ((await viewAs2.get('/api/admin/captured-mail').expect(200)).body.messages as { to: string[]; text: string; subject: string }[]).find((m) => m.to.includes(admin2) && /reset/i.test(m.subject))!
    expect(own.text).toMatch(/reset-password\?token=[A-Za-z0-9]/)
    const token = new URL(linkFrom(mail.text_body, '/reset-password?token=')).searchParams.get('token')!
    await (await apiAgent(rt)).post('/api/auth/reset-password').send({ token, password: 'second-admin-new-1' }).expect(200)
    await waitForMail(rt.ctx.db, admin.email, /administrator password reset/i)
    // The demo organization is shared with other test files: leave it with the admins it had.
    await rt.ctx.db.updateTable('users').set({ status: 'deactivated' }).where('email', '=', admin2).execute()
  })
})
