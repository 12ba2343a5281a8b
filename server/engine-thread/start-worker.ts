import { Worker, type WorkerOptions } from 'node:worker_threads'

/**
 * Start a worker from a sibling module given without extension. Under tsx (dev, tests) Node 20 does not
 * apply tsx's loader inside workers, so the worker bootstraps tsx itself through an eval entry; a
 * compiled build loads the .js file directly.
 */
export function startWorker(relNoExt: string, base: string, opts: WorkerOptions = {}): Worker {
  const ts = base.endsWith('.ts')
  const url = new URL(relNoExt + (ts ? '.ts' : '.js'), base)
  if (!ts) return new Worker(url, opts)
  const api = import.meta.resolve('tsx/esm/api')
  const boot = `import(${JSON.stringify(api)}).then((t) => { t.register(); return import(${JSON.stringify(url.href)}) })`
  return new Worker(boot, { ...opts, eval: true })
}
