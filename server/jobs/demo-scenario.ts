import type { ScenarioConfig } from '../../shared/schemas/runs'
import type { Db } from '../db/database'
import { listFloors } from '../repositories/floors.repo'
import { findScenarioByName, insertScenario } from '../repositories/scenarios.repo'
import { DEMO_FLOOR_NAME } from '../seed/demo-floor'

export const DEMO_SCENARIO_NAME = 'Ammonia cabinet valve leak, normal ventilation'

/** Coarse enough to finish in seconds on a laptop; officers refine cell size for their own studies. */
export const DEMO_SCENARIO: ScenarioConfig = {
  name: DEMO_SCENARIO_NAME,
  sourceIds: ['nh3-cabinet'],
  release: 'blowdown',
  durationS: 900,
  outputIntervalS: 15,
  ventilationState: 'normal',
  proppedOpeningIds: [],
  cellM: 0.25,
  layers: 6,
}

/** Demo step: the demo scenario on the demo floor, when that floor exists. Idempotent; not run at seed time. */
export async function seedDemoScenario(db: Db, seed: { orgId: number }): Promise<number | null> {
  const floor = (await listFloors(db, seed.orgId)).find((f) => f.name === DEMO_FLOOR_NAME)
  if (!floor) return null
  const existing = await findScenarioByName(db, floor.id, DEMO_SCENARIO_NAME)
  if (existing) return existing.id
  return (await insertScenario(db, { orgId: seed.orgId, floorId: floor.id, name: DEMO_SCENARIO_NAME, config: DEMO_SCENARIO, userId: null })).id
}
