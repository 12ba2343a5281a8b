import type { HttpSession } from './http-session'

export interface SimulationWatch {
  waitAll(timeoutMs: number): Promise<{ started: number; finished: number; failed: number; seconds: number | null }>
}

/** Queues `count` runs of the first scenario on the first floor the officer sees, and watches them finish. */
export async function startSimulations(officer: HttpSession, count: number): Promise<SimulationWatch> {
  const t0 = performance.now()
  const ids: number[] = []
  if (count > 0) {
    const floors = (await officer.request('GET', '/api/floors')).json.floors as { id: number }[]
    const floor = floors[0]
    if (!floor) throw new Error('no floor to simulate on: seed the demo first')
    const scenarios = (await officer.request('GET', `/api/floors/${floor.id}/scenarios`)).json.scenarios as { id: number }[]
    if (!scenarios?.length) throw new Error('the demo floor has no scenario')
    for (let i = 0; i < count; i++) {
      const r = await officer.request('POST', `/api/scenarios/${scenarios[0]!.id}/runs`)
      if (r.status !== 202) throw new Error(`could not start a run: ${r.status} ${JSON.stringify(r.json)}`)
      ids.push(r.json.id)
    }
  }
  return {
    async waitAll(timeoutMs) {
      const done = new Map<number, string>()
      const deadline = performance.now() + timeoutMs
      while (done.size < ids.length && performance.now() < deadline) {
        for (const id of ids) {
          if (done.has(id)) continue
          const run = (await officer.request('GET', `/api/runs/${id}`)).json
          if (['succeeded', 'failed', 'cancelled'].includes(run?.status)) done.set(id, run.status)
        }
        if (done.size < ids.length) await new Promise((r) => setTimeout(r, 500))
      }
      const finished = [...done.values()].filter((s) => s === 'succeeded').length
      return { started: ids.length, finished, failed: ids.length - finished, seconds: done.size === ids.length ? (performance.now() - t0) / 1000 : null }
    },
  }
}
