import { ScenarioError, SimulationCancelled } from '../../shared/engine/errors'
import type { SimulationResult } from '../../shared/engine/simulate'
import type { WorkerInput, WorkerMessage } from './protocol'
import { startWorker } from './start-worker'

/** How long a cancelled engine may take to reach its next step check before the thread is terminated. */
const CANCEL_GRACE_MS = 3000

/** A simulation running in a worker thread. */
export interface SimulationJob {
  /** Resolves with the result; rejects with ScenarioError (bad input), SimulationCancelled or Error. */
  result: Promise<SimulationResult>
  /** Ask the engine to stop at its next step (it checks every time step). */
  cancel(): void
}

/**
 * Run `simulate` for a scenario (raw JSON, validated in the worker) in a node worker_thread, so the
 * event loop stays free. `onProgress` receives the simulated fraction 0–1 (about 100 calls).
 */
export function runSimulationInWorker(scenario: unknown, opts: { onProgress?(fraction: number): void } = {}): SimulationJob {
  const cancelFlag = new SharedArrayBuffer(4)
  const flag = new Int32Array(cancelFlag)
  const input: WorkerInput = { scenario, cancelFlag }
  const worker = startWorker('./simulation.worker', import.meta.url, { workerData: input })
  const result = new Promise<SimulationResult>((resolve, reject) => {
    let settled = false
    worker.on('message', (m: WorkerMessage) => {
      if (m.type === 'progress') opts.onProgress?.(m.fraction)
      else if (m.type === 'result') { settled = true; resolve(m.result); void worker.terminate() }
      else {
        settled = true
        reject(m.name === 'ScenarioError' && m.field ? new ScenarioError(m.field, m.message.slice(m.field.length + 2))
          : m.name === 'SimulationCancelled' ? new SimulationCancelled() : new Error(m.message))
        void worker.terminate()
      }
    })
    worker.on('error', (e) => { if (!settled) { settled = true; reject(e) } })
    worker.on('exit', (code) => {
      if (settled) return
      settled = true
      reject(Atomics.load(flag, 0) ? new SimulationCancelled() : new Error(`simulation worker exited with code ${code}`))
    })
  })
  return {
    result,
    cancel: () => {
      Atomics.store(flag, 0, 1)
      // A run busy outside the step loop (building a large model) is stopped the hard way after a grace period.
      setTimeout(() => void worker.terminate(), CANCEL_GRACE_MS).unref()
    },
  }
}
