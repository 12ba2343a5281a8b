import type { Plan } from '../../shared/floorplan/plan-schema'
import type { EgressField } from '../../shared/egress/compute'
import type { RunSummary } from '../../shared/schemas/runs'
import { fixtureSummary } from './plans-fixtures'

/**
 * A floor where the only short way out passes through the gas room:
 *
 *   y=6 ┌──────────────────── Corridor C ─────────────────────────┐
 *       │                                                          ▯ exit E2 (x=30, stair)
 *   y=4 └─[d-ac]─┬──────[d-sc]──────┬──────────────────────────────┘
 *       │ Office A ▯d-as  Gas room S ▯ exit E1 (x=8, outdoors)
 *   y=0 └─────────┴───────────────────┘
 *       x=0      x=4                 x=8
 *
 * From A's centre (2, 2): through S to E1 is 2 + 4 = 6 m; through the corridor to E2 is 2 + √(28² + 1²) ≈ 30.02 m.
 * The field holds `gasPpm` in S at every time and `corridorPpm` in the corridor.
 */
export function shortcutFloor(opts: { withCorridorExit?: boolean } = {}): Plan {
  const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] => [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]
  return {
    rooms: [
      { id: 'A', name: 'Office A', kind: 'other', polygon: rect(0, 0, 4, 4), ventilation: { mode: 'ach', airChangesPerHour: 6 } },
      { id: 'S', name: 'Gas room S', kind: 'gas_room', polygon: rect(4, 0, 8, 4), ventilation: { mode: 'ach', airChangesPerHour: 20 } },
      { id: 'C', name: 'Corridor C', kind: 'corridor', polygon: rect(0, 4, 30, 6), ventilation: { mode: 'ach', airChangesPerHour: 4 } },
    ],
    openings: [
      { id: 'd-as', name: 'A–S door', kind: 'door', segment: [[4, 1.5], [4, 2.5]], open: true },
      { id: 'd-ac', name: 'A–C door', kind: 'door', segment: [[1.5, 4], [2.5, 4]], open: true },
      { id: 'd-sc', name: 'S–C door', kind: 'door', segment: [[5.5, 4], [6.5, 4]], open: false },
      { id: 'E1', name: 'Gas room exit', kind: 'door', segment: [[8, 1.5], [8, 2.5]], open: false, exit: 'outdoors' },
      ...(opts.withCorridorExit === false ? [] : [{ id: 'E2', name: 'Stair door', kind: 'door' as const, segment: [[30, 4.5], [30, 5.5]] as [[number, number], [number, number]], open: false, exit: 'stair' as const }]),
    ],
    sources: [
      { id: 'cyl', name: 'NH3 cylinder', kind: 'cylinder', gasId: 'NH3', position: [6, 1], releaseHeightM: 1, inventoryKg: 20, liquefied: true,
        pressurePa: 8e5, waterVolumeM3: 0.04, restriction: { kind: 'rfo', diameterM: 0.0003 }, dischargeCoefficient: 0.8 },
    ],
    detectors: [],
    exhausts: [],
    workstations: [{ id: 'ws-a', name: 'Desk A', position: [3, 1], breathingHeightM: 1.1 }],
    underlay: null,
    assemblyPoints: [{ id: 'ap', name: 'Car park', position: [32, 5] }],
  }
}

/** Fields on a 0.5 m grid over 30 × 6 m, output every 10 s for 600 s: constant per room. */
export function shortcutField(gasPpm: number, corridorPpm = 0, officePpm = 0): EgressField {
  const cellM = 0.5, nx = 60, ny = 12
  const timesS = Array.from({ length: 61 }, (_, k) => k * 10)
  const plane = new Float32Array(nx * ny)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const x = (i + 0.5) * cellM, y = (j + 0.5) * cellM
    plane[i + nx * j] = y > 4 ? corridorPpm : x > 4 && x < 8 ? gasPpm : x < 4 ? officePpm : 0
  }
  const frames = new Float32Array(timesS.length * nx * ny)
  for (let k = 0; k < timesS.length; k++) frames.set(plane, k * nx * ny)
  return { meta: { nx, ny, cellM, originM: [0, 0], timesS }, frames }
}

export function shortcutSummary(over: Partial<RunSummary> = {}): RunSummary {
  return fixtureSummary({
    receptors: [],
    rooms: [
      { id: 'A', name: 'Office A', kind: 'other', peakPpm: 0, firstExceedS: { idlh: null }, finalMeanPpm: 0 },
      { id: 'S', name: 'Gas room S', kind: 'gas_room', peakPpm: 1000, firstExceedS: { idlh: 0 }, finalMeanPpm: 1000 },
      { id: 'C', name: 'Corridor C', kind: 'corridor', peakPpm: 0, firstExceedS: { idlh: null }, finalMeanPpm: 0 },
    ],
    firstAlarm: { detectorId: 'det', level: 'low', timeS: 40 },
    ...over,
  })
}
