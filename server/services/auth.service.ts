import type { AcceptInvitation, SessionUser, TokenInfo, UnitSystem } from '../../shared/schemas/auth'
import { AppError, conflict, gone, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { composeMail } from '../mail/compose'
import { appendAudit } from '../repositories/audit.repo'
import { findOrg } from '../repositories/orgs.repo'
import { consumeInvitation } from '../repositories/invitations.repo'
import { deleteSessionsOfUser, findActiveUserById, findUserByEmail, findUserById, insertUser, listUsersInOrg, updateUser } from '../repositories/users.repo'
import type { ServiceContext } from './context'
import { burnVerify, hashPassword, verifyPassword } from './passwords'
import { INVITATION_PURPOSE, inspectInvitationLink, inspectLink, issueLink, redeemLink } from './signed-links'

const RESET_TTL_S = 3600

export async function sessionUser(ctx: ServiceContext, userId: number): Promise<SessionUser> {
  const u = await findActiveUserById(ctx.db, userId)
  if (!u) throw notFound('User')
  const org = await findOrg(ctx.db, u.org_id)
  return { id: u.id, email: u.email, name: u.name, role: u.role, orgId: u.org_id, orgName: org?.name ?? '', unitSystem: u.unit_system }
}

/** Returns the user id when the credentials are right; the same 401 otherwise, whatever was wrong. */
export async function checkCredentials(ctx: ServiceContext, email: string, password: string): Promise<number> {
  const u = await findUserByEmail(ctx.db, email)
  if (!u || u.status !== 'active') {
    await burnVerify(password, ctx.config.argon2)
    throw new AppError(401, 'bad_credentials', 'Wrong e-mail or password')
  }
  if (!(await verifyPassword(u.password_hash, password))) throw new AppError(401, 'bad_credentials', 'Wrong e-mail or password')
  return u.id
}

/** Always answers the same way, so the form does not reveal which addresses have accounts. */
export async function requestPasswordReset(ctx: ServiceContext, email: string): Promise<void> {
  const u = await findUserByEmail(ctx.db, email)
  if (!u || u.status !== 'active') return
  await ctx.db.transaction().execute(async (trx) => {
    const token = await issueLink(trx, ctx.linkSecret, u.id, 'reset', RESET_TTL_S)
    const mail = composeMail({
      subject: 'Reset your Driftwarden password',
      greeting: `Hello ${u.name},`,
      paragraphs: [
        'Someone asked to reset the password of your Driftwarden account. If it was not you, ignore this message.',
        'The link works once and expires in one hour.',
      ],
      action: { label: 'Choose a new password', url: `${ctx.publicUrl()}/reset-password?token=${encodeURIComponent(token)}` },
      withCaution: false,
    })
    await ctx.mail.queue(trx, { orgId: u.org_id, kind: 'password_reset', ref: `user:${u.id}`, to: u.email, ...mail })
  })
}

export async function describeLink(ctx: ServiceContext, token: string): Promise<TokenInfo> {
  if (token.split('.')[2] === INVITATION_PURPOSE) {
    const invitation = await inspectInvitationLink(ctx.db, ctx.linkSecret, token)
    const org = await findOrg(ctx.db, invitation.org_id)
    return { purpose: 'invite', email: invitation.email, name: invitation.name, orgName: org?.name ?? '' }
  }
  const purpose = token.split('.')[2] === 'reset' ? 'reset' : 'invite'
  const row = await inspectLink(ctx.db, ctx.linkSecret, token, purpose)
  const u = await findUserById(ctx.db, row.user_id)
  const org = await findOrg(ctx.db, u.org_id)
  return { purpose, email: u.email, name: u.name, orgName: org?.name ?? '' }
}

export async function resetPassword(ctx: ServiceContext, token: string, password: string): Promise<void> {
  const row = await redeemLink(ctx.db, ctx.linkSecret, token, 'reset')
  const u = await findUserById(ctx.db, row.user_id)
  await updateUser(ctx.db, u.org_id, row.user_id, { password_hash: await hashPassword(password, ctx.config.argon2) })
  // A reset ends sessions elsewhere: whoever knew the old password is signed out.
  await deleteSessionsOfUser(ctx.db, row.user_id)
  await appendAudit(ctx.db, { orgId: u.org_id, actorId: row.user_id, action: 'user.password_reset', targetType: 'user', targetId: row.user_id })
  if (u.role === 'admin') await tellOtherAdmins(ctx, u)
}

/** An administrator's password was reset: the other administrators hear of it, so a takeover does not go unseen. */
async function tellOtherAdmins(ctx: ServiceContext, u: { id: number; org_id: number; name: string; email: string }) {
  const others = (await listUsersInOrg(ctx.db, u.org_id)).filter((o) => o.role === 'admin' && o.status === 'active' && o.id !== u.id)
  for (const o of others) {
    const mail = composeMail({
      subject: `Administrator password reset: ${u.name}`,
      greeting: `Hello ${o.name},`,
      paragraphs: [
        `The password of ${u.name} (${u.email}), an administrator of your Driftwarden organization, was just reset through an e-mailed link, and their other sessions were signed out.`,
        'If they did not expect this, deactivate the account in Users and contact them by phone.',
      ],
      withCaution: false,
    })
    await ctx.mail.queue(ctx.db, { orgId: u.org_id, kind: 'admin_password_reset', ref: `user:${u.id}`, to: o.email, ...mail })
  }
}

/**
 * Accepting an invitation creates the account in the inviting organization, with the invitation's id and role and
 * the name and password chosen; returns the user id to sign in. Links of invited accounts made before invitations
 * were stored apart (purpose 'invite') still activate their account.
 */
export async function acceptInvitation(ctx: ServiceContext, input: AcceptInvitation): Promise<number> {
  if (input.token.split('.')[2] === INVITATION_PURPOSE) return joinByInvitation(ctx, input)
  const row = await redeemLink(ctx.db, ctx.linkSecret, input.token, 'invite')
  const u = await findUserById(ctx.db, row.user_id)
  if (u.status === 'deactivated') throw new AppError(403, 'deactivated', 'This account has been deactivated')
  await updateUser(ctx.db, u.org_id, u.id, { name: input.name, status: 'active', password_hash: await hashPassword(input.password, ctx.config.argon2) })
  await appendAudit(ctx.db, { orgId: u.org_id, actorId: u.id, action: 'user.joined', targetType: 'user', targetId: u.id })
  return u.id
}

async function joinByInvitation(ctx: ServiceContext, input: AcceptInvitation): Promise<number> {
  const invitation = await inspectInvitationLink(ctx.db, ctx.linkSecret, input.token)
  if (invitation.status === 'revoked') throw new AppError(403, 'deactivated', 'This account has been deactivated')
  const passwordHash = await hashPassword(input.password, ctx.config.argon2)
  return ctx.db.transaction().execute(async (trx) => {
    if (!(await consumeInvitation(trx, invitation.id))) throw gone('This link has already been used.')
    // One organization per address: an address that has since got an account elsewhere cannot join a second one.
    if (await findUserByEmail(trx, invitation.email)) throw conflict('This address already has a Driftwarden account: sign in with it instead', 'email_taken')
    const user = await insertUser(trx, { id: invitation.id, orgId: invitation.org_id, email: invitation.email, name: input.name, role: invitation.role, status: 'active', passwordHash })
    await appendAudit(trx, { orgId: user.org_id, actorId: user.id, action: 'user.joined', targetType: 'user', targetId: user.id })
    return user.id
  })
}

export async function setUnitSystem(ctx: ServiceContext, actor: Actor, unitSystem: UnitSystem) {
  await updateUser(ctx.db, actor.orgId, actor.id, { unit_system: unitSystem })
  return sessionUser(ctx, actor.id)
}
