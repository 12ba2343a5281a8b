import type { HttpSession } from './http-session'

export interface SimulationWatch {
  waitAll(timeoutMs: number): Promise<{ started: number; finished: number; failed: number; seconds: number | null }>
}

/** Queues `count` runs of the demo floor's first scenario as the officer; filled in once the runs API exists. */
export async function startSimulations(_officer: HttpSession, count: number): Promise<SimulationWatch> {
  return { waitAll: async () => ({ started: 0, finished: 0, failed: count > 0 ? 0 : 0, seconds: null }) }
}
