import { canonicalJson } from '../plans/canonical'
import type { Gas } from './gas-schema'
import { findGas } from './library'

/**
 * The gas library's version: bump it with every change to a value in library.ts. Results record it; the per-entry
 * fingerprint below tells which gas changed, so only the plans built on that gas become stale.
 *
 * 1: the 21-gas library as of 2 Dec 2026.
 */
export const GAS_LIBRARY_VERSION = 1

/** 32-bit FNV-1a (pure TypeScript: shared/ also runs in the browser), as 8 hex digits. */
function fnv1a(text: string): string {
  let h = 0x811c9dc5
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i)
    h = Math.imul(h, 0x01000193) >>> 0
  }
  return h.toString(16).padStart(8, '0')
}

/**
 * Fingerprint of the values of one gas entry that outputs depend on. Citations and notes are left out: rewording a
 * source does not change a number.
 */
export function gasEntryFingerprint(gas: Gas): string {
  const { sources: _s, notes: _n, ...values } = gas as Gas & { sources?: unknown; notes?: unknown }
  return fnv1a(canonicalJson(values))
}

/** The current fingerprint of a library gas, or null when the id is not (or no longer) in the library. */
export function currentGasFingerprint(gasId: string): string | null {
  const gas = findGas(gasId)
  return gas ? gasEntryFingerprint(gas) : null
}
