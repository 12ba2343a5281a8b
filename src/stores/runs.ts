import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref, shallowRef } from 'vue'
import type { FloorDetail, FloorSummary } from '../../shared/schemas/floors'
import type { AdvisorProposal, AdvisorRequest, RunDetail, RunListItem, RunSeries, ScenarioConfig, ScenarioRecord, SweepDetail } from '../../shared/schemas/runs'
import type { CompareInput } from '../../shared/runs/compare'
import { floorsApi } from '../api/floors'
import { ApiError, toApiError } from '../api/http'
import { runsApi } from '../api/runs'

const FINISHED = ['succeeded', 'failed', 'cancelled']
export const isFinished = (status: string) => FINISHED.includes(status)

/** Scenarios, runs, results, sweeps and advisor proposals of the floor in view. */
export const useRunsStore = defineStore('runs', () => {
  const floors = ref<FloorSummary[]>([])
  const floor = shallowRef<FloorDetail | null>(null)
  const scenarios = ref<ScenarioRecord[]>([])
  const runs = ref<RunListItem[]>([])
  const run = shallowRef<RunDetail | null>(null)
  const fields = shallowRef<Float32Array | null>(null)
  const series = shallowRef<RunSeries | null>(null)
  const sweep = shallowRef<SweepDetail | null>(null)
  const proposal = shallowRef<AdvisorProposal | null>(null)
  const error = ref<ApiError | null>(null)
  const loading = ref(false)
  let poll: ReturnType<typeof setTimeout> | null = null

  async function guard<T>(fn: () => Promise<T>): Promise<T | undefined> {
    loading.value = true
    try { const v = await fn(); error.value = null; return v } catch (e) { error.value = toApiError(e); return undefined } finally { loading.value = false }
  }

  const loadFloors = () => guard(async () => { floors.value = await floorsApi.listFloors() })
  const loadFloor = (id: number) => guard(async () => {
    const [f, sc, rs] = await Promise.all([floorsApi.getFloor(id), runsApi.listScenarios(id), runsApi.listFloorRuns(id)])
    floor.value = f; scenarios.value = sc; runs.value = rs
  })
  // A list read that started before a save must not put the older record back when it lands after it.
  let listEpoch = 0
  const refreshRuns = async (floorId: number) => {
    const epoch = listEpoch
    runs.value = await runsApi.listFloorRuns(floorId)
    const listed = await runsApi.listScenarios(floorId)
    if (epoch === listEpoch) scenarios.value = listed
  }

  /**
   * The version the editor sends: the updatedAt of the scenario as it was put into the form (or last saved from it),
   * never what the list refreshed every second during runs holds now, which would hide someone else's save.
   */
  const editVersions = new Map<number, string>()
  function beginEdit(s: ScenarioRecord) { editVersions.set(s.id, s.updatedAt) }

  /**
   * On 409 stale_version the list is read again and its version becomes the form's (so Save once more is a
   * deliberate overwrite) and the message says so, while the form keeps what was typed.
   */
  async function changeScenario(floorId: number, id: number, config: ScenarioConfig) {
    try {
      const saved = await runsApi.updateScenario(id, config, editVersions.get(id) ?? scenarios.value.find((s) => s.id === id)?.updatedAt)
      editVersions.set(id, saved.updatedAt)
      return saved
    } catch (e) {
      if (!(e instanceof ApiError) || e.code !== 'stale_version') throw e
      listEpoch++
      scenarios.value = await runsApi.listScenarios(floorId).catch(() => scenarios.value)
      const current = scenarios.value.find((s) => s.id === id)
      if (current) editVersions.set(id, current.updatedAt)
      throw new ApiError(e.status, e.code, `${e.message} Your settings are still in the form: save again to put them over theirs, or press Edit on the scenario to start from theirs.`, e.fields)
    }
  }
  /** Throws ApiError (400 with fields) so the form can show them. */
  async function saveScenario(floorId: number, config: ScenarioConfig, id?: number) {
    const saved = id ? await changeScenario(floorId, id, config) : await runsApi.createScenario(floorId, config)
    listEpoch++
    scenarios.value = [...scenarios.value.filter((s) => s.id !== saved.id), saved].sort((a, b) => a.name.localeCompare(b.name))
    return saved
  }
  async function startRun(scenarioId: number) {
    const r = await runsApi.startRun(scenarioId)
    runs.value = [r, ...runs.value]
    return r
  }

  function stopPolling() { if (poll) clearTimeout(poll); poll = null }
  /** Loads a run and polls it every 500 ms until it finishes; then loads its fields and series. */
  async function openRun(id: number) {
    stopPolling()
    fields.value = null; series.value = null
    const tick = async () => {
      try {
        const r = await runsApi.getRun(id)
        run.value = r
        error.value = null
        if (isFinished(r.status)) {
          if (r.status === 'succeeded') {
            const [f, s] = await Promise.all([runsApi.getFields(id), runsApi.getSeries(id)])
            fields.value = f; series.value = s
            if (!floor.value || floor.value.id !== r.floorId) floor.value = await floorsApi.getFloor(r.floorId)
          }
          return
        }
        if (!floor.value || floor.value.id !== r.floorId) floor.value = await floorsApi.getFloor(r.floorId)
      } catch (e) { error.value = toApiError(e); if (error.value.status === 404 || error.value.status === 403) return }
      poll = setTimeout(tick, 500)
    }
    await tick()
  }
  async function cancelRun(id: number) { run.value = await runsApi.cancelRun(id) }

  async function startSweep(floorId: number, config: ScenarioConfig) {
    const s = await runsApi.startSweep(floorId, { config })
    sweep.value = s
    return s
  }
  async function openSweep(id: number) {
    stopPolling()
    const tick = async () => {
      try { sweep.value = await runsApi.getSweep(id); error.value = null; if (!floor.value || floor.value.id !== sweep.value.floorId) floor.value = await floorsApi.getFloor(sweep.value.floorId) } catch (e) { error.value = toApiError(e); return }
      if (!sweep.value.complete) poll = setTimeout(tick, 800)
    }
    await tick()
  }
  /** Finished results to compare, by id (deduplicated, in order), and the ones left out because they have no result yet. */
  async function loadComparison(ids: number[]): Promise<{ inputs: CompareInput[]; unfinished: RunDetail[] }> {
    const all = await Promise.all([...new Set(ids)].map((id) => runsApi.getRun(id)))
    return {
      inputs: all.flatMap((r) => (r.summary ? [{ id: r.id, label: r.label, summary: r.summary }] : [])),
      unfinished: all.filter((r) => !r.summary),
    }
  }
  async function propose(floorId: number, req: AdvisorRequest) { proposal.value = await runsApi.propose(floorId, req); return proposal.value }
  async function acceptProposal(floorId: number) {
    const p = proposal.value!, f = floor.value!
    const saved = await runsApi.accept(floorId, {
      version: f.version, gasId: p.gasId, positions: p.chosen.map((c) => c.position), mountingHeightM: p.mountingHeightM,
      alarmLowPpm: p.alarmLowPpm, alarmHighPpm: p.alarmHighPpm,
    })
    floor.value = await floorsApi.getFloor(floorId)
    return saved
  }

  return {
    floors, floor, scenarios, runs, run, fields, series, sweep, proposal, error, loading,
    loadFloors, loadFloor, refreshRuns, beginEdit, saveScenario, startRun, openRun, cancelRun, stopPolling, startSweep, openSweep, loadComparison, propose, acceptProposal,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useRunsStore, import.meta.hot))
