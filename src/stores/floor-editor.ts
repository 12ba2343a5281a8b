import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref, shallowRef } from 'vue'
import { checkPlan, isPlanValid, type PlanProblem } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { duplicateElements, findElement, removeElements, type GasDefaultBasis, type PlanElement } from '../../shared/floorplan/plan-edit'
import { emptyPlan, PLAN_COLLECTIONS, type Plan } from '../../shared/floorplan/plan-schema'
import type { FloorDetail } from '../../shared/schemas/floors'
import { floorsApi } from '../api/floors'
import { type ApiError, toApiError } from '../api/http'
import { clearDraft, readDraft, writeDraft } from './floor-draft-storage'

/** The drawing tools of the palette. */
export type EditorTool =
  | 'select' | 'room-rect' | 'room-polygon' | 'door' | 'pass-through'
  | 'source' | 'detector' | 'exhaust' | 'workstation' | 'calibrate'

/**
 * saved: the server has everything. unsaved: changes wait for the autosave. saving: a request is out.
 * retrying: the last save failed (network, server down); the draft is in localStorage and we retry.
 * conflict: someone else saved first (409); autosave stops until the user chooses. error: refused (400).
 */
export type SaveState = 'saved' | 'unsaved' | 'saving' | 'retrying' | 'conflict' | 'error'

const AUTOSAVE_DELAY_MS = 1200
const MAX_HISTORY = 100
const MAX_BACKOFF_MS = 30_000

