import type { Person, Site, SiteInput } from '../../shared/schemas/floors'
import { notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { appendAudit } from '../repositories/audit.repo'
import { floorIdsOfUser } from '../repositories/floors.repo'
import { deleteSite, findSiteInOrg, insertSite, listAssignablePeople, listSitesInOrg, updateSite } from '../repositories/sites.repo'
import type { ServiceContext } from './context'
import { canManageFloors } from '../domain/access'

type SiteRow = { id: number; name: string; address: string; created_at: Date | string; floor_count?: number }

function toSite(row: SiteRow): Site {
  return { id: row.id, name: row.name, address: row.address, floorCount: Number(row.floor_count ?? 0), createdAt: new Date(row.created_at).toISOString() }
}

/** Officers see every site; lab managers and staff only sites holding a floor they belong to. */
export async function listSites(ctx: ServiceContext, actor: Actor): Promise<{ sites: Site[] }> {
  const visible = canManageFloors(actor) ? undefined : await floorIdsOfUser(ctx.db, actor.id)
  return { sites: (await listSitesInOrg(ctx.db, actor.orgId, visible)).map(toSite) }
}

export async function createSite(ctx: ServiceContext, actor: Actor, input: Required<SiteInput>): Promise<Site> {
  const row = await insertSite(ctx.db, { orgId: actor.orgId, name: input.name, address: input.address })
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'site.created', targetType: 'site', targetId: row.id })
  return toSite({ ...row, floor_count: 0 })
}

export async function changeSite(ctx: ServiceContext, actor: Actor, id: number, patch: Partial<SiteInput>): Promise<Site> {
  const row = await updateSite(ctx.db, actor.orgId, id, patch)
  if (!row) throw notFound('Site')
  const counted = (await listSitesInOrg(ctx.db, actor.orgId)).find((s) => s.id === id)
  return toSite({ ...row, floor_count: counted?.floor_count ?? 0 })
}

export async function removeSite(ctx: ServiceContext, actor: Actor, id: number): Promise<void> {
  const r = await deleteSite(ctx.db, actor.orgId, id)
  if (!r.numDeletedRows) throw notFound('Site')
  await appendAudit(ctx.db, { orgId: actor.orgId, actorId: actor.id, action: 'site.deleted', targetType: 'site', targetId: id })
}

/** Ensures the site exists in the caller's organization (404 otherwise). */
export async function requireSite(ctx: ServiceContext, actor: Actor, id: number) {
  const site = await findSiteInOrg(ctx.db, actor.orgId, id)
  if (!site) throw notFound('Site')
  return site
}

export async function listPeople(ctx: ServiceContext, actor: Actor): Promise<{ people: Person[] }> {
  return { people: await listAssignablePeople(ctx.db, actor.orgId) }
}
