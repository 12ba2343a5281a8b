import { expect } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { insertFloor } from '../../server/repositories/floors.repo'
import { insertScenario } from '../../server/repositories/scenarios.repo'
import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import type { Plan } from '../../shared/floorplan/plan-schema'
import { RunDetail, ScenarioConfig } from '../../shared/schemas/runs'
import type { ApiAgent } from '../support/test-runtime'
import { waitForRun } from './runs-fixtures'

const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] => [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]

/**
 * Office A beside gas room S; S has its own outside exit (the short way out of A crosses S), the corridor's stair is
 * ≈ 30 m away. A large ammonia leak in S: IDLH in S within seconds, so S itself has no safe route and A must walk
 * the corridor.
 */
export function shortcutPlan(): Plan {
  return {
    rooms: [
      { id: 'A', name: 'Office A', kind: 'other', polygon: rect(0, 0, 4, 4), ventilation: { mode: 'ach', airChangesPerHour: 6 } },
      { id: 'S', name: 'Gas room S', kind: 'gas_room', polygon: rect(4, 0, 8, 4), ventilation: { mode: 'ach', airChangesPerHour: 6 } },
      { id: 'C', name: 'Corridor C', kind: 'corridor', polygon: rect(0, 4, 30, 6), ventilation: { mode: 'ach', airChangesPerHour: 4 } },
    ],
    openings: [
      { id: 'd-as', name: 'A–S door', kind: 'door', segment: [[4, 1.5], [4, 2.5]], open: false },
      { id: 'd-ac', name: 'A–C door', kind: 'door', segment: [[1.5, 4], [2.5, 4]], open: true },
      { id: 'E1', name: 'Gas room exit', kind: 'door', segment: [[8, 1.5], [8, 2.5]], open: false, exit: 'outdoors' },
      { id: 'E2', name: 'Stair door', kind: 'door', segment: [[30, 4.5], [30, 5.5]], open: false, exit: 'stair' },
    ],
    sources: [
      { id: 'cyl', name: 'NH3 cylinder', kind: 'cylinder', gasId: 'NH3', position: [6, 1], releaseHeightM: 1, inventoryKg: 20, liquefied: true,
        pressurePa: 8e5, waterVolumeM3: 0.04, restriction: { kind: 'orifice', diameterM: 0.002 }, dischargeCoefficient: 0.62 },
    ],
    detectors: [],
    exhausts: [],
    workstations: [{ id: 'ws-a', name: 'Desk A', position: [3, 1], breathingHeightM: 1.1 }],
    underlay: null,
    assemblyPoints: [{ id: 'ap', name: 'Car park', position: [32, 5] }],
  }
}

/** Inserts the shortcut floor on the org's first site with one scenario, runs it to the end through the API. */
export async function shortcutFloorRun(rt: Runtime, officer: ApiAgent, orgId: number, name = `Egress shortcut ${Date.now()}`) {
  const db = rt.ctx.db
  const site = await db.selectFrom('sites').select('id').where('org_id', '=', orgId).orderBy('id').executeTakeFirstOrThrow()
  const plan = shortcutPlan()
  const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: 3 })
  const floor = await insertFloor(db, { orgId, siteId: site.id, name, ceilingHeightM: 3, plan, planValid: isPlanValid(problems), problems, userId: null })
  const config = ScenarioConfig.parse({ name: 'NH3 2 mm leak', sourceIds: ['cyl'], durationS: 300, outputIntervalS: 10, cellM: 0.25, layers: 6 })
  const sc = await insertScenario(db, { orgId, floorId: floor.id, name: config.name, config, userId: null })
  const started = await officer.post(`/api/scenarios/${sc.id}/runs`).expect(202)
  const { run } = await waitForRun(officer, started.body.id, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status), 120_000)
  expect(run.status).toBe('succeeded')
  return { floorId: floor.id, scenarioId: sc.id, run: RunDetail.parse(run) }
}
