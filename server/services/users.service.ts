import { ROLE_LABELS } from '../../shared/schemas/common'
import type { Invitation, InvitationSent, UserSummary, UserUpdate } from '../../shared/schemas/users'
import type { UsersTable } from '../db/tables/foundation'
import { AppError, conflict, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { composeMail } from '../mail/compose'
import { appendAudit } from '../repositories/audit.repo'
import { findOutgoingByRef } from '../repositories/mail.repo'
import { findOrg } from '../repositories/orgs.repo'
import {
  findInvitationInOrg, findOpenInvitation, insertInvitation, listOpenInvitations, updateInvitation,
} from '../repositories/invitations.repo'
import {
  countActiveAdmins, deleteSessionsOfUser, findUserByEmail, findUserInOrg, listUsersInOrg, updateUser,
} from '../repositories/users.repo'
import type { ServiceContext } from './context'
import { draftLink } from './signed-links'

const INVITE_TTL_S = 7 * 24 * 3600

export function toUserSummary(u: Pick<UsersTable, 'email' | 'name' | 'role' | 'status'> & { id: number; created_at: Date | string }): UserSummary {
  return { id: u.id, email: u.email, name: u.name, role: u.role, status: u.status, createdAt: new Date(u.created_at).toISOString() }
}

type OpenInvitation = Awaited<ReturnType<typeof listOpenInvitations>>[number]
/** An invitation not yet accepted reads as an invited (or, when revoked, deactivated) person, the same for every address. */
const invitationStatus = (s: OpenInvitation['status']) => (s === 'revoked' ? 'deactivated' as const : 'invited' as const)
const invitationSummary = (i: OpenInvitation): UserSummary => toUserSummary({ ...i, status: invitationStatus(i.status) })

export async function listUsers(ctx: ServiceContext, actor: Actor) {
  const [accounts, invitations] = await Promise.all([listUsersInOrg(ctx.db, actor.orgId), listOpenInvitations(ctx.db, actor.orgId)])
  const users = [...accounts.map(toUserSummary), ...invitations.map(invitationSummary)]
  return { users: users.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : a.id - b.id)) }
}

const STATUS_WORDS = { invited: 'invited, not yet signed in', active: 'active', deactivated: 'deactivated' } as const

/** One answer for a new address and for one already used in another organization (nothing tells them apart). */
const sentAnswer = (email: string): InvitationSent => ({
  email,
  message: `An invitation is on its way to ${email}. The link works once and expires in 7 days; the person appears in the list as invited.`,
})

/**
 * Creates an invited account and e-mails a signed link where the person sets a password. An address of this
 * organization is refused by name (its admin knows their own people); an address with an account in another
 * organization gets the same answer as a new one and its owner a short notice instead, so nobody learns it exists.
 */