/** One floor open in the editor: the plan document, selection, undo/redo snapshots and autosave. */
export const useFloorEditorStore = defineStore('floor-editor', () => {
  const floor = ref<FloorDetail | null>(null)
  /** The plan being edited; replaced (never mutated) on every change so snapshots stay intact. */
  const plan = shallowRef<Plan>(emptyPlan())
  /** Server version the current plan is based on. */
  const version = ref(0)
  const selection = ref<string[]>([])
  const tool = ref<EditorTool>('select')
  const undoStack = shallowRef<Plan[]>([])
  const redoStack = shallowRef<Plan[]>([])
  const clipboard = shallowRef<PlanElement[]>([])
  const saveState = ref<SaveState>('saved')
  const saveError = ref<ApiError | null>(null)
  const loadError = ref<ApiError | null>(null)
  const isLoading = ref(false)
  /** Set when a local draft newer than the server was found on load (restored) or conflicts (offered). */
  const restoredDraft = ref(false)
  const lastSavedAt = ref<string | null>(null)
  const retryInMs = ref(0)
  /** The source or detector just placed and the gas it was given by default (the property panel says so). */
  const lastPlaced = ref<{ id: string; gasId: string; basis: GasDefaultBasis } | null>(null)

  const canEdit = computed(() => floor.value?.canEdit ?? false)
  const ceilingM = computed(() => floor.value?.ceilingHeightM ?? 3)
  const problems = computed<PlanProblem[]>(() => checkPlan(plan.value, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: ceilingM.value }))
  const isValid = computed(() => isPlanValid(problems.value))
  const problemIds = computed(() => {
    const map = new Map<string, 'error' | 'warning'>()
    for (const p of problems.value) for (const id of p.elementIds) if (map.get(id) !== 'error') map.set(id, p.severity)
    return map
  })
  const selectedElements = computed(() => selection.value.map((id) => findElement(plan.value, id)).filter((x) => x !== null))
  const canUndo = computed(() => undoStack.value.length > 0)
  const canRedo = computed(() => redoStack.value.length > 0)

  let timer: ReturnType<typeof setTimeout> | undefined
  let backoffMs = 1000
  let inFlight: Promise<void> | null = null

  async function load(id: number): Promise<void> {
    isLoading.value = true
    loadError.value = null
    clearTimeout(timer)
    try {
      const detail = await floorsApi.getFloor(id)
      floor.value = detail
      plan.value = detail.plan
      version.value = detail.version
      undoStack.value = []
      redoStack.value = []
      selection.value = []
      tool.value = 'select'
      saveState.value = 'saved'
      saveError.value = null
      lastSavedAt.value = detail.updatedAt
      restoredDraft.value = false
      lastPlaced.value = null
      const draft = readDraft(id)
      if (draft && detail.canEdit && JSON.stringify(draft.plan) !== JSON.stringify(detail.plan)) {
        plan.value = draft.plan
        restoredDraft.value = true
        if (draft.baseVersion === detail.version) {
          saveState.value = 'unsaved'
          scheduleSave(0)
        } else {
          // The server moved on while this draft sat here: let the person choose.
          saveState.value = 'conflict'
        }
      } else if (draft) clearDraft(id)
    } catch (e) {
      loadError.value = toApiError(e)
    } finally {
      isLoading.value = false
    }
  }

  /**
   * Apply a change to the plan as one undoable step. Every edit goes through here: it snapshots the
   * previous document, keeps a local copy and schedules the autosave.
   */
  function commit(next: Plan): void {
    if (!canEdit.value || next === plan.value) return
    undoStack.value = [...undoStack.value.slice(-MAX_HISTORY + 1), plan.value]
    redoStack.value = []
    setPlan(next)
  }

  function setPlan(next: Plan): void {
    plan.value = next
    const existing = new Set(PLAN_COLLECTIONS.flatMap((c) => next[c].map((e) => e.id)))
    selection.value = selection.value.filter((id) => existing.has(id))
    if (!floor.value) return
    writeDraft({ floorId: floor.value.id, baseVersion: version.value, plan: next, changedAt: new Date().toISOString() })
    if (saveState.value !== 'conflict') {
      saveState.value = saveState.value === 'retrying' ? 'retrying' : 'unsaved'
      if (saveState.value === 'unsaved') scheduleSave(AUTOSAVE_DELAY_MS)
    }
  }

  function undo(): void {
    const prev = undoStack.value.at(-1)
    if (!prev || !canEdit.value) return
    undoStack.value = undoStack.value.slice(0, -1)
    redoStack.value = [...redoStack.value, plan.value]
    setPlan(prev)
  }

  function redo(): void {
    const next = redoStack.value.at(-1)
    if (!next || !canEdit.value) return
    redoStack.value = redoStack.value.slice(0, -1)
    undoStack.value = [...undoStack.value, plan.value]
    setPlan(next)
  }

  function scheduleSave(delay: number): void {
    clearTimeout(timer)
    timer = setTimeout(() => void save(), delay)
  }

  /** Send the current plan; on success the local draft is dropped, on failure it stays and we retry. */
  async function save(): Promise<void> {
    if (!floor.value || !canEdit.value || saveState.value === 'conflict') return
    if (inFlight) {
      await inFlight
      if (saveState.value === 'unsaved') return save()
      return
    }
    const floorId = floor.value.id
    const sent = plan.value
    saveState.value = 'saving'
    inFlight = (async () => {
      try {
        const result = await floorsApi.savePlan(floorId, version.value, sent)
        version.value = result.version
        lastSavedAt.value = result.updatedAt
        backoffMs = 1000
        retryInMs.value = 0
        saveError.value = null
        if (floor.value) floor.value = { ...floor.value, version: result.version, planValid: result.planValid, problems: result.problems }
        if (plan.value === sent) {
          saveState.value = 'saved'
          clearDraft(floorId)
        } else {
          saveState.value = 'unsaved'
          writeDraft({ floorId, baseVersion: version.value, plan: plan.value, changedAt: new Date().toISOString() })
          scheduleSave(AUTOSAVE_DELAY_MS)
        }
      } catch (e) {
        const error = toApiError(e)
        saveError.value = error
        if (error.status === 409) {
          saveState.value = 'conflict'
        } else if (error.status === 0 || error.status >= 500 || error.status === 429) {
          saveState.value = 'retrying'
          retryInMs.value = backoffMs
          scheduleSave(backoffMs)
          backoffMs = Math.min(backoffMs * 2, MAX_BACKOFF_MS)
        } else {
          saveState.value = 'error'
        }
      } finally {
        inFlight = null
      }
    })()
    await inFlight
  }

  /** Conflict resolution: drop local changes and take the server's plan. */
  async function reloadFromServer(): Promise<void> {
    if (!floor.value) return
    clearDraft(floor.value.id)
    await load(floor.value.id)
  }

  /** Conflict resolution: keep my version as a new floor of the same site; returns its id. */
  async function keepCopyAsNewFloor(): Promise<number | null> {
    const f = floor.value
    if (!f) return null
    const stamp = new Date().toLocaleString(undefined, { dateStyle: 'short', timeStyle: 'short' })
    const created = await floorsApi.createFloor(f.siteId, { name: `${f.name} (my copy, ${stamp})`.slice(0, 120), ceilingHeightM: f.ceilingHeightM,
      managerIds: f.managerIds, memberIds: f.memberIds })
    await floorsApi.savePlan(created.id, created.version, plan.value)
    clearDraft(f.id)
    return created.id
  }

  function select(ids: string[], additive = false): void {
    selection.value = additive ? [...new Set([...selection.value, ...ids])] : ids
  }

  function toggleSelected(id: string): void {
    selection.value = selection.value.includes(id) ? selection.value.filter((x) => x !== id) : [...selection.value, id]
  }

  function selectAll(): void {
    selection.value = PLAN_COLLECTIONS.flatMap((c) => plan.value[c].map((e) => e.id))
  }

  function deleteSelected(): void {
    if (!selection.value.length) return
    commit(removeElements(plan.value, new Set(selection.value)))
    selection.value = []
  }

  function copySelected(): void {
    clipboard.value = selectedElements.value.map((s) => s.element)
  }

  /** Paste the clipboard offset by `offsetM` so copies do not hide their originals. */
  function paste(offsetM = 0.5): void {
    if (!clipboard.value.length) return
    const { plan: next, ids } = duplicateElements(plan.value, clipboard.value, offsetM, -offsetM)
    commit(next)
    selection.value = ids
    clipboard.value = ids.map((id) => findElement(next, id)!.element)
  }

  function duplicateSelected(): void {
    copySelected()
    paste()
  }

  function notePlaced(placed: { id: string; gasId: string; basis: GasDefaultBasis }): void {
    lastPlaced.value = placed
  }

  function setTool(next: EditorTool): void {
    tool.value = canEdit.value || next === 'select' ? next : 'select'
  }

  /** Apply a newer floor (name, ceiling, people) without touching the plan being edited. */
  function setFloorMeta(detail: FloorDetail): void {
    if (floor.value) floor.value = { ...floor.value, name: detail.name, ceilingHeightM: detail.ceilingHeightM, managerIds: detail.managerIds, memberIds: detail.memberIds }
  }

  function close(): void {
    clearTimeout(timer)
  }

  return {
    floor, plan, version, selection, tool, undoStack, redoStack, clipboard, saveState, saveError, loadError, isLoading,
    restoredDraft, lastSavedAt, retryInMs, lastPlaced, notePlaced, canEdit, ceilingM, problems, isValid, problemIds, selectedElements, canUndo, canRedo,
    load, commit, undo, redo, save, reloadFromServer, keepCopyAsNewFloor, select, toggleSelected, selectAll, deleteSelected,
    copySelected, paste, duplicateSelected, setTool, setFloorMeta, close,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useFloorEditorStore, import.meta.hot))
