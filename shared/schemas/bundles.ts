import { z } from 'zod'

/** GET /api/runs/:id/bundle: the sensitivity cases of a run and the band of each time to a limit (shared/runs/bundle.ts). */
export const BundleCaseState = z.object({
  key: z.string(),
  label: z.string(),
  runId: z.number().int(),
  status: z.string(),
  message: z.string().nullable(),
  /** Wall-clock seconds from the worker taking the run to its result. */
  computeS: z.number().nullable(),
})

export const BandRow = z.object({
  kind: z.enum(['receptor', 'room', 'first_alarm']),
  id: z.string(),
  name: z.string(),
  limitKey: z.string(),
  limitLabel: z.string(),
  nominalS: z.number().nullable(),
  earliestS: z.number().nullable(),
  latestS: z.number().nullable(),
  earliestCase: z.string().nullable(),
})

export const RunBundle = z.object({
  nominalRunId: z.number().int(),
  /** Every case, the nominal first. */
  cases: z.array(BundleCaseState),
  complete: z.boolean(),
  /** From the finished cases only until `complete`. */
  band: z.array(BandRow),
  peaks: z.array(z.object({ id: z.string(), name: z.string(), nominalPpm: z.number(), lowPpm: z.number(), highPpm: z.number(), highCase: z.string() })),
  /** The bundle's cost against the nominal run alone, in words and figures. */
  cost: z.object({ runs: z.number().int(), computeS: z.number().nullable(), nominalS: z.number().nullable(), text: z.string() }),
  notes: z.array(z.string()),
  caution: z.string(),
})
export type RunBundle = z.infer<typeof RunBundle>

/** GET /api/runs/:id/bundle/fronts: which limit's fronts. */
export const BundleFrontsQuery = z.object({ limitKey: z.string().trim().min(1, 'Required').max(64) })

