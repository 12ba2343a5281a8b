import { parentPort, workerData } from 'node:worker_threads'
import { ScenarioError, SimulationCancelled } from '../../shared/engine/errors'
import { simulate } from '../../shared/engine/simulate'

/** Runs one simulation off the main thread. Cancel: the parent sets cancel[0] = 1 (shared memory, read every step). */
const { scenario, cancel } = workerData as { scenario: unknown; cancel: SharedArrayBuffer }
const flag = new Int32Array(cancel)
try {
  const result = simulate(scenario, {
    onProgress: (fraction) => parentPort!.postMessage({ type: 'progress', fraction }),
    signal: { get cancelled() { return Atomics.load(flag, 0) === 1 } },
  })
  const transfer = [...result.breathing_ppm, ...result.column_max_ppm, ...result.fronts_s, result.peak_ppm, result.max_twa15_ppm].map((a) => a.buffer as ArrayBuffer)
  parentPort!.postMessage({ type: 'done', result }, transfer)
} catch (e) {
  const err = e as Error
  parentPort!.postMessage({
    type: 'error', name: err instanceof SimulationCancelled ? 'SimulationCancelled' : err instanceof ScenarioError ? 'ScenarioError' : err.name,
    message: err.message, field: err instanceof ScenarioError ? err.field : undefined,
  })
}
