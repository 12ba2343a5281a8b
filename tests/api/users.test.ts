import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { apiAgent, createOtherOrg, linkFrom, signIn, startTestRuntime, waitForMail, type ApiAgent } from '../support/test-runtime'

const acct = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!

let rt: Runtime
let admin: ApiAgent
beforeAll(async () => {
  rt = await startTestRuntime()
  admin = await signIn(rt, acct('admin').email, acct('admin').password)
})
afterAll(() => rt.close())

describe('role matrix for /api/users', () => {
  it.each(['ehs_officer', 'lab_manager', 'staff'])('%s cannot list, invite or change users (403)', async (role) => {
    const a = await signIn(rt, acct(role).email, acct(role).password)
    await a.get('/api/users').expect(403)
    await a.post('/api/users/invitations').send({ email: `x-${role}@calder-ridge.example`, name: 'X', role: 'staff' }).expect(403)
    await a.patch(`/api/users/${1}`).send({ role: 'admin' }).expect(403)
  })
  it('anonymous callers get 401', async () => {
    const a = await apiAgent(rt)
    await a.get('/api/users').expect(401)
  })
  it('the admin lists the organization', async () => {
    const res = await admin.get('/api/users').expect(200)
    expect(res.body.users.map((u: { email: string }) => u.email)).toEqual(expect.arrayContaining(DEMO_ACCOUNTS.map((a) => a.email)))
  })
})

describe('organization isolation', () => {
  it("another organization's users are never visible and cannot be changed (404)", async () => {
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const otherAdmin = await signIn(rt, other.users.admin.email, other.password)
    const list = await otherAdmin.get('/api/users').expect(200)
    expect(list.body.users.some((u: { email: string }) => u.email.endsWith('calder-ridge.example'))).toBe(false)
    const demoStaffId = (await admin.get('/api/users')).body.users.find((u: { role: string }) => u.role === 'staff').id
    await otherAdmin.patch(`/api/users/${demoStaffId}`).send({ role: 'admin' }).expect(404)
  })
})

describe('invitations', () => {
  it('e-mails a signed link over SMTP that works once and then no more', async () => {
    const email = `new.officer.${Date.now()}@calder-ridge.example`
    await admin.post('/api/users/invitations').send({ email, name: 'Noor <b>Asante</b>', role: 'ehs_officer' }).expect(202)
    expect((await admin.get('/api/users').expect(200)).body.users.find((u: { email: string }) => u.email === email).status).toBe('invited')
    await admin.post('/api/users/invitations').send({ email, name: 'Again', role: 'staff' }).expect(409)

    const mail = await waitForMail(rt.ctx.db, email, /invited/i)
    expect(mail.html_body).toContain('Noor &lt;b&gt;Asante&lt;/b&gt;')
    expect(mail.text_body).toMatch(/screening estimate/i)
    const token = new URL(linkFrom(mail.text_body, '/invite?token=')).searchParams.get('token')!

    const invitee = await apiAgent(rt)
    const info = await invitee.get(`/api/auth/token-info?token=${encodeURIComponent(token)}`).expect(200)
    expect(info.body).toMatchObject({ purpose: 'invite', email })
    const short = await invitee.post('/api/auth/accept-invitation').send({ token, name: 'Noor Asante', password: 'short' }).expect(400)
    expect(short.body.error.fields).toHaveProperty('password')
    const me = await invitee.post('/api/auth/accept-invitation').send({ token, name: 'Noor Asante', password: 'a-long-password-1' }).expect(200)
    expect(me.body).toMatchObject({ email, role: 'ehs_officer' })
    await invitee.get('/api/auth/me').expect(200)
    await (await apiAgent(rt)).post('/api/auth/accept-invitation').send({ token, name: 'Mallory', password: 'a-long-password-2' }).expect(410)
  })

  it('malformed invitations get 400 naming each field', async () => {
    const res = await admin.post('/api/users/invitations').send({ email: 'nope', role: 'overlord' }).expect(400)
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'name', 'role'])
  })
})

describe('changing and deactivating accounts', () => {
  it('changes a role and deactivation ends the sessions at once', async () => {
    const email = `temp.${Date.now()}@calder-ridge.example`
    await admin.post('/api/users/invitations').send({ email, name: 'Temp Person', role: 'staff' }).expect(202)
    const invited = (await admin.get('/api/users').expect(200)).body.users.find((u: { email: string }) => u.email === email)
    const mail = await waitForMail(rt.ctx.db, email, /invited/i)
    const token = new URL(linkFrom(mail.text_body, '/invite?token=')).searchParams.get('token')!
    const person = await apiAgent(rt)
    await person.post('/api/auth/accept-invitation').send({ token, name: 'Temp Person', password: 'temp-password-1' }).expect(200)

    const changed = await admin.patch(`/api/users/${invited.id}`).send({ role: 'lab_manager' }).expect(200)
    expect(changed.body.role).toBe('lab_manager')
    expect((await person.get('/api/auth/me').expect(200)).body.role).toBe('lab_manager')

    await admin.patch(`/api/users/${invited.id}`).send({ active: false }).expect(200)
    await person.get('/api/auth/me').expect(401)
    const again = await apiAgent(rt)
    await again.post('/api/auth/login').send({ email, password: 'temp-password-1' }).expect(401)
  })
  it('refuses to remove the last active admin', async () => {
    // An organization of its own: other test files add admins to the demo organization.
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const soleAdmin = await signIn(rt, other.users.admin.email, other.password)
    const res = await soleAdmin.patch(`/api/users/${other.users.admin.id}`).send({ role: 'staff' }).expect(409)
    expect(res.body.error.code).toBe('last_admin')
  })
  it('an empty change names the problem', async () => {
    const res = await admin.patch('/api/users/1').send({}).expect(400)
    expect(res.body.error.message).toMatch(/not valid/)
  })
  it('a bad id is a 400 for the id', async () => {
    const res = await admin.patch('/api/users/abc').send({ role: 'staff' }).expect(400)
    expect(res.body.error.fields).toHaveProperty('params.id')
  })
})
