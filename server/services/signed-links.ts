import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto'
import type { Db } from '../db/database'
import { gone } from '../domain/errors'
import { consumeToken, findToken, insertToken, retireTokens } from '../repositories/tokens.repo'
import { findInvitationById } from '../repositories/invitations.repo'

export type LinkPurpose = 'invite' | 'reset'

/** What the database keeps of a link's nonce: its hash, so a database leak does not leak working links. */
export const hashNonce = (s: string) => createHash('sha256').update(s).digest('base64url')
const sign = (secret: string, payload: string) => createHmac('sha256', secret).update(payload).digest('base64url')

/** `<id>.<nonce>.<purpose>.<expires>.<hmac>`: the HMAC covers everything before it. */
export function signToken(secret: string, id: number, nonce: string, purpose: string, expiresAt: Date): string {
  const payload = `${id}.${nonce}.${purpose}.${Math.floor(expiresAt.getTime() / 1000)}`
  return `${payload}.${sign(secret, payload)}`
}

/**
 * Checks a token's shape, signature, purpose and expiry (not yet its stored state); throws 410 otherwise.
 * Returns the record id and the hash of the nonce to compare with what the database holds.
 */
export function verifyTokenSignature(
  secret: string, token: string, purpose: string, now: Date,
  messages: { invalid: string; expired: string } = { invalid: 'This link is not valid any more. Ask for a new one.', expired: 'This link has expired. Ask for a new one.' },
): { id: number; nonceHash: string } {
  const parts = token.split('.')
  if (parts.length !== 5) throw gone(messages.invalid)
  const [idText, nonce, p, exp, mac] = parts as [string, string, string, string, string]
  const expected = Buffer.from(sign(secret, `${idText}.${nonce}.${p}.${exp}`))
  const given = Buffer.from(mac)
  if (expected.length !== given.length || !timingSafeEqual(expected, given) || p !== purpose || !/^\d+$/.test(idText)) throw gone(messages.invalid)
  if (Number(exp) * 1000 < now.getTime()) throw gone(messages.expired)
  return { id: Number(idText), nonceHash: hashNonce(nonce) }
}

/**
 * Signed, single-use, expiring links: `<id>.<nonce>.<purpose>.<expires>.<hmac>`.
 * The signature stops forgery; the stored nonce hash and used_at make each link work once.
 */
export async function issueLink(db: Db, secret: string, userId: number, purpose: LinkPurpose, ttlSeconds: number): Promise<string> {
  await retireTokens(db, userId, purpose)
  const nonce = randomBytes(18).toString('base64url')
  const expiresAt = new Date(Date.now() + ttlSeconds * 1000)
  const { id } = await insertToken(db, { userId, purpose, nonceHash: hashNonce(nonce), expiresAt })
  return signToken(secret, id, nonce, purpose, expiresAt)
}

/** Checks a link without using it up; throws 410 when it is invalid, used or expired. */
export async function inspectLink(db: Db, secret: string, token: string, purpose: LinkPurpose) {
  const { id, nonceHash } = verifyTokenSignature(secret, token, purpose, new Date())
  const row = await findToken(db, id)
  if (!row || row.purpose !== purpose || row.nonce_hash !== nonceHash) throw gone('This link is not valid any more. Ask for a new one.')
  if (row.used_at) throw gone('This link has already been used.')
  if (new Date(row.expires_at).getTime() < Date.now()) throw gone('This link has expired. Ask for a new one.')
  return row
}

/** Inspects and uses up a link in one step; a second use (even a racing one) is refused. */
export async function redeemLink(db: Db, secret: string, token: string, purpose: LinkPurpose) {
  const row = await inspectLink(db, secret, token, purpose)
  if (!(await consumeToken(db, row.id))) throw gone('This link has already been used.')
  return row
}

/** The purpose of an invitation link (the id is the invitation's, not an auth token's; older 'invite' links name a token). */
export const INVITATION_PURPOSE = 'join'

/** A fresh nonce for a link whose record is stored elsewhere (invitations); sign it once the record has its id. */
export function draftLink(ttlSeconds: number) {
  const nonce = randomBytes(18).toString('base64url')
  const expiresAt = new Date(Date.now() + ttlSeconds * 1000)
  return { nonceHash: hashNonce(nonce), expiresAt, sign: (secret: string, id: number) => signToken(secret, id, nonce, INVITATION_PURPOSE, expiresAt) }
}

/** Checks an invitation link against its stored record without using it; throws 410 when invalid, used or expired. */
export async function inspectInvitationLink(db: Db, secret: string, token: string) {
  const { id, nonceHash } = verifyTokenSignature(secret, token, INVITATION_PURPOSE, new Date())
  const row = await findInvitationById(db, id)
  if (!row || row.nonce_hash === null || row.nonce_hash !== nonceHash) throw gone('This link is not valid any more. Ask for a new one.')
  if (row.used_at || row.status === 'accepted') throw gone('This link has already been used.')
  if (new Date(row.expires_at).getTime() < Date.now()) throw gone('This link has expired. Ask for a new one.')
  return row
}
