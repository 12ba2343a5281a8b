import { listGasIds } from '../gases'

/** The gas ids the plan checks accept: the engine's gas library. */
export const LIBRARY_GAS_IDS: ReadonlySet<string> = new Set(listGasIds())
