import { z } from 'zod'

/**
 * What a plan version was built on, recorded when it is published, and why a plan is stale now
 * (server/services/staleness.service.ts).
 */

/** One result a plan version uses, with the versions it was computed with. */
export const BasisRun = z.object({
  runId: z.number().int(),
  scenarioId: z.number().int().nullable(),
  /** The scenario's edit number when the result was stored (null: not from a saved scenario, or not recorded). */
  scenarioVersion: z.number().int().nullable(),
  floorVersion: z.number().int(),
  engineVersion: z.number().int(),
  gasLibraryVersion: z.number().int(),
  gasId: z.string().nullable(),
  gasEntryHash: z.string().nullable(),
})
export type BasisRun = z.infer<typeof BasisRun>

export const PlanBasis = z.object({
  floorId: z.number().int().nullable(),
  /** The floor plan's saved version when the plan version was published. */
  floorVersion: z.number().int().nullable(),
  runs: z.array(BasisRun),
})
export type PlanBasis = z.infer<typeof PlanBasis>

export const STALE_KINDS = ['floor', 'scenario', 'gas', 'engine'] as const
export const StaleKind = z.enum(STALE_KINDS)
export const STALE_KIND_LABELS: Record<z.infer<typeof StaleKind>, string> = {
  floor: 'Floor plan changed',
  scenario: 'Scenario changed',
  gas: 'Gas library changed',
  engine: 'Engine changed',
}

export const StaleReason = z.object({
  kind: StaleKind,
  /** "room Wet lab's air changes changed from 6 to 4 on 2 Dec by Dana Officer". */
  reason: z.string(),
  at: z.string(),
})
export type StaleReason = z.infer<typeof StaleReason>

/** Null when the plan is up to date with everything it is built on. */
export const PlanStaleness = z.object({
  since: z.string(),
  reasons: z.array(StaleReason),
}).nullable()
export type PlanStaleness = z.infer<typeof PlanStaleness>

/** "Bring up to date": re-run the plan's scenarios, refresh the draft from the new results, and optionally publish. */
export const BringUpToDate = z.object({
  publish: z.boolean().default(true),
  ackDueDays: z.number().int().min(1, 'At least 1 day').max(90, 'At most 90 days').default(14),
})
export type BringUpToDate = z.infer<typeof BringUpToDate>

export const PlanUpdateState = z.object({
  id: z.number().int(),
  status: z.enum(['waiting', 'refreshed', 'published', 'failed']),
  runIds: z.array(z.number().int()),
  message: z.string().nullable(),
  /** Old against new times to limits, once the re-runs finished. */
  changes: z.array(z.string()),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
}).nullable()
export type PlanUpdateState = z.infer<typeof PlanUpdateState>

export const ReviewIntervalInput = z.object({
  /** Days after which a plan's acknowledgments are due again even when nothing changed. */
  days: z.number().int().min(7, 'At least 7 days').max(1825, 'At most 5 years'),
})
export const ReviewInterval = z.object({ siteId: z.number().int(), days: z.number().int() })
