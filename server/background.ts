import type { Runtime } from './runtime'

/** Background services that run beside HTTP in the server process (job workers, schedulers). */
export const BACKGROUND: ((rt: Runtime) => Promise<void>)[] = []

export async function startBackground(rt: Runtime) {
  for (const start of BACKGROUND) await start(rt)
}
