import { GAS_LIBRARY } from '../../../shared/gases'

/** Gas picker options from the engine's library: "NH3 — Ammonia". */
export const GAS_OPTIONS = GAS_LIBRARY.map((g) => ({ value: g.id, label: `${g.id} — ${g.name}` }))
