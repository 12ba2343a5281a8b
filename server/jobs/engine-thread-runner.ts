import { Worker, type WorkerOptions } from 'node:worker_threads'
import type { SimulationResult } from '../../shared/engine/simulate'

/**
 * Starts a worker thread from a sibling module. Under tsx (dev, tests) Node 20 does not apply tsx's hooks inside
 * workers, so the thread bootstraps tsx itself; a compiled build loads the .js file directly.
 */
export function startWorker(relNoExt: string, base: string, opts: WorkerOptions = {}): Worker {
  const ts = base.endsWith('.ts')
  const url = new URL(relNoExt + (ts ? '.ts' : '.js'), base)
  if (!ts) return new Worker(url, opts)
  const api = import.meta.resolve('tsx/esm/api')
  return new Worker(`import(${JSON.stringify(api)}).then((t) => { t.register(); return import(${JSON.stringify(url.href)}) })`, { ...opts, eval: true })
}

export class EngineRunError extends Error {
  constructor(readonly kind: 'cancelled' | 'scenario' | 'crashed', message: string, readonly field?: string) {
    super(message)
    this.name = 'EngineRunError'
  }
}

export interface EngineRun {
  result: Promise<SimulationResult>
  /** Asks the engine to stop at its next step; the promise rejects with kind 'cancelled'. */
  cancel(): void
}

/** Runs `simulate` in a worker thread, so the event loop (HTTP, heartbeats) stays free. */
export function runEngineInThread(scenario: unknown, onProgress: (fraction: number) => void): EngineRun {
  const cancelBuf = new SharedArrayBuffer(4)
  const flag = new Int32Array(cancelBuf)
  const worker = startWorker('./engine.worker', import.meta.url, { workerData: { scenario, cancel: cancelBuf } })
  let settled = false
  const result = new Promise<SimulationResult>((resolve, reject) => {
    const finish = (fn: () => void) => { if (!settled) { settled = true; fn(); void worker.terminate() } }
    worker.on('message', (m: { type: string; fraction?: number; result?: SimulationResult; name?: string; message?: string; field?: string }) => {
      if (m.type === 'progress') onProgress(m.fraction!)
      else if (m.type === 'done') finish(() => resolve(m.result!))
      else if (m.type === 'error') {
        const kind = m.name === 'SimulationCancelled' ? 'cancelled' : m.name === 'ScenarioError' ? 'scenario' : 'crashed'
        finish(() => reject(new EngineRunError(kind, m.message ?? 'engine error', m.field)))
      }
    })
    worker.on('error', (e) => finish(() => reject(new EngineRunError('crashed', e.message))))
    worker.on('exit', (code) => finish(() => reject(new EngineRunError(Atomics.load(flag, 0) ? 'cancelled' : 'crashed', `engine thread exited (${code})`))))
  })
  return {
    result,
    cancel: () => {
      Atomics.store(flag, 0, 1)
      // A run stuck outside the step loop (model build) is stopped the hard way after a grace period.
      setTimeout(() => { if (!settled) void worker.terminate() }, 3000).unref()
    },
  }
}
