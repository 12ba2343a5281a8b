import type { SimulationResult } from '../../shared/engine/simulate'

/** Messages from the simulation worker to its owner. */
export type WorkerMessage =
  | { type: 'progress'; fraction: number }
  | { type: 'result'; result: SimulationResult }
  | { type: 'error'; name: string; message: string; field?: string }

/** Data the worker starts with. `cancelFlag` is shared: the owner stores 1 to cancel. */
export interface WorkerInput {
  scenario: unknown
  cancelFlag: SharedArrayBuffer
}
