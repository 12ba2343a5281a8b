import { ROLE_LABELS } from '../../shared/schemas/common'
import type { Invitation, UserSummary, UserUpdate } from '../../shared/schemas/users'
import type { UsersTable } from '../db/tables/foundation'
import { AppError, conflict, notFound } from '../http/errors'
import type { Actor } from '../http/session-user'
import { composeMail } from '../mail/compose'
import { appendAudit } from '../repositories/audit.repo'
import { findOrg } from '../repositories/orgs.repo'
import {
  countActiveAdmins, deleteSessionsOfUser, findUserByEmail, findUserInOrg, insertUser, listUsersInOrg, updateUser,
} from '../repositories/users.repo'
import type { ServiceContext } from './context'
import { issueLink } from './signed-links'

const INVITE_TTL_S = 7 * 24 * 3600

export function toUserSummary(u: Pick<UsersTable, 'email' | 'name' | 'role' | 'status'> & { id: number; created_at: Date | string }): UserSummary {
  return { id: u.id, email: u.email, name: u.name, role: u.role, status: u.status, createdAt: new Date(u.created_at).toISOString() }
}

export async function listUsers(ctx: ServiceContext, actor: Actor) {
  return { users: (await listUsersInOrg(ctx.db, actor.orgId)).map(toUserSummary) }
}

/** Creates an invited account and e-mails a signed link where the person sets a password. */
export async function inviteUser(ctx: ServiceContext, actor: Actor, input: Invitation): Promise<UserSummary> {
  if (await findUserByEmail(ctx.db, input.email)) {
    throw new AppError(409, 'email_taken', 'Someone already has an account with this e-mail', { email: 'Already in use' })
  }
  return ctx.db.transaction().execute(async (trx) => {
    const user = await insertUser(trx, { orgId: actor.orgId, email: input.email, name: input.name, role: input.role, status: 'invited', passwordHash: null })
    const org = await findOrg(trx, actor.orgId)
    const token = await issueLink(trx, ctx.linkSecret, user.id, 'invite', INVITE_TTL_S)
    const mail = composeMail({
      subject: `You are invited to ${org?.name ?? 'Driftwarden'} on Driftwarden`,
      greeting: `Hello ${input.name},`,
      paragraphs: [
        `${actor.name} invited you to join ${org?.name ?? 'your organization'} on Driftwarden with the role “${ROLE_LABELS[input.role]}”.`,
        'Open the link below to choose your password. The link works once and expires in 7 days.',
      ],
      action: { label: 'Set your password', url: `${ctx.publicUrl()}/invite?token=${encodeURIComponent(token)}` },
    })
    await ctx.mail.queue(trx, { orgId: actor.orgId, kind: 'invitation', ref: `user:${user.id}`, to: user.email, ...mail })
    await appendAudit(trx, { orgId: actor.orgId, actorId: actor.id, action: 'user.invited', targetType: 'user', targetId: user.id, detail: { role: input.role } })
    return toUserSummary(user)
  })
}

export async function changeUser(ctx: ServiceContext, actor: Actor, id: number, patch: UserUpdate): Promise<UserSummary> {
  const user = await findUserInOrg(ctx.db, actor.orgId, id)
  if (!user) throw notFound('User')
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
