import { sql } from 'kysely'
import type { Db } from '../db/database'

/** Sensitivity bundle members (migrations/2026120204_run_bundles.ts); plain SQL: the table has no row type of its own. */
export const insertBundleMember = (db: Db, m: { runId: number; nominalRunId: number; orgId: number; caseKey: string; caseLabel: string }) =>
  sql`INSERT INTO run_bundle_members (run_id, nominal_run_id, org_id, case_key, case_label) VALUES (${m.runId}, ${m.nominalRunId}, ${m.orgId}, ${m.caseKey}, ${m.caseLabel})`.execute(db)

export interface BundleMemberRow {
  run_id: number; case_key: string; case_label: string; status: string; message: string | null
  started_at: Date | null; finished_at: Date | null; summary: unknown | null
}

/** The members of a nominal run's bundle with their status, timing and stored summary (null until finished). */
export const bundleMembers = async (db: Db, orgId: number, nominalRunId: number) =>
  (await sql<BundleMemberRow>`
    SELECT m.run_id, m.case_key, m.case_label, r.status, r.message, r.started_at, r.finished_at, rr.summary
    FROM run_bundle_members m JOIN runs r ON r.id = m.run_id LEFT JOIN run_results rr ON rr.run_id = m.run_id
    WHERE m.org_id = ${orgId} AND m.nominal_run_id = ${nominalRunId} ORDER BY m.run_id`.execute(db)).rows

/** The nominal run a member belongs to, if it is one. */
export const nominalOf = async (db: Db, orgId: number, runId: number) =>
  (await sql<{ nominal_run_id: number; case_key: string }>`SELECT nominal_run_id, case_key FROM run_bundle_members WHERE org_id = ${orgId} AND run_id = ${runId}`.execute(db)).rows[0] ?? null

export const runTiming = async (db: Db, runId: number) =>
  (await sql<{ status: string; started_at: Date | null; finished_at: Date | null }>`SELECT status, started_at, finished_at FROM runs WHERE id = ${runId}`.execute(db)).rows[0] ?? null
