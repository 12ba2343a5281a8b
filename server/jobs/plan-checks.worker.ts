// The plan checks of big plans, off the main thread (issue 14): one long-lived thread answers { id, plan, ceilingM }.
import { parentPort } from 'node:worker_threads'
import { checkPlan } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import type { Plan } from '../../shared/floorplan/plan-schema'

parentPort!.on('message', (m: { id: number; plan: Plan; ceilingM: number }) => {
  try {
    parentPort!.postMessage({ id: m.id, problems: checkPlan(m.plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: m.ceilingM }) })
  } catch (e) {
    parentPort!.postMessage({ id: m.id, error: (e as Error).message })
  }
})
