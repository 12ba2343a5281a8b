import { sql } from 'kysely'
import type { Db } from '../db/database'

const DRILL_COLUMNS = [
  'drills.id', 'drills.org_id', 'drills.plan_id', 'drills.plan_version_id', 'drills.floor_id', 'drills.site_id', 'drills.floor_name',
  'drills.site_name', 'drills.title', 'drills.scenario', 'drills.location', 'drills.starts_at', 'drills.time_zone', 'drills.duration_minutes',
  'drills.reminder_minutes', 'drills.reminder_sent_at', 'drills.officer_id', 'drills.checklist', 'drills.predicted', 'drills.status',
  'drills.sequence', 'drills.cancel_reason', 'drills.step_results', 'drills.measured', 'drills.observations', 'drills.recorded_at',
  'drills.recorded_by', 'drills.created_at',
] as const

export type DrillRow = Awaited<ReturnType<typeof findDrillInOrg>> & object

export const insertDrill = (db: Db, d: {
  orgId: number; planId: number; planVersionId: number; floorId: number | null; siteId: number | null; floorName: string; siteName: string;
  title: string; scenario: string; location: string; startsAt: Date; timeZone: string; durationMinutes: number; reminderMinutes: number;
  officerId: number; checklist: unknown; predicted: unknown; userId: number
}) =>
  db.insertInto('drills').values({
    org_id: d.orgId, plan_id: d.planId, plan_version_id: d.planVersionId, floor_id: d.floorId, site_id: d.siteId, floor_name: d.floorName,
    site_name: d.siteName, title: d.title, scenario: d.scenario, location: d.location, starts_at: d.startsAt, time_zone: d.timeZone,
    duration_minutes: d.durationMinutes, reminder_minutes: d.reminderMinutes, officer_id: d.officerId, checklist: JSON.stringify(d.checklist),
    predicted: JSON.stringify(d.predicted), created_by: d.userId,
  }).returning('id').executeTakeFirstOrThrow()

export const findDrillInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('drills').leftJoin('users', 'users.id', 'drills.officer_id').leftJoin('users as rec', 'rec.id', 'drills.recorded_by')
    .select(DRILL_COLUMNS).select(['users.name as officer_name', 'users.email as officer_email', 'rec.name as recorded_by_name'])
    .where('drills.org_id', '=', orgId).where('drills.id', '=', id).executeTakeFirst()

/** Drills of an organization, optionally limited to floors or to drills where a user takes part. */
export const listDrillsInOrg = (db: Db, orgId: number, opts: { floorIds?: number[]; participantUserId?: number } = {}) => {
  let q = db.selectFrom('drills').leftJoin('users', 'users.id', 'drills.officer_id')
    .select(DRILL_COLUMNS).select(['users.name as officer_name'])
    .select([
      sql<number>`(select count(*) from drill_participants p where p.drill_id = drills.id)`.as('participant_count'),
      sql<number>`(select count(*) from drill_participants p where p.drill_id = drills.id and p.confirmed_at is not null)`.as('confirmed_count'),
      sql<number>`(select count(*) from drill_findings f where f.drill_id = drills.id and f.status = 'open')`.as('open_findings'),
    ])
    .where('drills.org_id', '=', orgId).orderBy('drills.starts_at', 'desc').limit(500)
  if (opts.floorIds) q = q.where('drills.floor_id', 'in', opts.floorIds.length ? opts.floorIds : [-1])
  if (opts.participantUserId !== undefined) {
    const uid = opts.participantUserId
    q = q.where(sql<boolean>`exists (select 1 from drill_participants p where p.drill_id = drills.id and p.user_id = ${uid})`)
  }
  return q.execute()
}

export const updateDrill = (db: Db, id: number, patch: {
  title?: string; scenario?: string; location?: string; startsAt?: Date; timeZone?: string; durationMinutes?: number; status?: 'scheduled' | 'completed' | 'cancelled';
  cancelReason?: string; bumpSequence?: boolean; resetReminder?: boolean
}) =>
  db.updateTable('drills').set({
    ...(patch.title !== undefined ? { title: patch.title } : {}),
    ...(patch.scenario !== undefined ? { scenario: patch.scenario } : {}),
    ...(patch.location !== undefined ? { location: patch.location } : {}),
    ...(patch.startsAt !== undefined ? { starts_at: patch.startsAt } : {}),
    ...(patch.timeZone !== undefined ? { time_zone: patch.timeZone } : {}),
    ...(patch.durationMinutes !== undefined ? { duration_minutes: patch.durationMinutes } : {}),
    ...(patch.status !== undefined ? { status: patch.status } : {}),
    ...(patch.cancelReason !== undefined ? { cancel_reason: patch.cancelReason } : {}),
    ...(patch.bumpSequence ? { sequence: sql`sequence + 1` } : {}),
    ...(patch.resetReminder ? { reminder_sent_at: null } : {}),
    updated_at: sql`now()`,
  }).where('id', '=', id).returning(['sequence', 'status']).executeTakeFirstOrThrow()

