import { contract } from '../../shared/contract'
import type { Plan } from '../../shared/floorplan/plan-schema'
import type { FloorImage, FloorInput, FloorUpdate, SiteInput } from '../../shared/schemas/floors'
import { ApiError, call, urlOf } from './http'

const c = contract.floors
const s = contract.sites

/**
 * The updatedAt each floor was last read or saved at in this tab: a settings change sends it, so a change someone
 * else saved since answers 409 stale_version instead of being overwritten (issue 14).
 */
const readAt = new Map<number, string>()
const remember = <T extends { id?: number; updatedAt: string }>(id: number, f: T): T => { readAt.set(id, f.updatedAt); return f }

export const floorsApi = {
  listSites: async () => (await call(s.list)).sites,
  createSite: (input: SiteInput) => call(s.create, { body: input }),
  listFloors: async () => (await call(c.list)).floors,
  listPeople: async () => (await call(s.people)).people,
  createFloor: async (siteId: number, input: FloorInput) => {
    const f = await call(s.createFloor, { params: { id: siteId }, body: input })
    return remember(f.id, f)
  },
  getFloor: async (id: number) => remember(id, await call(c.get, { params: { id } })),
  /**
   * Sends the updatedAt this tab read. On 409 stale_version the floor is read again (so Save once more is a
   * deliberate overwrite) and the message says so; the caller keeps what was typed.
   */
  async updateFloor(id: number, patch: FloorUpdate) {
    try {
      return remember(id, await call(c.update, { params: { id }, body: { updatedAt: readAt.get(id), ...patch } }))
    } catch (e) {
      if (!(e instanceof ApiError) || e.code !== 'stale_version') throw e
      await floorsApi.getFloor(id).catch(() => undefined)
      throw new ApiError(e.status, e.code, `${e.message}. What you entered is still here: save again to put it over their change, or cancel and reopen the floor to see theirs.`, e.fields)
    }
  },
  /** 409 stale_version when someone saved since `version`. */
  savePlan: async (id: number, version: number, plan: Plan) => remember(id, await call(c.savePlan, { params: { id }, body: { version, plan } })),
  /** 400 plan_invalid with one field per reason when the plan is not valid engine input. */
  exportScenario: async (id: number, gasId?: string) => (await call(c.exportScenario, { params: { id }, query: { gasId } })) as Record<string, unknown>,
  imageUrl: (floorId: number, imageId: number) => urlOf(c.image, { id: floorId, imageId }),

  /** Multipart upload; the server decides the type by the bytes (PNG or JPEG, at most 10 MB). */
  async uploadImage(floorId: number, file: File): Promise<FloorImage> {
    const form = new FormData()
    form.append('file', file)
    return call(c.uploadImage, { params: { id: floorId }, form })
  },
}
