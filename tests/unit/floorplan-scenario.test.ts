import { describe, expect, it } from 'vitest'
import { ScenarioSchema } from '../../shared/engine/scenario-schema'
import { ATMOSPHERE_PA, planToScenario, scenarioToPlan } from '../../shared/floorplan/scenario-io'
import { source, twoRoomPlan } from './floorplan-fixtures'

const ctx = { knownGasIds: new Set(['NH3', 'Cl2', 'N2']), ceilingM: 3 }

describe('planToScenario', () => {
  it('writes a scenario the engine schema accepts, with absolute pressures and probes', () => {
    const plan = twoRoomPlan()
    plan.detectors.push({ id: 'd1', name: 'NH3 det', gasId: 'NH3', position: [2, 2], mountingHeightM: 2.4, alarmLowPpm: 12.5, alarmHighPpm: 25 })
    plan.workstations.push({ id: 'w1', name: 'Bench', position: [10, 1], breathingHeightM: 1.5 })
    plan.exhausts.push({ id: 'x1', name: 'Cabinet', kind: 'cabinet', position: [0.5, 3.5], heightM: 2, flowM3S: 0.14 })
    const r = planToScenario(plan, ctx)
    expect(r.ok).toBe(true)
    if (!r.ok) return
    expect(ScenarioSchema.safeParse(r.scenario).success).toBe(true)
    expect(r.scenario.gas).toEqual({ id: 'NH3' })
    const release = r.scenario.sources[0]!.release
    expect(release.kind === 'cylinder' && release.pressure_pa).toBe(8e5 + ATMOSPHERE_PA)
    expect(r.scenario.probes!.map((p) => p.id)).toEqual(['detector:d1', 'workstation:w1'])
    expect(r.scenario.local_exhausts![0]).toEqual({ id: 'x1', kind: 'gas_cabinet', position_m: [0.5, 3.5, 2], flow_m3_s: 0.14 })
    expect(r.scenario.openings![0]).toEqual({ id: 'door-1', segment_m: [[6, 0.4], [6, 1.6]], open: true })
  })

  it('exports only the chosen gas and says what it left out', () => {
    const plan = twoRoomPlan()
    plan.sources.push(source('cl2', 2, 2, 'Cl2'))
    const r = planToScenario(plan, { ...ctx, gasId: 'Cl2' })
    expect(r.ok && r.scenario.sources.map((s) => s.id)).toEqual(['cl2'])
    expect(r.ok && r.notes[0]).toMatch(/1 source/)
  })

  it('refuses an invalid plan, listing the reasons', () => {
    const plan = twoRoomPlan()
    plan.openings[0]!.segment = [[3, 1], [3, 2]]
    plan.sources[0]!.gasId = 'XX'
    const r = planToScenario(plan, ctx)
    expect(r.ok).toBe(false)
    expect(!r.ok && r.problems.map((p) => p.code)).toEqual(['opening_not_on_wall', 'unknown_gas'])
  })
})

describe('scenarioToPlan', () => {
  it('round-trips a plan through the scenario file', () => {
    const plan = twoRoomPlan()
    plan.sources[0]!.restriction = { kind: 'rfo', diameterM: 0.00025 }
    plan.workstations.push({ id: 'w1', name: '', position: [10, 1], breathingHeightM: 1.5 })
    const r = planToScenario(plan, ctx)
    if (!r.ok) throw new Error('export failed')
    const back = scenarioToPlan(JSON.parse(JSON.stringify(r.scenario)))
    expect(back.ceilingM).toBe(3)
    expect(back.plan.rooms.map((x) => x.polygon)).toEqual(plan.rooms.map((x) => x.polygon))
    expect(back.plan.openings[0]!.segment).toEqual(plan.openings[0]!.segment)
    expect(back.plan.sources[0]).toMatchObject({ id: 'leak-1', gasId: 'NH3', pressurePa: 8e5, liquefied: true, inventoryKg: 20,
      restriction: { kind: 'rfo', diameterM: 0.00025 }, releaseHeightM: 1 })
    expect(back.plan.workstations).toEqual([{ id: 'w1', name: '', position: [10, 1], breathingHeightM: 1.5 }])
  })

  it('reads the example of shared/scenario-format.md, noting what it could not keep', () => {
    const example = {
      format: 'driftwarden-scenario/1', duration_s: 900, output_interval_s: 30, grid: { cell_m: 0.2, layers: 10 }, ceiling_m: 3.0,
      rooms: [
        { id: 'gas-room', polygon_m: [[0, 0], [6, 0], [6, 4], [0, 4]], ventilation: { air_changes_per_hour: 10 } },
        { id: 'corridor', polygon_m: [[6, 0], [20, 0], [20, 2], [6, 2]], ventilation: { air_changes_per_hour: 0 } },
      ],
      openings: [{ id: 'door-1', segment_m: [[6, 0.4], [6, 1.6]], open: true }],
      gas: { id: 'NH3' },
      effective_diffusivity_m2_s: 0.005,
      sources: [
        { id: 'leak-1', position_m: [1.1, 1.1, 1.05], release: { kind: 'constant', rate_m3_s: 1e-4, start_s: 0, end_s: 600 } },
      ],
      probes: [{ id: 'p1', position_m: [4.1, 2.1, 1.65] }],
    }
    const r = scenarioToPlan(example)
    expect(r.plan.rooms).toHaveLength(2)
    expect(r.plan.rooms[0]!.ventilation).toEqual({ mode: 'ach', airChangesPerHour: 10 })
    expect(r.plan.detectors[0]).toMatchObject({ id: 'p1', gasId: 'NH3', mountingHeightM: 1.65 })
    expect(r.notes.join(' ')).toMatch(/constant/)
  })

  it('throws on a file that is not a scenario', () => {
    expect(() => scenarioToPlan({ format: 'nope' })).toThrow()
  })
})
