import type { Plan, Room, Source } from '../../shared/floorplan/plan-schema'
import { emptyPlan } from '../../shared/floorplan/plan-schema'

/** A rectangle room from (x0, y0) to (x1, y1), metres. */
export function rectRoom(id: string, x0: number, y0: number, x1: number, y1: number): Room {
  return { id, name: id, kind: 'lab', polygon: [[x0, y0], [x1, y0], [x1, y1], [x0, y1]],
    ventilation: { mode: 'ach', airChangesPerHour: 6 } }
}

export function source(id: string, x: number, y: number, gasId = 'NH3'): Source {
  return { id, name: id, kind: 'cylinder', gasId, position: [x, y], releaseHeightM: 1, inventoryKg: 20,
    liquefied: true, pressurePa: 8e5, waterVolumeM3: 0.044, restriction: { kind: 'orifice', diameterM: 0.001 }, dischargeCoefficient: 0.62 }
}

/** Two rooms sharing the wall x = 6, a door on it and a source in the first room. */
export function twoRoomPlan(): Plan {
  return {
    ...emptyPlan(),
    rooms: [rectRoom('gas-room', 0, 0, 6, 4), rectRoom('corridor', 6, 0, 20, 2)],
    openings: [{ id: 'door-1', name: 'D1', kind: 'door', segment: [[6, 0.4], [6, 1.6]], open: true }],
    sources: [source('leak-1', 1.1, 1.1)],
  }
}