export async function inviteUser(ctx: ServiceContext, actor: Actor, input: Invitation): Promise<InvitationSent> {
  const existing = await findUserByEmail(ctx.db, input.email)
  const invited = existing?.org_id === actor.orgId ? undefined : await findInvitationInOrg(ctx.db, actor.orgId, input.email)
  const mine = existing?.org_id === actor.orgId ? existing
    : invited && invited.status !== 'accepted' ? { name: invited.name, status: invitationStatus(invited.status) } : undefined
  if (mine) {
    const words = STATUS_WORDS[mine.status]
    throw new AppError(409, 'email_taken', `This address already belongs to ${mine.name} in your organization (${words})`,
      { email: `Already used by ${mine.name} (${words})` })
  }
  const org = await findOrg(ctx.db, actor.orgId)
  const orgName = org?.name ?? 'an organization'
  const subject = `You are invited to ${org?.name ?? 'Driftwarden'} on Driftwarden`
  // Every invitation is stored the same way, so the inviting organization's list shows it alike for every address;
  // only an address without an account gets a working link (one organization per address).
  const link = existing ? null : draftLink(INVITE_TTL_S)
  await ctx.db.transaction().execute(async (trx) => {
    const invitation = await insertInvitation(trx, {
      orgId: actor.orgId, email: input.email, name: input.name, role: input.role,
      nonceHash: link?.nonceHash ?? null, expiresAt: link?.expiresAt ?? new Date(Date.now() + INVITE_TTL_S * 1000), invitedBy: actor.id,
    })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'user.invited', targetType: 'user', targetId: invitation.id, detail: { role: input.role } })
    if (!link) return
    const token = link.sign(ctx.linkSecret, invitation.id)
    const mail = composeMail({
      subject,
      greeting: `Hello ${input.name},`,
      paragraphs: [
        `${actor.name} invited you to join ${orgName} on Driftwarden with the role “${ROLE_LABELS[input.role]}”.`,
        'Open the link below to choose your password. The link works once and expires in 7 days.',
      ],
      action: { label: 'Set your password', url: `${ctx.publicUrl()}/invite?token=${encodeURIComponent(token)}` },
    })
    await ctx.mail.queue(trx, { orgId: actor.orgId, kind: 'invitation', ref: `user:${invitation.id}`, to: invitation.email, ...mail })
  })
  if (existing) {
    const ref = `invite-existing:org:${actor.orgId}:user:${existing.id}`
    // One notice a day per inviting organization, so repeated invitations cannot flood the owner's mailbox.
    const recent = (await findOutgoingByRef(ctx.db, ref)).some((m) => Date.now() - new Date(m.created_at).getTime() < 24 * 3600_000)
    if (!recent) await ctx.db.transaction().execute(async (trx) => {
      const mail = composeMail({
        subject,
        greeting: `Hello ${existing.name},`,
        paragraphs: [
          `${actor.name} of ${orgName} tried to invite this address to Driftwarden. It already has an account with another organization, so no new account was made and nothing about your account changed.`,
          `An address can belong to one organization only. If you want to join ${orgName} as well, ask them to invite another address of yours; if you did not expect this, you can ignore this message.`,
        ],
      })
      // Queued under the inviting organization with the invitation's subject: its outbox reads as for a new address.
      await ctx.mail.queue(trx, { orgId: actor.orgId, kind: 'invitation', ref, to: existing.email, ...mail })
      // Recorded for the account's own organization, not the inviter's.
      await appendAudit(trx, { orgId: existing.org_id, actorId: null, action: 'user.invited_elsewhere', targetType: 'user', targetId: existing.id,
        detail: { byOrgId: actor.orgId } })
    })
  }
  return sentAnswer(input.email.toLowerCase())
}

export async function changeUser(ctx: ServiceContext, actor: Actor, id: number, patch: UserUpdate): Promise<UserSummary> {
  const user = await findUserInOrg(ctx.db, actor.orgId, id)
  if (!user) return changeInvitation(ctx, actor, id, patch)
  const losesAdmin = user.role === 'admin' && user.status === 'active' && ((patch.role && patch.role !== 'admin') || patch.active === false)
  if (losesAdmin && (await countActiveAdmins(ctx.db, actor.orgId)) <= 1) {
    throw conflict('The organization needs at least one active administrator', 'last_admin')
  }
  let status = user.status
  if (patch.active === false) status = 'deactivated'
  if (patch.active === true && user.status === 'deactivated') status = user.password_hash ? 'active' : 'invited'
  const updated = await updateUser(ctx.db, actor.orgId, id, { role: patch.role, name: patch.name, status })
  if (status === 'deactivated') await deleteSessionsOfUser(ctx.db, id)
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'user.changed', targetType: 'user', targetId: id, detail: { ...patch } })
  return toUserSummary(updated!)
}

/** An open invitation changes like an invited account did: role and name, and `active: false` revokes its link. */
async function changeInvitation(ctx: ServiceContext, actor: Actor, id: number, patch: UserUpdate): Promise<UserSummary> {
  const invitation = await findOpenInvitation(ctx.db, actor.orgId, id)
  if (!invitation) throw notFound('User')
  const status = patch.active === false ? 'revoked' : patch.active === true ? 'pending' : invitation.status
  const updated = await updateInvitation(ctx.db, actor.orgId, id, { role: patch.role, name: patch.name, status })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'user.changed', targetType: 'user', targetId: id, detail: { ...patch } })
  return invitationSummary(updated!)
}
