import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { FloorInput, FloorSummary, Person, Site, SiteInput } from '../../shared/schemas/floors'
import { floorsApi } from '../api/floors'
import { type ApiError, toApiError } from '../api/http'

/** Sites and floors the signed-in user can see, and the people officers can assign to floors. */
export const useFloorListStore = defineStore('floor-list', () => {
  const sites = ref<Site[]>([])
  const floors = ref<FloorSummary[]>([])
  /** Only loaded for officers (the server refuses others). */
  const people = ref<Person[]>([])
  const isLoading = ref(false)
  const error = ref<ApiError | null>(null)

  const floorsBySite = computed(() => {
    const map = new Map<number, FloorSummary[]>()
    for (const f of floors.value) map.set(f.siteId, [...(map.get(f.siteId) ?? []), f])
    return map
  })

  async function load(withPeople: boolean): Promise<void> {
    isLoading.value = true
    try {
      ;[sites.value, floors.value, people.value] = await Promise.all([
        floorsApi.listSites(), floorsApi.listFloors(), withPeople ? floorsApi.listPeople() : Promise.resolve([]),
      ])
      error.value = null
    } catch (e) {
      error.value = toApiError(e)
    } finally {
      isLoading.value = false
    }
  }

  /** Throws ApiError (400 with field messages). */
  async function createSite(input: SiteInput): Promise<Site> {
    const site = await floorsApi.createSite(input)
    sites.value = [...sites.value, site].sort((a, b) => a.name.localeCompare(b.name))
    return site
  }

  /** Throws ApiError (400 with field messages). */
  async function createFloor(siteId: number, input: FloorInput): Promise<number> {
    const floor = await floorsApi.createFloor(siteId, input)
    floors.value = [...floors.value, floor]
    sites.value = sites.value.map((s) => (s.id === siteId ? { ...s, floorCount: s.floorCount + 1 } : s))
    return floor.id
  }

  return { sites, floors, people, isLoading, error, floorsBySite, load, createSite, createFloor }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useFloorListStore, import.meta.hot))
