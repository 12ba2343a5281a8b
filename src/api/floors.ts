import { z } from 'zod'
import type { Plan } from '../../shared/floorplan/plan-schema'
import {
  FLOOR_API, FloorDetail, FloorImage, FloorList, PeopleList, SavePlanResult, Site, SiteList,
  type FloorInput, type FloorUpdate, type SiteInput,
} from '../../shared/schemas/floors'
import { CSRF_HEADER } from '../../shared/api-paths'
import { ApiError, ensureCsrfCookie, http } from './http'

/**
 * The updatedAt each floor was last read or saved at in this tab: a settings change sends it, so a change someone
 * else saved since answers 409 stale_version instead of being overwritten (issue 14).
 */
const readAt = new Map<number, string>()
const remember = <T extends { id?: number; updatedAt: string }>(id: number, f: T): T => { readAt.set(id, f.updatedAt); return f }

export const floorsApi = {
  listSites: async () => (await http.get(FLOOR_API.sites, { schema: SiteList })).sites,
  createSite: (input: SiteInput) => http.post(FLOOR_API.sites, input, { schema: Site }),
  listFloors: async () => (await http.get(FLOOR_API.floors, { schema: FloorList })).floors,
  listPeople: async () => (await http.get(FLOOR_API.people, { schema: PeopleList })).people,
  createFloor: async (siteId: number, input: FloorInput) => {
    const f = await http.post(FLOOR_API.siteFloors(siteId), input, { schema: FloorDetail })
    return remember(f.id, f)
  },
  getFloor: async (id: number) => remember(id, await http.get(FLOOR_API.floor(id), { schema: FloorDetail })),
  /**
   * Sends the updatedAt this tab read. On 409 stale_version the floor is read again (so Save once more is a
   * deliberate overwrite) and the message says so; the caller keeps what was typed.
   */
  async updateFloor(id: number, patch: FloorUpdate) {
    try {
      return remember(id, await http.patch(FLOOR_API.floor(id), { updatedAt: readAt.get(id), ...patch }, { schema: FloorDetail }))
    } catch (e) {
      if (!(e instanceof ApiError) || e.code !== 'stale_version') throw e
      await floorsApi.getFloor(id).catch(() => undefined)
      throw new ApiError(e.status, e.code, `${e.message}. What you entered is still here: save again to put it over their change, or cancel and reopen the floor to see theirs.`, e.fields)
    }
  },
  /** 409 stale_version when someone saved since `version`. */
  savePlan: async (id: number, version: number, plan: Plan) => remember(id, await http.put(FLOOR_API.floorPlan(id), { version, plan }, { schema: SavePlanResult })),
  /** 400 plan_invalid with one field per reason when the plan is not valid engine input. */
  exportScenario: (id: number, gasId?: string) => http.get(FLOOR_API.floorScenario(id), { query: { gasId }, schema: z.record(z.string(), z.unknown()) }),
  imageUrl: (floorId: number, imageId: number) => FLOOR_API.floorImage(floorId, imageId),

  /** Multipart upload; the server decides the type by the bytes (PNG or JPEG, at most 10 MB). */
  async uploadImage(floorId: number, file: File): Promise<FloorImage> {
    const form = new FormData()
    form.append('file', file)
    const token = await ensureCsrfCookie()
    let response: Response
    try {
      response = await fetch(FLOOR_API.floorImages(floorId), { method: 'POST', body: form, credentials: 'same-origin', headers: { [CSRF_HEADER]: token } })
    } catch {
      throw new ApiError(0, 'network', 'Cannot reach the Driftwarden server. Check your connection and try again.')
    }
    const body = await response.json().catch(() => null)
    if (!response.ok) throw new ApiError(response.status, body?.error?.code ?? `http-${response.status}`, body?.error?.message ?? 'Upload failed', body?.error?.fields ?? {})
    return FloorImage.parse(body)
  },
}
