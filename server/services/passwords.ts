import argon2 from 'argon2'

export interface PasswordCost {
  memoryCost: number
  timeCost: number
}

export const hashPassword = (password: string, cost: PasswordCost) =>
  argon2.hash(password, { type: argon2.argon2id, memoryCost: cost.memoryCost, timeCost: cost.timeCost, parallelism: 1 })

export async function verifyPassword(hash: string | null, password: string): Promise<boolean> {
  if (!hash) return false
  try {
    return await argon2.verify(hash, password)
  } catch {
    return false
  }
}

// Verifying against a fixed hash when the account does not exist keeps response times alike,
// so sign-in timing does not reveal which e-mail addresses have accounts.
let dummy: Promise<string> | null = null
export async function burnVerify(password: string, cost: PasswordCost): Promise<void> {
  dummy ??= hashPassword('not-a-real-password-0', cost)
  await verifyPassword(await dummy, password)
}
