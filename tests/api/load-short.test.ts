import { describe, expect, it } from 'vitest'
import { runLoad } from '../load/load'

// The short CI version of `npm run load` (the full run: 50 users for 60 s with 4 simulations, figures in README).
// Latency is reported, not asserted: speed is a benchmark's job, not a test's.
describe('load, short version', () => {
  it('10 signed-in users browse for 5 s while a simulation runs: no errors, the simulation finishes', async () => {
    const r = await runLoad({ users: 10, seconds: 5, simulations: 1 })
    console.log(`short load: ${r.requests} requests, errors ${r.errors}, p50 ${r.overall.p50.toFixed(1)} ms, p95 ${r.overall.p95.toFixed(1)} ms, p99 ${r.overall.p99.toFixed(1)} ms`)
    expect(r.errorSamples).toEqual([])
    expect(r.requests).toBeGreaterThan(50)
    expect(r.simulations).toMatchObject({ started: 1, finished: 1, failed: 0 })
  }, 300_000)
})