export const saveRecord = (db: Db, id: number, r: { steps: unknown; measured: unknown; observations: string; completed: boolean; userId: number }) =>
  db.updateTable('drills').set({
    step_results: JSON.stringify(r.steps), measured: JSON.stringify(r.measured), observations: r.observations, recorded_at: sql`now()`,
    recorded_by: r.userId, updated_at: sql`now()`, ...(r.completed ? { status: 'completed' as const } : {}),
  }).where('id', '=', id).execute()

export const insertParticipants = (db: Db, drillId: number, people: { userId: number | null; name: string; email: string; source: string }[]) =>
  people.length
    ? db.insertInto('drill_participants')
      .values(people.map((p) => ({ drill_id: drillId, user_id: p.userId, name: p.name, email: p.email.toLowerCase(), source: p.source })))
      .onConflict((oc) => oc.columns(['drill_id', 'email']).doNothing())
      .returningAll().execute()
    : Promise.resolve([])

export const listParticipants = (db: Db, drillId: number) =>
  db.selectFrom('drill_participants').selectAll().where('drill_id', '=', drillId).orderBy('name').execute()

export const findParticipant = (db: Db, id: number) =>
  db.selectFrom('drill_participants').innerJoin('drills', 'drills.id', 'drill_participants.drill_id')
    .select(['drill_participants.id', 'drill_participants.drill_id', 'drill_participants.name', 'drill_participants.email', 'drill_participants.nonce_hash',
      'drill_participants.token_expires_at', 'drill_participants.token_used_at', 'drill_participants.confirmed_at', 'drills.org_id', 'drills.title',
      'drills.starts_at', 'drills.time_zone', 'drills.location', 'drills.status', 'drills.sequence'])
    .where('drill_participants.id', '=', id).executeTakeFirst()

/** A new notice rotates the receipt token; a move also clears the earlier confirmation. */
export const setParticipantToken = (db: Db, id: number, nonceHash: string, expiresAt: Date, clearConfirmation: boolean) =>
  db.updateTable('drill_participants').set({
    nonce_hash: nonceHash, token_expires_at: expiresAt, token_used_at: null,
    ...(clearConfirmation ? { confirmed_at: null, confirmed_sequence: null } : {}),
  }).where('id', '=', id).execute()

/** Uses up the token and confirms, only if it is still the current, unused nonce (single use even under a race). */
export const confirmParticipant = (db: Db, id: number, nonceHash: string, at: Date) =>
  db.updateTable('drill_participants')
    .set({ token_used_at: at, confirmed_at: sql`coalesce(confirmed_at, ${at})`, confirmed_sequence: sql`(select sequence from drills where drills.id = drill_participants.drill_id)` })
    .where('id', '=', id).where('nonce_hash', '=', nonceHash).where('token_used_at', 'is', null)
    .returning(['id', 'confirmed_at']).executeTakeFirst()

/** The latest notice to each participant of a drill, from the outgoing queue (pending / sent / failed). */
export const latestMailOfDrill = (db: Db, drillId: number) =>
  db.selectFrom('outgoing_mail').select(['ref', 'status', 'attempts', 'last_error', 'id'])
    .where('ref', 'like', `drill:${drillId}:p:%`).orderBy('id', 'desc').execute()

export const dueReminders = (db: Db, now: Date) =>
  db.selectFrom('drills').select(['id', 'org_id'])
    .where('status', '=', 'scheduled').where('reminder_sent_at', 'is', null)
    .where(sql<boolean>`starts_at - make_interval(mins => reminder_minutes) <= ${now}`)
    .where('starts_at', '>', now)
    .orderBy('starts_at').limit(100).execute()

/** Claims the reminder of one drill (so two ticks never send it twice). */
export const claimReminder = (db: Db, id: number, now: Date) =>
  db.updateTable('drills').set({ reminder_sent_at: now }).where('id', '=', id).where('reminder_sent_at', 'is', null)
    .where('status', '=', 'scheduled').returning('id').executeTakeFirst()

export const insertFinding = (db: Db, f: { orgId: number; drillId: number; finding: string; action: string; ownerId: number; ownerName: string; dueDate: string }) =>
  db.insertInto('drill_findings').values({ org_id: f.orgId, drill_id: f.drillId, finding: f.finding, action: f.action, owner_id: f.ownerId, owner_name: f.ownerName, due_date: f.dueDate })
    .returning('id').executeTakeFirstOrThrow()

const FINDING_COLUMNS = [
  'drill_findings.id', 'drill_findings.drill_id', 'drill_findings.finding', 'drill_findings.action', 'drill_findings.owner_id', 'drill_findings.owner_name',
  'drill_findings.status', 'drill_findings.note', 'drill_findings.closed_at', 'drills.title as drill_title', 'drills.floor_id',
] as const

