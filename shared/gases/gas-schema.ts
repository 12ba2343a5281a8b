import { z } from 'zod'

/**
 * Properties of one gas as plain data. The engine reads only these fields, so an organisation can add a
 * custom gas (validated by {@link GasSchema}) without code changes. Limits are ppm by volume; null means
 * "none established". Every value should carry a short citation in `sources` keyed by field name.
 */
export const GasLimitsSchema = z.object({
  /** NIOSH REL time-weighted average, ppm (10-h day). */
  rel_twa_ppm: z.number().positive().nullable(),
  /** NIOSH REL short-term (15-min) limit, ppm. */
  rel_stel_ppm: z.number().positive().nullable(),
  /** NIOSH REL ceiling, ppm. */
  rel_ceiling_ppm: z.number().positive().nullable(),
  /** OSHA PEL time-weighted average, ppm (8-h day). */
  pel_twa_ppm: z.number().positive().nullable(),
  /** OSHA PEL ceiling, ppm. */
  pel_ceiling_ppm: z.number().positive().nullable(),
  /** NIOSH IDLH, ppm. */
  idlh_ppm: z.number().positive().nullable(),
})

export const DiffusivityMethodSchema = z.enum(['measured', 'fuller', 'chapman-enskog', 'estimate'])

export const GasSchema = z.object({
  /** Short identifier, e.g. "NH3". */
  id: z.string().min(1).max(40),
  name: z.string().min(1),
  cas: z.string().regex(/^\d{2,7}-\d{2}-\d$/).nullable(),
  /** Molar mass, g/mol. */
  molar_mass_g_mol: z.number().positive().max(2000),
  /** Density relative to air at the same T and P (M / 28.96 for an ideal gas). */
  relative_density: z.number().positive(),
  limits: GasLimitsSchema,
  /** Lower explosive limit, vol %; null if nonflammable. */
  lel_pct: z.number().positive().max(100).nullable(),
  /** Upper explosive limit, vol %; null if nonflammable or not published. */
  uel_pct: z.number().positive().max(100).nullable(),
  /** Simple asphyxiant: the hazard is oxygen displacement. */
  asphyxiant: z.boolean(),
  pyrophoric: z.boolean(),
  oxidizer: z.boolean(),
  /** Ratio of specific heats Cp/Cv at 298 K, used by the orifice equations. */
  gamma: z.number().gt(1).max(1.7),
  /** Binary diffusivity in air at 298.15 K and 1 atm, m²/s. */
  diffusivity_m2_s: z.number().positive().max(1e-3),
  diffusivity_method: DiffusivityMethodSchema,
  /** Free-text notes shown to users (hydrolysis products, edition changes...). */
  notes: z.string().optional(),
  /** Citation for each value, keyed by field name (e.g. "limits.idlh_ppm"). */
  sources: z.record(z.string(), z.string()),
})

/** A gas of the library or a custom gas. */
export type Gas = z.infer<typeof GasSchema>
export type GasLimits = z.infer<typeof GasLimitsSchema>
