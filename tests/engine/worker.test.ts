// The worker-thread runner: progress messages, a transferred result, cancel, and bad input.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { ScenarioError, SimulationCancelled } from '../../shared/engine/errors'
import { runSimulationInWorker } from '../../server/engine-thread/run-in-worker'

const example = () => JSON.parse(readFileSync(new URL('../fixtures/engine/format-example.json', import.meta.url), 'utf8'))

describe('engine worker thread', () => {
  it('reports progress and returns the result', async () => {
    const seen: number[] = []
    const job = runSimulationInWorker(example(), { onProgress: (f) => seen.push(f) })
    const r = await job.result
    expect(r.times_s.length).toBe(31)
    expect(r.probes[0]!.ppm).toBeInstanceOf(Float64Array)
    expect(seen.length).toBeGreaterThan(10)
    expect(seen[seen.length - 1]).toBeCloseTo(1, 6)
    expect(r.mass_balance.closure_error).toBeLessThan(1e-9)
  }, 60_000)
  it('cancels a running simulation', async () => {
    const s = example()
    s.duration_s = 86400
    s.numerics = { time_step_s: 0.5 }
    const job = runSimulationInWorker(s, { onProgress: (f) => { if (f > 0.01) job.cancel() } })
    await expect(job.result).rejects.toBeInstanceOf(SimulationCancelled)
  }, 60_000)
  it('rejects bad input with the field-naming ScenarioError', async () => {
    const s = example()
    s.gas = { id: 'nope' }
    const job = runSimulationInWorker(s)
    await expect(job.result).rejects.toBeInstanceOf(ScenarioError)
    await expect(job.result).rejects.toThrow(/^gas\.id: unknown gas "nope"/)
  }, 60_000)
})
