import type { Db } from '../db/database'

export interface AuditEntry {
  orgId: number
  actorId: number | null
  action: string
  targetType: string
  targetId?: string | number | null
  detail?: Record<string, unknown>
}

/** Append-only: nothing in the application updates or deletes audit rows. */
export const appendAudit = (db: Db, e: AuditEntry) =>
  db
    .insertInto('audit_log')
    .values({
      org_id: e.orgId,
      actor_id: e.actorId,
      action: e.action,
      target_type: e.targetType,
      target_id: e.targetId == null ? null : String(e.targetId),
      detail: JSON.stringify(e.detail ?? {}),
    })
    .execute()

export const listAudit = (db: Db, orgId: number, limit = 200) =>
  db.selectFrom('audit_log').selectAll().where('org_id', '=', orgId).orderBy('at', 'desc').limit(limit).execute()
