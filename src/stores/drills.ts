import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { DrillChange, DrillDetail, DrillOverview, DrillRecordInput, DrillSummary, NewDrill } from '../../shared/schemas/drills'
import { type ApiError, toApiError } from '../api/http'
import { drillsApi } from '../api/drills'

/** Drills: the list and history overview, the drill open in the detail page, the public receipt confirmation. */
export const useDrillsStore = defineStore('drills', () => {
  const drills = ref<DrillSummary[]>([])
  const overview = ref<DrillOverview | null>(null)
  const current = ref<DrillDetail | null>(null)
  const people = ref<{ id: number; name: string; email: string; role: string }[]>([])
  const isLoading = ref(false)
  const error = ref<ApiError | null>(null)

  async function guarded<T>(fn: () => Promise<T>): Promise<T | undefined> {
    isLoading.value = true
    try {
      const r = await fn()
      error.value = null
      return r
    } catch (e) {
      error.value = toApiError(e)
      return undefined
    } finally {
      isLoading.value = false
    }
  }

  const fetchList = (withOverview: boolean) => guarded(async () => {
    drills.value = await drillsApi.list()
    overview.value = withOverview ? await drillsApi.overview() : null
  })
  const open = (id: number) => guarded(async () => { current.value = await drillsApi.get(id) })
  const loadPeople = async () => { people.value = await drillsApi.people() }

  async function schedule(input: NewDrill) { current.value = await drillsApi.schedule(input); return current.value }
  async function change(c: DrillChange) { current.value = await drillsApi.change(current.value!.id, c) }
  async function cancel(reason: string) { current.value = await drillsApi.cancel(current.value!.id, reason) }
  async function record(input: DrillRecordInput) { current.value = await drillsApi.record(current.value!.id, input) }
  async function addFinding(f: { finding: string; action: string; ownerId: number; dueDate: string }) { current.value = await drillsApi.addFinding(current.value!.id, f) }
  async function setFinding(id: number, status: 'open' | 'closed', note: string) { current.value = await drillsApi.setFinding(id, status, note) }
  async function setFrequency(siteId: number, days: number) { overview.value = await drillsApi.setFrequency(siteId, days) }

  const receiptInfo = (token: string) => drillsApi.receiptInfo(token)
  const confirmReceipt = (token: string) => drillsApi.confirm(token)

  return { drills, overview, current, people, isLoading, error, fetchList, open, loadPeople, schedule, change, cancel, record, addFinding, setFinding, setFrequency, receiptInfo, confirmReceipt }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useDrillsStore, import.meta.hot))
