import type { Plan } from '../../shared/floorplan/plan-schema'
import type { RunSummary } from '../../shared/schemas/runs'

/**
 * A hand-made floor and result for the plan rules, small enough to work out by hand:
 *
 *   y=6 ┌──────────── Corridor C ─────────────┐
 *       │                                     ▯ exit (x=10)
 *   y=4 └──[door A]──┬─────────[door B]───────┘
 *       │  Gas room A │        Lab B          │
 *   y=0 └─────────────┴───────────────────────┘
 *       x=0          x=4                     x=10
 *
 * Ammonia-like gas; detector in A alarms low at 40 s and high at 70 s. The alarm is heard at 40 + 30 = 70 s.
 * Workstation A: TWA at 100 s, STEL at 110 s, IDLH at 150 s; room A reaches IDLH at 120 s → critical at 120 s,
 * egress margin 120 − 70 = 50 s. Workstation B: TWA 200 s, STEL 260 s, no IDLH; room B exceeds TWA at 190 s.
 * Isolation target: first exposure limit at a workstation (100 s) − 70 s = 30 s.
 */
export function fixtureFloor(): Plan {
  const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] => [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]
  return {
    rooms: [
      { id: 'A', name: 'Gas room A', kind: 'gas_room', polygon: rect(0, 0, 4, 4), ventilation: { mode: 'ach', airChangesPerHour: 10 } },
      { id: 'B', name: 'Lab B', kind: 'lab', polygon: rect(4, 0, 10, 4), ventilation: { mode: 'ach', airChangesPerHour: 6 } },
      { id: 'C', name: 'Corridor C', kind: 'corridor', polygon: rect(0, 4, 10, 6), ventilation: { mode: 'ach', airChangesPerHour: 4 } },
    ],
    openings: [
      { id: 'door-a', name: 'Door A', kind: 'door', segment: [[1, 4], [2, 4]], open: false },
      { id: 'door-b', name: 'Door B', kind: 'door', segment: [[6, 4], [7, 4]], open: true },
      { id: 'exit', name: 'East exit', kind: 'door', segment: [[10, 4.5], [10, 5.5]], open: false },
      { id: 'hatch', name: 'Pass hatch', kind: 'pass_through', segment: [[4, 1], [4, 1.5]], open: false },
    ],
    sources: [
      { id: 'cyl', name: 'NH3 cylinder', kind: 'cylinder', gasId: 'NH3', position: [1, 1], releaseHeightM: 1, inventoryKg: 20, liquefied: true,
        pressurePa: 8e5, waterVolumeM3: 0.04, restriction: { kind: 'rfo', diameterM: 0.0003 }, dischargeCoefficient: 0.8 },
    ],
    detectors: [{ id: 'det-a', name: 'Detector A', gasId: 'NH3', position: [2, 2], mountingHeightM: 2.5, alarmLowPpm: 12.5, alarmHighPpm: 35 }],
    exhausts: [],
    workstations: [
      { id: 'ws-a', name: 'Bench A', position: [3, 3], breathingHeightM: 1.5 },
      { id: 'ws-b', name: 'Bench B', position: [8, 2], breathingHeightM: 1.5 },
    ],
    underlay: null,
  }
}

export function fixtureSummary(over: Partial<RunSummary> = {}): RunSummary {
  return {
    gas: { id: 'NH3', name: 'Ammonia', asphyxiant: false, flammable: false, pyrophoric: false, molarMassGMol: 17.03 },
    limits: [
      { key: 'rel_twa', label: 'NIOSH REL TWA 25 ppm', ppm: 25, source: 'NIOSH Pocket Guide' },
      { key: 'rel_stel', label: 'NIOSH REL STEL 35 ppm', ppm: 35, source: 'NIOSH Pocket Guide' },
      { key: 'idlh', label: 'IDLH 300 ppm', ppm: 300, source: 'NIOSH IDLH' },
      { key: 'alarm_12_5', label: 'Default alarm 1 set point (toxic)', ppm: 12.5, source: 'common practice' },
      { key: 'setpoint_40', label: 'Detector set point 40 ppm', ppm: 40, source: "The floor's detector set points" },
      { key: 'lel_100', label: 'LEL', ppm: 150000, source: 'Gas library' },
    ],
    sources: [{ id: 'cyl', name: 'NH3 cylinder', roomId: 'A', releasedM3: 1.2, inventoryM3: 28.7, description: 'RFO 0.3 mm' }],
    durationS: 600,
    outputIntervalS: 10,
    ventilationState: 'normal',
    diffusivityM2S: 0.01,
    diffusivityBasis: 'test',
    massBalance: { releasedM3: 1.2, inAirM3: 0.9, removedM3: 0.3, closureError: 0.001 },
    receptors: [
      { id: 'det-a', kind: 'detector', name: 'Detector A', roomId: 'A', roomName: 'Gas room A', peakPpm: 800, peakTimeS: 600, maxStelPpm: 500,
        firstExceedS: {}, alarmLowPpm: 12.5, alarmHighPpm: 35, alarmLowS: 40, alarmHighS: 70 },
      { id: 'ws-a', kind: 'workstation', name: 'Bench A', roomId: 'A', roomName: 'Gas room A', peakPpm: 700, peakTimeS: 600, maxStelPpm: 400,
        firstExceedS: { alarm_12_5: 20, setpoint_40: 30, rel_twa: 100, rel_stel: 110, idlh: 150, lel_100: null }, alarmLowPpm: null, alarmHighPpm: null, alarmLowS: null, alarmHighS: null },
      { id: 'ws-b', kind: 'workstation', name: 'Bench B', roomId: 'B', roomName: 'Lab B', peakPpm: 60, peakTimeS: 600, maxStelPpm: 40,
        firstExceedS: { rel_twa: 200, rel_stel: 260, idlh: null }, alarmLowPpm: null, alarmHighPpm: null, alarmLowS: null, alarmHighS: null },
    ],
    rooms: [
      { id: 'A', name: 'Gas room A', kind: 'gas_room', peakPpm: 900, firstExceedS: { alarm_12_5: 10, idlh: 120, rel_twa: 60 }, finalMeanPpm: 400 },
      { id: 'B', name: 'Lab B', kind: 'lab', peakPpm: 80, firstExceedS: { alarm_12_5: 150, idlh: null, rel_twa: 190 }, finalMeanPpm: 30 },
      { id: 'C', name: 'Corridor C', kind: 'corridor', peakPpm: 5, firstExceedS: { alarm_12_5: 300, idlh: null, rel_twa: null }, finalMeanPpm: 1 },
    ],
    firstAlarm: { detectorId: 'det-a', level: 'low', timeS: 40 },
    cells: 1000,
    wallS: 1,
    notes: [],
    ...over,
  }
}
