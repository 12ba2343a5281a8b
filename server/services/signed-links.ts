import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto'
import type { Db } from '../db/database'
import { gone } from '../http/errors'
import { consumeToken, findToken, insertToken, retireTokens } from '../repositories/tokens.repo'

export type LinkPurpose = 'invite' | 'reset'

const sha256 = (s: string) => createHash('sha256').update(s).digest('base64url')
const sign = (secret: string, payload: string) => createHmac('sha256', secret).update(payload).digest('base64url')

/**
 * Signed, single-use, expiring links: `<id>.<nonce>.<purpose>.<expires>.<hmac>`.
 * The signature stops forgery; the stored nonce hash and used_at make each link work once.
 */
export async function issueLink(db: Db, secret: string, userId: number, purpose: LinkPurpose, ttlSeconds: number): Promise<string> {
  await retireTokens(db, userId, purpose)
  const nonce = randomBytes(18).toString('base64url')
  const expiresAt = new Date(Date.now() + ttlSeconds * 1000)
  const { id } = await insertToken(db, { userId, purpose, nonceHash: sha256(nonce), expiresAt })
  const payload = `${id}.${nonce}.${purpose}.${Math.floor(expiresAt.getTime() / 1000)}`
  return `${payload}.${sign(secret, payload)}`
}

/** Checks a link without using it up; throws 410 when it is invalid, used or expired. */
export async function inspectLink(db: Db, secret: string, token: string, purpose: LinkPurpose) {
  const parts = token.split('.')
  const invalid = () => gone('This link is not valid any more. Ask for a new one.')
  if (parts.length !== 5) throw invalid()
  const [idText, nonce, p, exp, mac] = parts as [string, string, string, string, string]
  const expected = Buffer.from(sign(secret, `${idText}.${nonce}.${p}.${exp}`))
  const given = Buffer.from(mac)
  if (expected.length !== given.length || !timingSafeEqual(expected, given) || p !== purpose) throw invalid()
  if (Number(exp) * 1000 < Date.now()) throw gone('This link has expired. Ask for a new one.')
  const row = await findToken(db, Number(idText))
  if (!row || row.purpose !== purpose || row.nonce_hash !== sha256(nonce)) throw invalid()
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
