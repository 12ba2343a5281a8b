import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { listCapturedTo } from '../../server/repositories/mail.repo'
import { findUserByEmail, insertUser } from '../../server/repositories/users.repo'
import { hashPassword } from '../../server/services/passwords'
import { launchBrowser, shot, signInThroughForm as signIn } from '../support/browser'
import { startTestServer } from '../support/test-server'

const LAPTOP = { width: 1366, height: 768 }
const TABLET = { width: 820, height: 1180 }


const account = (role: string) => {
  const found = DEMO_ACCOUNTS.find((a) => a.role === role)
  if (!found) throw new Error(`No demo account for ${role}`)
  return found
}

describe('client shell', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
  })

  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  /** A fresh browser context (no cookies) that fails the test on any page error or console error. */
  async function openPage(viewport: { width: number; height: number }): Promise<{ context: BrowserContext; page: Page; problems: string[] }> {
    const context = await browser.newContext({ viewport })
    const page = await context.newPage()
    const problems: string[] = []
    page.on('pageerror', (error) => problems.push(`pageerror: ${error.message}`))
    page.on('console', (message) => {
      // The expected 401 from "who am I" while signed out is logged by the browser as a failed resource.
      if (message.type() === 'error' && !/401/.test(message.text())) problems.push(`console: ${message.text()}`)
    })
    return { context, page, problems }
  }



  it('when signed out, a deep link leads to sign-in and back after signing in', async () => {
    const { context, page, problems } = await openPage(LAPTOP)
    const admin = account('admin')
    await page.goto(`${server.url}/admin/users`)
    await page.getByRole('heading', { name: 'Sign in' }).waitFor()
    expect(new URL(page.url()).searchParams.get('redirect')).toBe('/admin/users')
    await shot(page, 'shell-sign-in-1366')

    await signIn(page, admin.email, 'not-the-password')
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/do not match/)
    await shot(page, 'shell-sign-in-wrong-1366')

    await signIn(page, admin.email, admin.password)
    await page.getByRole('heading', { name: 'Users' }).waitFor()
    expect(new URL(page.url()).pathname).toBe('/admin/users')

    await page.goto(`${server.url}/no/such/page`)
    await page.getByRole('heading', { name: 'Page not found' }).waitFor()
    await page.getByRole('link', { name: 'Go to the overview' }).click()
    await page.getByRole('heading', { name: /^Welcome,/ }).waitFor()
    expect(problems).toEqual([])
    await context.close()
  })

  it('as the demo admin, shows the shell with the admin navigation and the users table at laptop width', async () => {
    const { context, page, problems } = await openPage(LAPTOP)
    const admin = account('admin')
    await page.goto(`${server.url}/`)
    await signIn(page, admin.email, admin.password)

    await page.getByRole('heading', { name: /^Welcome,/ }).waitFor()
    await expect.poll(() => page.getByTestId('user-menu').textContent()).toContain(admin.name)
    const nav = page.getByRole('navigation', { name: 'Main' })
    await expect.poll(() => nav.getByRole('link', { name: 'Overview' }).isVisible()).toBe(true)
    await expect.poll(() => nav.getByRole('link', { name: 'Users' }).isVisible()).toBe(true)
    await expect.poll(() => nav.getByRole('link', { name: 'Outbox' }).isVisible()).toBe(true)
    await shot(page, 'shell-overview-admin-1366')
    const caution = page.getByRole('region', { name: 'Screening estimate, not a safety determination' })
    await caution.getByRole('button', { name: 'Read the full caution' }).click()
    await expect.poll(() => caution.textContent()).toContain('authority having jurisdiction govern')
    await caution.scrollIntoViewIfNeeded()
    await shot(page, 'shell-caution-expanded-1366')

    await nav.getByRole('link', { name: 'Users' }).click()
    await page.getByRole('heading', { name: 'Users' }).waitFor()
    const table = page.getByTestId('users-table')
    for (const demo of DEMO_ACCOUNTS) await expect.poll(() => table.textContent()).toContain(demo.email)
    await shot(page, 'shell-users-1366')

    await page.getByRole('button', { name: 'Invite a person' }).click()
    await page.getByRole('dialog').getByRole('heading', { name: 'Invite a person' }).waitFor()
    await shot(page, 'shell-invite-dialog-1366')
    await page.getByRole('dialog').getByRole('button', { name: 'Cancel' }).click()

    await page.getByTestId('user-menu').click()
    await page.getByRole('button', { name: 'Sign out' }).waitFor()
    await shot(page, 'shell-user-menu-1366')
    expect(problems).toEqual([])
    await context.close()
  })

  it('at tablet width, the drawer starts closed and opens from the menu button', async () => {
    const { context, page, problems } = await openPage(TABLET)
    const admin = account('admin')
    await page.goto(`${server.url}/admin/users`)
    await signIn(page, admin.email, admin.password)
    await page.getByRole('heading', { name: 'Users' }).waitFor()
    const usersLink = page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' })
    await expect.poll(() => usersLink.isVisible()).toBe(false)
    await shot(page, 'shell-users-820')

    await page.getByRole('button', { name: 'Show or hide navigation' }).click()
    await expect.poll(() => usersLink.isVisible()).toBe(true)
    await shot(page, 'shell-drawer-820')
    expect(problems).toEqual([])
    await context.close()
  })

  it('as staff, hides the admin navigation and refuses the users page', async () => {
    const { context, page, problems } = await openPage(LAPTOP)
    const staff = account('staff')
    await page.goto(`${server.url}/`)
    await signIn(page, staff.email, staff.password)
    await page.getByRole('heading', { name: /^Welcome,/ }).waitFor()
    const nav = page.getByRole('navigation', { name: 'Main' })
    await expect.poll(() => nav.getByRole('link', { name: 'Overview' }).isVisible()).toBe(true)
    expect(await nav.getByRole('link', { name: 'Users' }).count()).toBe(0)

    await page.goto(`${server.url}/admin/users`)
    await page.getByRole('heading', { name: 'Not available for your role' }).waitFor()
    await shot(page, 'shell-not-allowed-staff-1366')
    expect(problems).toEqual([])
    await context.close()
  })

  it('a password reset e-mail shows in the outbox, and its link lets the person choose a new password', async () => {
    // A person of its own, so the demo accounts keep their passwords for the other browser tests.
    const manager = { email: `forgetful.${Date.now()}@calder-ridge.example` }
    const orgId = (await findUserByEmail(server.rt.ctx.db, account('admin').email))!.org_id
    await insertUser(server.rt.ctx.db, { orgId, email: manager.email, name: 'Forgetful Lab Manager', role: 'lab_manager', status: 'active', passwordHash: await hashPassword('an-old-password-1', server.rt.ctx.config.argon2) })
    const visitor = await openPage(LAPTOP)
    await visitor.page.goto(`${server.url}/sign-in`)
    await visitor.page.getByRole('link', { name: 'Forgot password?' }).click()
    await visitor.page.getByLabel('E-mail address').fill(manager.email)
    await visitor.page.getByRole('button', { name: 'Send the link' }).click()
    await expect.poll(() => visitor.page.getByRole('status').textContent()).toContain(manager.email)

    const adminView = await openPage(LAPTOP)
    const admin = account('admin')
    await adminView.page.goto(`${server.url}/admin/outbox`)
    await signIn(adminView.page, admin.email, admin.password)
    await adminView.page.getByRole('heading', { name: 'Outbox' }).waitFor()
    const managerMail = adminView.page.getByTestId('captured-mail-item').filter({ hasText: manager.email }).first()
    await expect
      .poll(
        async () => {
          if (await managerMail.count()) return true
          await adminView.page.getByRole('button', { name: 'Refresh' }).click()
          return false
        },
        { timeout: 30_000, interval: 1_000 },
      )
      .toBe(true)
    await managerMail.click()
    const body = (await adminView.page.locator('article pre').textContent()) ?? ''
    await shot(adminView.page, 'shell-outbox-1366')
    // The outbox hides another person's working reset link (issue 14); the person's own mailbox has it.
    expect(body).toContain('reset-password?token=[hidden')
    const mail = (await listCapturedTo(server.rt.ctx.db, manager.email)).find((m) => /reset/i.test(m.subject))!
    const link = mail.text_body.match(/https?:\/\/\S+\/reset-password\?token=[^\s]+/)?.[0]
    expect(link, mail.text_body).toBeTruthy()

    await visitor.page.goto(link!)
    await expect.poll(() => visitor.page.getByRole('main').textContent()).toContain(manager.email)
    await shot(visitor.page, 'shell-reset-password-1366')
    const newPassword = 'a-fresh-manager-password'
    await visitor.page.getByLabel('New password', { exact: true }).fill(newPassword)
    await visitor.page.getByLabel('Repeat the new password').fill(newPassword)
    await visitor.page.getByRole('button', { name: 'Save new password' }).click()
    await visitor.page.getByRole('heading', { name: 'Sign in' }).waitFor()
    await visitor.page.getByLabel('Password', { exact: true }).fill(newPassword)
    await visitor.page.getByRole('button', { name: 'Sign in' }).click()
    await visitor.page.getByRole('heading', { name: /^Welcome,/ }).waitFor()
    await shot(visitor.page, 'shell-overview-manager-1366')
    expect([...visitor.problems, ...adminView.problems]).toEqual([])
    await visitor.context.close()
    await adminView.context.close()
  })

  it('an invited person accepts from the e-mailed link, and the admin can then deactivate them', async () => {
    const admin = account('admin')
    const invitee = { email: 'new.chemist@calder-ridge.example', name: 'Noor <b>Amari</b>' }
    const adminView = await openPage(LAPTOP)
    await adminView.page.goto(`${server.url}/admin/users`)
    await signIn(adminView.page, admin.email, admin.password)
    await adminView.page.getByRole('button', { name: 'Invite a person' }).click()
    const dialog = adminView.page.getByRole('dialog')
    await dialog.getByLabel('E-mail address').fill(invitee.email)
    await dialog.getByLabel('Name').fill(invitee.name)
    await dialog.getByRole('button', { name: 'Send invitation' }).click()
    const row = adminView.page.getByTestId('users-table').locator('tr', { hasText: invitee.email })
    // Markup typed into a name is shown as text, never interpreted.
    await expect.poll(() => row.textContent()).toContain('Noor <b>Amari</b>')
    await expect.poll(() => row.textContent()).toContain('Invited')

    await adminView.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outbox' }).click()
    const inviteMail = adminView.page.getByTestId('captured-mail-item').filter({ hasText: invitee.email }).first()
    await expect
      .poll(
        async () => {
          if (await inviteMail.count()) return true
          await adminView.page.getByRole('button', { name: 'Refresh' }).click()
          return false
        },
        { timeout: 30_000, interval: 1_000 },
      )
      .toBe(true)
    await inviteMail.click()
    const body = (await adminView.page.locator('article pre').textContent()) ?? ''
    const link = body.match(/https?:\/\/\S+\/invite\?token=[^\s]+/)?.[0]
    expect(link, body).toBeTruthy()

    const inviteeView = await openPage(TABLET)
    await inviteeView.page.goto(link!)
    await expect.poll(() => inviteeView.page.getByRole('main').textContent()).toContain(invitee.email)
    await expect.poll(() => inviteeView.page.getByLabel('Your name').inputValue()).toBe(invitee.name)
    await shot(inviteeView.page, 'shell-accept-invitation-820')
    await inviteeView.page.getByLabel('Your name').fill('Noor Amari')
    await inviteeView.page.getByLabel('New password', { exact: true }).fill('chemist-password-1')
    await inviteeView.page.getByLabel('Repeat the new password').fill('chemist-password-1')
    await inviteeView.page.getByRole('button', { name: 'Create my account' }).click()
    await inviteeView.page.getByRole('heading', { name: 'Welcome, Noor' }).waitFor()
    await shot(inviteeView.page, 'shell-overview-staff-820')

    await adminView.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).click()
    const acceptedRow = adminView.page.getByTestId('users-table').locator('tr', { hasText: invitee.email })
    await expect.poll(() => acceptedRow.textContent()).toContain('Active')
    await acceptedRow.getByRole('button', { name: /^Manage/ }).click()
    await adminView.page.getByText('Deactivate…').click()
    await adminView.page.getByRole('dialog').getByText('Deactivate this account?').waitFor()
    await shot(adminView.page, 'shell-confirm-deactivate-1366')
    await adminView.page.getByRole('dialog').getByRole('button', { name: 'Deactivate' }).click()
    await expect.poll(() => acceptedRow.textContent()).toContain('Deactivated')
    expect([...adminView.problems, ...inviteeView.problems]).toEqual([])
    await adminView.context.close()
    await inviteeView.context.close()
  })
})