export const listFindings = (db: Db, orgId: number, opts: { drillId?: number; openOnly?: boolean; floorIds?: number[] }) => {
  let q = db.selectFrom('drill_findings').innerJoin('drills', 'drills.id', 'drill_findings.drill_id')
    .select(FINDING_COLUMNS).select(sql<string>`to_char(drill_findings.due_date, 'YYYY-MM-DD')`.as('due'))
    .where('drill_findings.org_id', '=', orgId).orderBy('drill_findings.due_date').orderBy('drill_findings.id')
  if (opts.drillId !== undefined) q = q.where('drill_findings.drill_id', '=', opts.drillId)
  if (opts.openOnly) q = q.where('drill_findings.status', '=', 'open')
  if (opts.floorIds) q = q.where('drills.floor_id', 'in', opts.floorIds.length ? opts.floorIds : [-1])
  return q.execute()
}

export const findFindingInOrg = (db: Db, orgId: number, id: number) =>
  db.selectFrom('drill_findings').selectAll().where('org_id', '=', orgId).where('id', '=', id).executeTakeFirst()

export const updateFinding = (db: Db, id: number, p: { status: 'open' | 'closed'; note?: string; userId: number }) =>
  db.updateTable('drill_findings').set({
    status: p.status, ...(p.note !== undefined ? { note: p.note } : {}),
    ...(p.status === 'closed' ? { closed_at: sql`now()`, closed_by: p.userId } : { closed_at: null, closed_by: null }),
  }).where('id', '=', id).execute()

/** Sites with their drill frequency (a column this feature adds) and held/scheduled drills per floor. */
export const sitesWithDrills = (db: Db, orgId: number) =>
  db.selectFrom('sites').select(['sites.id', 'sites.name', sql<number>`sites.drill_frequency_days`.as('frequency_days')])
    .where('sites.org_id', '=', orgId).orderBy('sites.name').execute()

export const floorDrillStats = (db: Db, orgId: number) =>
  db.selectFrom('floors').leftJoin('drills', (j) => j.onRef('drills.floor_id', '=', 'floors.id'))
    .select(['floors.id', 'floors.name', 'floors.site_id'])
    .select([
      sql<number>`count(drills.id) filter (where drills.status = 'completed')`.as('held'),
      sql<number>`count(drills.id) filter (where drills.status = 'scheduled')`.as('scheduled'),
      sql<Date | null>`max(coalesce(drills.recorded_at, drills.starts_at)) filter (where drills.status = 'completed')`.as('last_held'),
      sql<Date | null>`min(drills.starts_at) filter (where drills.status = 'scheduled')`.as('next_scheduled'),
    ])
    .where('floors.org_id', '=', orgId).groupBy('floors.id').orderBy('floors.name').execute()

export const setSiteFrequency = (db: Db, orgId: number, siteId: number, days: number) =>
  sql`update sites set drill_frequency_days = ${days}, updated_at = now() where id = ${siteId} and org_id = ${orgId}`.execute(db)

/** Active people of the organization who can be invited, with the floors they belong to. */
export const invitablePeople = (db: Db, orgId: number) =>
  db.selectFrom('users').select(['id', 'name', 'email', 'role']).where('org_id', '=', orgId).where('status', '=', 'active').orderBy('name').execute()

export const membersOfFloor = (db: Db, floorId: number, kind: 'manager' | 'member') =>
  db.selectFrom('floor_members').innerJoin('users', 'users.id', 'floor_members.user_id')
    .select(['users.id', 'users.name', 'users.email', 'users.role'])
    .where('floor_members.floor_id', '=', floorId).where('floor_members.kind', '=', kind).where('users.status', '=', 'active')
    .execute()

/** Version numbers of the drilled plan versions, in one query for a whole list of drills. */
export const versionNumbersOf = async (db: Db, orgId: number, versionIds: number[]): Promise<Map<number, number>> =>
  new Map(versionIds.length === 0 ? [] : (await db.selectFrom('plan_versions').select(['id', 'version'])
    .where('org_id', '=', orgId).where('id', 'in', [...new Set(versionIds)]).execute()).map((r) => [r.id, r.version]))

/** The drilled plan version as the drill page shows it. */
export const drilledVersion = (db: Db, orgId: number, versionId: number) =>
  db.selectFrom('plan_versions').select(['version', 'content_hash', 'content']).where('org_id', '=', orgId).where('id', '=', versionId).executeTakeFirst()

export const siteOfFloor = async (db: Db, orgId: number, floorId: number) =>
  (await db.selectFrom('floors').select('site_id').where('org_id', '=', orgId).where('id', '=', floorId).executeTakeFirst())?.site_id ?? null
