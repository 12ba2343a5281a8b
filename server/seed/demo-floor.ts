import { checkPlan, isPlanValid } from '../../shared/floorplan/checks'
import { LIBRARY_GAS_IDS } from '../../shared/floorplan/gas-ids'
import { Plan } from '../../shared/floorplan/plan-schema'
import type { Db } from '../db/database'
import { insertFloor, listFloors, replaceFloorMembers } from '../repositories/floors.repo'
import { findSiteByName, insertSite } from '../repositories/sites.repo'

/** The invented demo floor. Names, layout and inventories are made up; they only look like a real fab wing. */
export const DEMO_FLOOR_NAME = 'Level 2 – Thin-film process area'
const CEILING_M = 3.0

const BAR = 1e5

/**
 * A gas room with toxic (ammonia, chlorine) and inert (nitrogen) cylinders, a corridor, a thin-film lab, an
 * ISO 5 cleanroom bay and a write-up room, with detectors, exhausts and occupied workstations. Pressures
 * are gauge; liquefied gases sit at their vapour pressure near 21 °C. Every figure is illustrative.
 */
export function demoFloorPlan(): Plan {
  const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] => [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]
  return Plan.parse({
    rooms: [
      { id: 'gas-room', name: 'Gas room G-204', kind: 'gas_room', polygon: rect(0, 0, 6, 5), ventilation: { mode: 'ach', airChangesPerHour: 20 } },
      { id: 'lab', name: 'Thin-film lab L-210', kind: 'lab', polygon: rect(6, 0, 14, 5), ventilation: { mode: 'ach', airChangesPerHour: 8 } },
      { id: 'bay-3', name: 'Cleanroom bay 3 (ISO 5)', kind: 'cleanroom_bay', polygon: rect(14, 0, 24, 5),
        ventilation: { mode: 'downflow', downflowSpeedMS: 0.35, exhaustFraction: 0.1 } },
      { id: 'corridor', name: 'Service corridor C2', kind: 'corridor', polygon: rect(0, 5, 24, 7.4), ventilation: { mode: 'ach', airChangesPerHour: 4 } },
      { id: 'write-up', name: 'Write-up room W-212', kind: 'other', polygon: rect(0, 7.4, 8, 11), ventilation: { mode: 'ach', airChangesPerHour: 4 } },
    ],
    openings: [
      { id: 'door-gas-room', name: 'G-204 door', kind: 'door', segment: [[2, 5], [3, 5]], open: false },
      { id: 'door-lab', name: 'L-210 door', kind: 'door', segment: [[9, 5], [10.2, 5]], open: true },
      { id: 'door-bay-3', name: 'Bay 3 airlock door', kind: 'door', segment: [[20, 5], [21.2, 5]], open: false },
      { id: 'pass-lab-bay', name: 'Wafer pass-through', kind: 'pass_through', segment: [[14, 2], [14, 2.6]], open: false },
      { id: 'door-write-up', name: 'W-212 door', kind: 'door', segment: [[3, 7.4], [4, 7.4]], open: true },
      // Exits (closed doors on outside walls): a stair at each end of the corridor, and the write-up room's own door out.
      { id: 'exit-west-stair', name: 'West stair door', kind: 'door', segment: [[0, 5.6], [0, 6.8]], open: false, exit: 'stair' },
      { id: 'exit-east-stair', name: 'East stair door', kind: 'door', segment: [[24, 5.6], [24, 6.8]], open: false, exit: 'stair' },
      { id: 'exit-write-up', name: 'W-212 outside door', kind: 'door', segment: [[6, 11], [7, 11]], open: false, exit: 'outdoors' },
    ],
    sources: [
      { id: 'nh3-cabinet', name: 'NH3 gas cabinet GC-1', kind: 'gas_cabinet', gasId: 'NH3', position: [1, 0.6], releaseHeightM: 1.2,
        liquefied: true, inventoryKg: 22, pressurePa: 7.9 * BAR, waterVolumeM3: 0.044, restriction: { kind: 'rfo', diameterM: 0.000254 },
        dischargeCoefficient: 0.8 },
      { id: 'cl2-cabinet', name: 'Cl2 gas cabinet GC-2', kind: 'gas_cabinet', gasId: 'Cl2', position: [2.4, 0.6], releaseHeightM: 1.2,
        liquefied: true, inventoryKg: 30, pressurePa: 5.8 * BAR, waterVolumeM3: 0.044, restriction: { kind: 'rfo', diameterM: 0.000254 },
        dischargeCoefficient: 0.8 },
      { id: 'n2-rack', name: 'N2 cylinder rack', kind: 'cylinder', gasId: 'N2', position: [5.3, 4.2], releaseHeightM: 1.0,
        liquefied: false, inventoryKg: 11.7, pressurePa: 200 * BAR, waterVolumeM3: 0.05, restriction: { kind: 'orifice', diameterM: 0.002 },
        dischargeCoefficient: 0.62 },
      { id: 'nh3-line-lab', name: 'NH3 line to CVD tool', kind: 'line', gasId: 'NH3', position: [7.2, 0.8], releaseHeightM: 1.0,
        liquefied: false, inventoryKg: null, pressurePa: 2 * BAR, waterVolumeM3: null, restriction: { kind: 'orifice', diameterM: 0.001 },
        dischargeCoefficient: 0.62 },
    ],
    detectors: [
      { id: 'det-nh3-gr', name: 'NH3 detector G-204', gasId: 'NH3', position: [1.6, 1.8], mountingHeightM: 2.6, alarmLowPpm: 12.5, alarmHighPpm: 35 },
      { id: 'det-cl2-gr', name: 'Cl2 detector G-204', gasId: 'Cl2', position: [2.6, 1.8], mountingHeightM: 0.45, alarmLowPpm: 0.25, alarmHighPpm: 0.5 },
      { id: 'det-o2-gr', name: 'O2 monitor G-204 (N2 display)', gasId: 'N2', position: [4.8, 3.4], mountingHeightM: 1.5, alarmLowPpm: 66986, alarmHighPpm: 138756 },
      { id: 'det-nh3-corr', name: 'NH3 detector corridor', gasId: 'NH3', position: [3.5, 6.4], mountingHeightM: 2.6, alarmLowPpm: 12.5, alarmHighPpm: 35 },
      { id: 'det-nh3-lab', name: 'NH3 detector at CVD tool', gasId: 'NH3', position: [8, 1.2], mountingHeightM: 2.4, alarmLowPpm: 12.5, alarmHighPpm: 35 },
      { id: 'det-cl2-bay', name: 'Cl2 detector etch tool', gasId: 'Cl2', position: [19, 1.6], mountingHeightM: 0.45, alarmLowPpm: 0.25, alarmHighPpm: 0.5 },
    ],
    exhausts: [
      { id: 'exh-gc1', name: 'GC-1 cabinet exhaust', kind: 'cabinet', position: [1, 0.4], heightM: 2.2, flowM3S: 0.12 },
      { id: 'exh-gc2', name: 'GC-2 cabinet exhaust', kind: 'cabinet', position: [2.4, 0.4], heightM: 2.2, flowM3S: 0.12 },
      { id: 'exh-hood', name: 'Fume hood H-3', kind: 'hood', position: [12.5, 0.5], heightM: 1.0, flowM3S: 0.47 },
      { id: 'exh-bench', name: 'Wet bench enclosure', kind: 'enclosure', position: [17, 0.8], heightM: 1.0, flowM3S: 0.2 },
    ],
    workstations: [
      { id: 'ws-cvd', name: 'CVD tool operator', position: [8.4, 2.2], breathingHeightM: 1.5 },
      { id: 'ws-hood', name: 'Fume hood user', position: [12.5, 1.3], breathingHeightM: 1.5 },
      { id: 'ws-etch', name: 'Etch tool operator', position: [19.5, 2.6], breathingHeightM: 1.5 },
      { id: 'ws-desk', name: 'Write-up desk', position: [4, 9.6], breathingHeightM: 1.1 },
    ],
    underlay: null,
    assemblyPoints: [{ id: 'assembly-north', name: 'Assembly point: north car park', position: [6.5, 14] }],
  })
}

