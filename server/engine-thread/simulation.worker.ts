// Runs one simulation off the main thread. Progress and the result are posted to the parent; the
// result's typed arrays are transferred, not copied.
import { parentPort, workerData } from 'node:worker_threads'
import { ScenarioError } from '../../shared/engine/errors'
import { simulate } from '../../shared/engine/simulate'
import type { WorkerInput, WorkerMessage } from './protocol'

const { scenario, cancelFlag } = workerData as WorkerInput
const flag = new Int32Array(cancelFlag)
const post = (m: WorkerMessage, transfer: ArrayBuffer[] = []) => parentPort!.postMessage(m, transfer)

try {
  const result = simulate(scenario, {
    onProgress: (fraction) => post({ type: 'progress', fraction }),
    signal: { get cancelled() { return Atomics.load(flag, 0) === 1 } },
  })
  const buffers = new Set<ArrayBuffer>()
  const add = (a: { buffer: ArrayBufferLike }) => { if (a.buffer instanceof ArrayBuffer) buffers.add(a.buffer) }
  ;[result.times_s, result.peak_ppm, result.max_twa15_ppm, result.grid.room_of_cell, ...result.breathing_ppm, ...result.column_max_ppm, ...result.fronts_s, ...result.probes.map((p) => p.ppm)].forEach(add)
  post({ type: 'result', result }, [...buffers])
} catch (e) {
  const err = e as Error
  post({ type: 'error', name: err.name, message: err.message, field: e instanceof ScenarioError ? e.field : undefined })
}
