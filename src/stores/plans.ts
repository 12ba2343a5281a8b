import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { NewPlan, PlanContent, PlanDetail, PlanListItem } from '../../shared/schemas/plans'
import { ApiError, toApiError } from '../api/http'
import { plansApi } from '../api/plans'

/** Response plans: the dashboard list and the plan open in the detail page. */
export const usePlansStore = defineStore('plans', () => {
  const plans = ref<PlanListItem[]>([])
  const current = ref<PlanDetail | null>(null)
  const audit = ref<{ at: string; actor: string | null; action: string; detail: Record<string, unknown> }[]>([])
  const isLoading = ref(false)
  const error = ref<ApiError | null>(null)

  async function fetchList() {
    isLoading.value = true
    try {
      plans.value = await plansApi.list()
      error.value = null
    } catch (e) {
      error.value = toApiError(e)
    } finally {
      isLoading.value = false
    }
  }

  async function open(id: number) {
    isLoading.value = true
    try {
      current.value = await plansApi.get(id)
      audit.value = await plansApi.audit(id)
      error.value = null
    } catch (e) {
      current.value = null
      error.value = toApiError(e)
    } finally {
      isLoading.value = false
    }
  }

  const runsOfFloor = (floorId: number) => plansApi.runsOfFloor(floorId)

  async function create(input: NewPlan) {
    current.value = await plansApi.create(input)
    return current.value
  }
  /**
   * Saves with the updatedAt of the version shown (the one the edit started from). On 409 stale_version the plan
   * is read again, so Save once more is a deliberate overwrite; the page keeps the officer's text meanwhile.
   */
  async function saveDraft(content: PlanContent) {
    const c = current.value!
    const seen = c.versions.find((v) => v.version === c.current.version)?.updatedAt
    try {
      current.value = await plansApi.saveDraft(c.id, content, seen)
    } catch (e) {
      if (!(e instanceof ApiError) || e.code !== 'stale_version') throw e
      current.value = await plansApi.get(c.id).catch(() => c)
      throw new ApiError(e.status, e.code, `${e.message} Your edit is still open here: save again to put it over theirs, or copy what you need and cancel editing to read theirs.`, e.fields)
    }
    audit.value = await plansApi.audit(current.value.id)
  }
  async function refresh(runIds: number[]) {
    current.value = await plansApi.refresh(current.value!.id, runIds)
    audit.value = await plansApi.audit(current.value.id)
  }
  async function publish(ackDueDays: number) {
    current.value = await plansApi.publish(current.value!.id, ackDueDays)
    audit.value = await plansApi.audit(current.value.id)
  }
  async function acknowledge(comment: string) {
    const c = current.value!
    await plansApi.acknowledge(c.id, c.latestPublished!, comment)
    await open(c.id)
  }

  return { plans, current, audit, isLoading, error, fetchList, open, runsOfFloor, create, saveDraft, refresh, publish, acknowledge }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(usePlansStore, import.meta.hot))