export interface DemoFloorSeed {
  orgId: number
  siteId: number
  labManagerIds: number[]
  staffIds: number[]
}

/** The demo site, created when missing. Idempotent. */
export async function ensureDemoSite(db: Db, orgId: number, name: string, address = 'Calder Ridge campus, Building C'): Promise<number> {
  return ((await findSiteByName(db, orgId, name)) ?? (await insertSite(db, { orgId, name, address }))).id
}

/**
 * Add the demo floor to the seeded site, with its lab managers and staff. Idempotent: an existing floor of
 * that name is left exactly as it is (people may have edited it since).
 */
export async function seedDemoFloor(db: Db, seed: DemoFloorSeed): Promise<{ floorId: number }> {
  const existing = (await listFloors(db, seed.orgId, { siteId: seed.siteId })).find((f) => f.name === DEMO_FLOOR_NAME)
  const plan = demoFloorPlan()
  const problems = checkPlan(plan, { knownGasIds: LIBRARY_GAS_IDS, ceilingM: CEILING_M })
  const floorId = existing?.id ?? (await insertFloor(db, {
    orgId: seed.orgId, siteId: seed.siteId, name: DEMO_FLOOR_NAME, ceilingHeightM: CEILING_M, plan,
    planValid: isPlanValid(problems), problems, userId: null,
  })).id
  if (!existing) {
    await replaceFloorMembers(db, floorId, 'manager', seed.labManagerIds)
    await replaceFloorMembers(db, floorId, 'member', seed.staffIds)
  }
  return { floorId }
}
