import { describe, expect, it } from 'vitest'
import { RunFieldsCache } from '../../server/services/run-fields-cache'

const entry = (bytes: number) => ({ body: Buffer.alloc(bytes), frames: 1 })

describe('RunFieldsCache', () => {
  it('keeps recently used runs within its byte budget, evicting the least recently used first', () => {
    const c = new RunFieldsCache(100)
    c.set(1, entry(40))
    c.set(2, entry(40))
    expect(c.get(1)).toBeDefined() // 1 is now the most recent
    c.set(3, entry(40)) // 120 bytes > 100: evict 2
    expect(c.get(2)).toBeUndefined()
    expect(c.get(1)).toBeDefined()
    expect(c.get(3)).toBeDefined()
  })
  it('does not keep an entry larger than the whole budget', () => {
    const c = new RunFieldsCache(10)
    c.set(1, entry(11))
    expect(c.get(1)).toBeUndefined()
  })
})
