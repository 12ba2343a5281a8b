/**
 * Why a new password is too easy to guess, or null. Length alone let "          " (ten spaces), "aaaaaaaaaa",
 * "1234567890" and "password12" through (issue 14). Rules after NIST SP 800-63B §5.1.1.2 (check new passwords against
 * commonly used, repetitive or sequential values): no dependency, the same function runs in the browser and on the server.
 */
const ROWS = ['abcdefghijklmnopqrstuvwxyz', '01234567890', 'qwertyuiop', 'asdfghjkl', 'zxcvbnm', 'qwertzuiop', 'azertyuiop', '1qaz2wsx3edc4rfv']
// Bases of the most common passwords in public breach lists (common practice; a short list from memory), matched after
// removing digits and symbols around them and undoing the usual letter-for-digit swaps.
const COMMON = new Set([
  'password', 'passwort', 'motdepasse', 'qwerty', 'letmein', 'welcome', 'iloveyou', 'admin', 'administrator', 'monkey', 'dragon',
  'football', 'baseball', 'sunshine', 'princess', 'master', 'shadow', 'superman', 'batman', 'trustno', 'changeme', 'secret',
  'login', 'starwars', 'whatever', 'freedom', 'computer', 'michael', 'charlie', 'driftwarden', 'default', 'test', 'guest',
  'hello', 'summer', 'winter', 'spring', 'autumn', 'qwertyuiop', 'abc', 'abcd', 'pass', 'user', 'root', 'access',
])
const LEET: Record<string, string> = { '0': 'o', '1': 'i', '3': 'e', '4': 'a', '5': 's', '7': 't', '@': 'a', '$': 's', '!': 'i' }

export function passwordWeakness(pw: string): string | null {
  const core = pw.trim()
  if (core.length < 10) return 'At least 10 characters, not counting spaces at either end'
  const lower = core.toLowerCase()
  if (new Set(lower).size < 5) return 'Too few different characters: use at least 5 different ones'
  // One block said again and again ("abcabcabca", "1212121212").
  for (let n = 1; n <= lower.length / 2; n++) {
    const block = lower.slice(0, n)
    if (block.repeat(Math.ceil(lower.length / n)).startsWith(lower)) return 'A short pattern repeated is easy to guess'
  }
  // A run along the alphabet, the digits or a keyboard row, forwards or backwards, with at most 2 other characters.
  const compact = lower.replace(/[^a-z0-9]/g, '')
  for (const row of ROWS) {
    for (const r of [row, [...row].reverse().join('')]) {
      for (let len = compact.length; len >= 8 && len >= compact.length - 2; len--) {
        for (let i = 0; i + len <= compact.length; i++) if (r.includes(compact.slice(i, i + len))) return 'A run of keys or letters in order is easy to guess'
      }
    }
  }
  // Digits and symbols around a word come off first ("password12", "P@ssw0rd2024!"), then the swaps inside it are undone.
  const bare = lower.replace(/^[^a-z]+|[^a-z]+$/g, '')
  const unswapped = bare.replace(/[0-9@$!]/g, (c) => LEET[c] ?? c).replace(/[^a-z]/g, '')
  if (COMMON.has(bare) || COMMON.has(unswapped)) return 'This is one of the most common passwords: choose another'
  return null
}
