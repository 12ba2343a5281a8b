import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { findOutgoingByRef } from '../../server/repositories/mail.repo'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { apiAgent, createOtherOrg, linkFrom, signIn, startTestRuntime, waitForMail, type ApiAgent } from '../support/test-runtime'

// Issue 14 item 8, last point: an admin inviting an address that has an account in another organization must not
// learn that it exists. The answer is the one a new address gets; the account's owner is told instead.
const acct = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!

let rt: Runtime
let admin: ApiAgent
let other: Awaited<ReturnType<typeof createOtherOrg>>
beforeAll(async () => {
  rt = await startTestRuntime()
  admin = await signIn(rt, acct('admin').email, acct('admin').password)
  other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
})
afterAll(() => rt.close())

/** What an inviting admin can see of an answer, with the address itself taken out. */
const seen = (res: { status: number; body: unknown; headers: Record<string, string> }, email: string) => ({
  status: res.status, contentType: res.headers['content-type'],
  body: JSON.parse(JSON.stringify(res.body).split(email).join('<address>')),
})

const signInByInvitation = async (r: Runtime, token: string) =>
  (await apiAgent(r)).post('/api/auth/accept-invitation').send({ token, name: 'Joiner Person', password: 'a-long-joiner-password-7' })

describe('inviting an address with an account elsewhere', () => {
  it('answers exactly as for a new address (202, same shape and words); the owner gets a notice without a link, the account is untouched', async () => {
    const fresh = `fresh.${Date.now()}@calder-ridge.example`
    const taken = other.users.staff.email
    const a = await admin.post('/api/users/invitations').send({ email: fresh, name: 'Fresh Person', role: 'staff' })
    const b = await admin.post('/api/users/invitations').send({ email: taken, name: 'Taken Person', role: 'staff' })
    expect(a.status).toBe(202)
    expect(seen(b, taken)).toEqual(seen(a, fresh))
    expect(Object.keys(b.body).sort()).toEqual(['email', 'message'])

    // The inviting org's list shows both as invited rows of the same shape (old code listed no row for the taken one).
    const list = (await admin.get('/api/users').expect(200)).body.users as Record<string, unknown>[]
    const rowOf = (email: string, name: string) => {
      const rows = list.filter((u) => u.email === email)
      expect(rows).toHaveLength(1)
      const { id, createdAt, ...rest } = rows[0]!
      expect(typeof id).toBe('number')
      expect(Number.isNaN(Date.parse(String(createdAt)))).toBe(false)
      return JSON.parse(JSON.stringify({ ...rest, keys: Object.keys(rows[0]!).sort() }).split(email).join('<address>').split(name).join('<name>'))
    }
    expect(rowOf(taken, 'Taken Person')).toEqual(rowOf(fresh, 'Fresh Person'))
    expect(rowOf(taken, 'Taken Person')).toMatchObject({ status: 'invited', role: 'staff' })

    // The other organization's account is unchanged and still signs in; the invitation is stored apart from it.
    const row = await rt.ctx.db.selectFrom('users').select(['org_id', 'status', 'role']).where('email', '=', taken).executeTakeFirstOrThrow()
    expect(row).toEqual({ org_id: other.orgId, status: 'active', role: 'staff' })
    await signIn(rt, taken, other.password)

    // The owner is told, in words, with the caution, and gets no working invitation link.
    const notice = await waitForMail(rt.ctx.db, taken, /invited/i)
    expect(notice.text_body).toMatch(/already has an account with another organization/)
    expect(notice.text_body).toMatch(/nothing about your account changed/)
    expect(notice.text_body).not.toContain('/invite?token=')
    expect(notice.text_body).toMatch(/screening estimate/i)
    const invitation = await waitForMail(rt.ctx.db, fresh, /invited/i)
    expect(invitation.text_body).toContain('/invite?token=')
    expect(notice.subject).toBe(invitation.subject)

    // The inviting admin's outbox reads alike for both: same subject, both queued for delivery.
    const outbox = (await admin.get('/api/admin/outgoing-mail').expect(200)).body.messages as { to: string; subject: string }[]
    expect(outbox.find((m) => m.to === taken)?.subject).toBe(outbox.find((m) => m.to === fresh)?.subject)

    // Asking again answers as it does for the new address (the invitation is already in the list: 409 naming it)
    // and does not flood the owner: one notice a day per inviting organization.
    const againFresh = await admin.post('/api/users/invitations').send({ email: fresh, name: 'Fresh Person', role: 'ehs_officer' })
    const again = await admin.post('/api/users/invitations').send({ email: taken, name: 'Taken Person', role: 'ehs_officer' })
    expect(againFresh.status).toBe(409)
    const masked = (res: Parameters<typeof seen>[0], email: string, name: string) => JSON.parse(JSON.stringify(seen(res, email)).split(name).join('<name>'))
    expect(masked(again, taken, 'Taken Person')).toEqual(masked(againFresh, fresh, 'Fresh Person'))
    const demoOrgId = (await rt.ctx.db.selectFrom('users').select('org_id').where('email', '=', acct('admin').email).executeTakeFirstOrThrow()).org_id
    expect(await findOutgoingByRef(rt.ctx.db, `invite-existing:org:${demoOrgId}:user:${other.users.staff.id}`)).toHaveLength(1)

    // The attempt is in the account's own organization's audit, not the inviter's.
    const audit = await rt.ctx.db.selectFrom('audit_log').select(['org_id']).where('action', '=', 'user.invited_elsewhere').where('target_id', '=', String(other.users.staff.id)).execute()
    expect(audit.map((r) => r.org_id)).toEqual([other.orgId])
  })

  it('accepting a link creates the account in the inviting organization with the invitation\'s id and role', async () => {
    const email = `joiner.${Date.now()}@calder-ridge.example`
    await admin.post('/api/users/invitations').send({ email, name: 'Joiner', role: 'lab_manager' }).expect(202)
    const row = ((await admin.get('/api/users').expect(200)).body.users as { id: number; email: string; status: string }[]).find((u) => u.email === email)!
    expect(await rt.ctx.db.selectFrom('users').select('id').where('email', '=', email).executeTakeFirst()).toBeUndefined()
    const mail = await waitForMail(rt.ctx.db, email, /invited/i)
    const token = new URL(linkFrom(mail.text_body, '/invite?token=')).searchParams.get('token')!
    const person = await signInByInvitation(rt, token)
    expect(person.status).toBe(200)
    const after = ((await admin.get('/api/users').expect(200)).body.users as { id: number; email: string; status: string; role: string }[]).filter((u) => u.email === email)
    expect(after).toEqual([expect.objectContaining({ id: row.id, status: 'active', role: 'lab_manager', name: 'Joiner Person' })])
  })

  it("an address of the admin's own organization is still refused by name (409 email_taken beside the field)", async () => {
    const staff = acct('staff')
    const res = await admin.post('/api/users/invitations').send({ email: staff.email, name: 'Again', role: 'staff' }).expect(409)
    expect(res.body.error.code).toBe('email_taken')
    expect(res.body.error.fields.email).toContain(staff.name)
    expect(res.body.error.message).toMatch(/your organization/)
  })
})
