import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { ApiError } from '../../src/api/http'
import type { ScenarioConfig, ScenarioRecord } from '../../shared/schemas/runs'

// Issue 14 item 4, client side: the scenarios page refreshes its lists every second while a run is going. The
// version the editor sends with Save must be the one it loaded into the form (or last saved), not whatever the
// latest refresh holds. The fake below keeps one scenario and applies the server's rule (PUT /api/scenarios/:id:
// 409 stale_version when the updatedAt sent is not the stored one); list reads can be held back to land late.
const server = vi.hoisted(() => {
  let stamp = Date.parse('2026-12-02T10:00:00Z')
  const next = () => new Date((stamp += 1000)).toISOString()
  const state = { record: null as unknown as ScenarioRecord, held: [] as (() => void)[], holdLists: false, next }
  const api = {
    listScenarios: vi.fn(async () => {
      const snapshot = structuredClone(state.record)
      if (state.holdLists) await new Promise<void>((resolve) => state.held.push(resolve))
      return [snapshot]
    }),
    listFloorRuns: vi.fn(async () => []),
    updateScenario: vi.fn(async (id: number, config: ScenarioConfig, updatedAt?: string) => {
      if (updatedAt !== undefined && updatedAt !== state.record.updatedAt) {
        throw new ApiError(409, 'stale_version', 'Someone else saved this scenario since you opened it.', {})
      }
      state.record = { ...state.record, id, config, name: config.name, updatedAt: next() }
      return structuredClone(state.record)
    }),
  }
  return { state, api }
})
vi.mock('../../src/api/runs', () => ({ runsApi: server.api }))
vi.mock('../../src/api/floors', () => ({ floorsApi: {} }))
const { useRunsStore } = await import('../../src/stores/runs')

const config = (name: string, durationS = 600) => ({ name, durationS }) as unknown as ScenarioConfig
/** Someone else saving the scenario in another browser (no version sent, as a plain overwrite would). */
const otherOfficerSaves = (name: string) => { server.state.record = { ...server.state.record, name, config: config(name), updatedAt: server.state.next() } }
const releaseLists = () => { server.state.held.splice(0).forEach((r) => r()); return new Promise((r) => setTimeout(r, 0)) }

beforeEach(() => {
  setActivePinia(createPinia())
  server.state.holdLists = false
  server.state.held = []
  server.state.record = { id: 5, floorId: 2, name: 'Valve leak', config: config('Valve leak'), createdAt: '2026-12-02T09:00:00Z',
    updatedAt: server.state.next(), lastRun: null }
})

describe('the scenario editor version during list refreshes', () => {
  it("someone else's save that a refresh brought in is a 409, not a silent overwrite", async () => {
    const store = useRunsStore()
    await store.refreshRuns(2)
    store.beginEdit(store.scenarios[0]!)
    otherOfficerSaves('Valve leak (theirs)')
    await store.refreshRuns(2) // the 1 s refresh while a run is going: the list now holds their version
    await expect(store.saveScenario(2, config('Valve leak (mine)'), 5)).rejects.toMatchObject({ status: 409, code: 'stale_version' })
    expect(server.state.record.name).toBe('Valve leak (theirs)')
    // Saving again after the 409 is the deliberate overwrite the message offers.
    await store.saveScenario(2, config('Valve leak (mine)'), 5)
    expect(server.state.record.name).toBe('Valve leak (mine)')
  })

  it('an edit saved while a list refresh is on its way still saves, and so does the next one', async () => {
    const store = useRunsStore()
    await store.refreshRuns(2)
    store.beginEdit(store.scenarios[0]!)
    server.state.holdLists = true
    const refresh = store.refreshRuns(2) // read before the save, answered after it
    await new Promise((r) => setTimeout(r, 0))
    const first = await store.saveScenario(2, config('Valve leak, 20 min', 1200), 5)
    expect(first.config.durationS).toBe(1200)
    await releaseLists(); await refresh
    server.state.holdLists = false
    // The late answer did not put the older record back in the list, and the editor's next Save is not a false 409.
    expect(store.scenarios[0]!.updatedAt).toBe(first.updatedAt)
    const second = await store.saveScenario(2, config('Valve leak, 25 min', 1500), 5)
    expect(second.config.durationS).toBe(1500)
    expect(server.state.record.config.durationS).toBe(1500)
  })
})
