import { createPinia, setActivePinia } from 'pinia'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { ApiError } from '../../src/api/http'
import { twoRoomPlan, rectRoom } from './floorplan-fixtures'

// The editor store talks to the API through src/api/floors; replace it with a controllable fake.
const api = vi.hoisted(() => ({ getFloor: vi.fn(), savePlan: vi.fn(), createFloor: vi.fn() }))
vi.mock('../../src/api/floors', () => ({ floorsApi: api }))
const { useFloorEditorStore } = await import('../../src/stores/floor-editor')

class MemoryStorage {
  data = new Map<string, string>()
  getItem(k: string) { return this.data.get(k) ?? null }
  setItem(k: string, v: string) { this.data.set(k, v) }
  removeItem(k: string) { this.data.delete(k) }
}

function detail(over: Record<string, unknown> = {}) {
  return { id: 7, siteId: 1, siteName: 'S', name: 'F', ceilingHeightM: 3, version: 3, planValid: true, roomCount: 2, sourceCount: 1,
    updatedAt: new Date().toISOString(), managerIds: [], memberIds: [], plan: twoRoomPlan(), problems: [], canEdit: true, ...over }
}
const saved = (version: number) => ({ version, planValid: true, problems: [], updatedAt: new Date().toISOString() })

let storage: MemoryStorage
beforeEach(() => {
  vi.useFakeTimers()
  storage = new MemoryStorage()
  vi.stubGlobal('localStorage', storage)
  setActivePinia(createPinia())
  api.getFloor.mockReset().mockResolvedValue(detail())
  api.savePlan.mockReset()
})
afterEach(() => {
  vi.useRealTimers()
  vi.unstubAllGlobals()
})

describe('floor editor store', () => {
  it('undo and redo walk the plan snapshots', async () => {
    const store = useFloorEditorStore()
    await store.load(7)
    const original = store.plan
    store.commit({ ...store.plan, rooms: [...store.plan.rooms, rectRoom('c', 20, 0, 24, 2)] })
    store.commit({ ...store.plan, sources: [] })
    expect(store.plan.sources).toHaveLength(0)
    store.undo()
    expect(store.plan.sources).toHaveLength(1)
    store.undo()
    expect(store.plan).toBe(original)
    expect(store.canUndo).toBe(false)
    store.redo()
    store.redo()
    expect(store.plan.rooms).toHaveLength(3)
    expect(store.plan.sources).toHaveLength(0)
  })

  it('autosaves after a pause, sending the version it started from', async () => {
    api.savePlan.mockResolvedValue(saved(4))
    const store = useFloorEditorStore()
    await store.load(7)
    store.commit({ ...store.plan, sources: [] })
    expect(store.saveState).toBe('unsaved')
    expect(storage.data.size).toBe(1)
    await vi.advanceTimersByTimeAsync(1500)
    expect(api.savePlan).toHaveBeenCalledWith(7, 3, store.plan)
    expect(store.saveState).toBe('saved')
    expect(store.version).toBe(4)
    expect(storage.data.size).toBe(0)
  })

  it('keeps the draft locally and retries with backoff when the network fails', async () => {
    api.savePlan.mockRejectedValueOnce(new ApiError(0, 'network', 'offline')).mockRejectedValueOnce(new ApiError(503, 'database_unavailable', 'down'))
      .mockResolvedValueOnce(saved(4))
    const store = useFloorEditorStore()
    await store.load(7)
    store.commit({ ...store.plan, sources: [] })
    await vi.advanceTimersByTimeAsync(1300)
    expect(store.saveState).toBe('retrying')
    expect(JSON.parse(storage.data.get('driftwarden.floor-draft.7')!).plan.sources).toEqual([])
    await vi.advanceTimersByTimeAsync(1000)
    expect(api.savePlan).toHaveBeenCalledTimes(2)
    expect(store.retryInMs).toBe(2000)
    await vi.advanceTimersByTimeAsync(2000)
    expect(api.savePlan).toHaveBeenCalledTimes(3)
    expect(store.saveState).toBe('saved')
    expect(storage.data.size).toBe(0)
  })

  it('stops on 409 and offers the choice; the local draft survives a reload of the page', async () => {
    api.savePlan.mockRejectedValue(new ApiError(409, 'stale_version', 'someone saved'))
    const store = useFloorEditorStore()
    await store.load(7)
    store.commit({ ...store.plan, sources: [] })
    await vi.advanceTimersByTimeAsync(1300)
    expect(store.saveState).toBe('conflict')
    await vi.advanceTimersByTimeAsync(60_000)
    expect(api.savePlan).toHaveBeenCalledTimes(1)
    // Page reload: the server is at version 5 now, the draft was based on 3 → still a conflict, draft shown.
    setActivePinia(createPinia())
    api.getFloor.mockResolvedValue(detail({ version: 5 }))
    const again = useFloorEditorStore()
    await again.load(7)
    expect(again.saveState).toBe('conflict')
    expect(again.plan.sources).toEqual([])
    await again.reloadFromServer()
    expect(again.saveState).toBe('saved')
    expect(again.plan.sources).toHaveLength(1)
  })

  it('restores and saves a draft that the server never got, when nobody saved in between', async () => {
    api.savePlan.mockRejectedValue(new ApiError(0, 'network', 'offline'))
    const store = useFloorEditorStore()
    await store.load(7)
    store.commit({ ...store.plan, sources: [] })
    setActivePinia(createPinia())
    api.savePlan.mockReset().mockResolvedValue(saved(4))
    const again = useFloorEditorStore()
    await again.load(7)
    expect(again.restoredDraft).toBe(true)
    expect(again.plan.sources).toEqual([])
    await vi.advanceTimersByTimeAsync(10)
    expect(api.savePlan).toHaveBeenCalledWith(7, 3, again.plan)
    expect(again.saveState).toBe('saved')
  })

  it('is read-only for people who may not edit', async () => {
    api.getFloor.mockResolvedValue(detail({ canEdit: false }))
    const store = useFloorEditorStore()
    await store.load(7)
    store.commit({ ...store.plan, sources: [] })
    store.setTool('room-rect')
    expect(store.plan.sources).toHaveLength(1)
    expect(store.tool).toBe('select')
  })

  it('copies and pastes the selection with fresh ids; deletes it in one undoable step', async () => {
    const store = useFloorEditorStore()
    await store.load(7)
    store.select(['leak-1'])
    store.copySelected()
    store.paste()
    expect(store.plan.sources.map((s) => s.id)).toEqual(['leak-1', 'source-1'])
    expect(store.selection).toEqual(['source-1'])
    store.selectAll()
    store.deleteSelected()
    expect(store.plan.rooms).toEqual([])
    store.undo()
    expect(store.plan.sources).toHaveLength(2)
  })
})
