import { describe, expect, it } from 'vitest'
import { checkPlan } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { planToScenario } from '../../shared/floorplan/scenario-io'
import { demoFloorPlan } from '../../server/seed/demo-floor'

describe('the demo floor', () => {
  const plan = demoFloorPlan()
  it('has a gas room with ammonia, chlorine and nitrogen, a corridor, a lab and a cleanroom bay', () => {
    expect(plan.rooms.map((r) => r.kind)).toEqual(expect.arrayContaining(['gas_room', 'corridor', 'lab', 'cleanroom_bay']))
    expect(new Set(plan.sources.map((s) => s.gasId))).toEqual(new Set(['NH3', 'Cl2', 'N2']))
    expect(plan.detectors.length).toBeGreaterThan(3)
    expect(plan.workstations.length).toBeGreaterThan(2)
  })
  it('passes every plan check', () => {
    expect(checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })).toEqual([])
  })
  it('exports as an engine scenario for each of its gases', () => {
    for (const gasId of ['NH3', 'Cl2', 'N2']) {
      const r = planToScenario(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3, gasId })
      expect(r.ok, gasId).toBe(true)
    }
  })
})
