import { DETECTOR_LAG_S } from './rules'

/** The plan-generation rules in words, shown in the plan pages and the PDF. Keep in step with ./rules.ts. */
export interface RuleText {
  id: string
  title: string
  text: string
}

export const RULES: readonly RuleText[] = [
  { id: 'R1', title: 'Hazard', text: 'For each result: the gas and its properties (flammable, pyrophoric, asphyxiant, toxic, heavier or lighter than air), the sources with their room, inventory and the volume released, the ventilation condition and duration, and every limit with its value and where the value comes from.' },
  { id: 'R2a', title: 'Timeline: alarms', text: 'The first detector alarm of each result, and when each detector reaches its low (warning) and high (evacuation) set points; the first alarm is one row, not repeated as a set-point row. A limit crossed less than half a second after the release starts is shown as "within the first second" (the solver interpolates crossings inside its steps).' },
  { id: 'R2b', title: 'Timeline: workstations', text: 'For every workstation, the time at which each limit is first exceeded at its breathing height, or "not within the run".' },
  { id: 'R2c', title: 'Timeline: rooms', text: 'For every room, the time at which any point at breathing height first exceeds IDLH, 25 % of the LEL or brings oxygen below 19.5 %. These three are the critical levels.' },
  { id: 'R2d', title: 'Time left for egress', text: `For every workstation: the earliest critical level at the workstation or in its room, minus the time the alarm is heard (first detector alarm + ${DETECTOR_LAG_S} s assumed sensor and signalling delay; common practice puts sensor response at roughly 10–120 s). Zero when the critical level comes first; none when no detector alarms.` },
  { id: 'R3', title: 'Evacuation', text: 'A room where a critical level is reached in any result is left at the first (low) alarm. A room where only an exposure limit (TWA, STEL, ceiling) is exceeded is left at the high alarm. Other rooms stay alert. The strictest level over all results wins. The doors are the door openings drawn on the room outline; a door into another affected room is flagged.' },
  { id: 'R4a', title: 'Automatic shut-off', text: 'If a detector reaches its high alarm, its time is given and the shut-off of the sources is expected to close then; the interlock must be confirmed. If none does, the plan says the shut-off will not trip by itself.' },
  { id: 'R4b', title: 'Manual isolation', text: 'Each source gets an isolation line, to be done only where it can be reached without entering air above the exposure limit.' },
  { id: 'R4c', title: 'Exhaust', text: 'Every evacuated room keeps its exhaust running and starts an emergency purge where fitted; a result computed with failed exhaust says so.' },
  { id: 'R4d', title: 'Who calls whom', text: 'Whoever hears the alarm raises it; the incident lead calls the emergency services and informs the EHS officer and lab managers.' },
  { id: 'R4e/R4f', title: 'Flammable and pyrophoric gases', text: 'Flammable gases add an ignition-source line; pyrophoric gases add a line against fighting a fire at the source before isolation.' },
  { id: 'R5a', title: 'Protective equipment', text: 'Where a room reaches a critical level: no entry without positive-pressure self-contained breathing apparatus, in pairs with a standby (common practice). Other protection from the safety data sheet.' },
  { id: 'R5b', title: 'Re-entry criteria', text: 'Readings below the lowest exposure limit of the gas with a calibrated, bump-tested meter at several heights (low points for dense gases, high points for light ones); oxygen 19.5–23.5 % for asphyxiants; below 10 % LEL for flammables; source isolated; readings stable; all-clear from the incident lead.' },
  { id: 'R6', title: 'After the incident', text: 'Medical follow-up of anyone exposed, reporting, debrief and after-action review with owned corrective actions, detector checks, and a plan review that leads to a new version.' },
  { id: 'R7', title: 'Drill checklist', text: 'Steps with who and what. Evacuation of a room should take no longer than the smallest time left for egress of its workstations (for a room with no workstation reaching a critical level, the time from the alarm being heard to the critical level in the room itself, zero when it comes first); isolation should be done before the first exposure limit is exceeded at any workstation (both counted from the alarm being heard). Steps with no time from the results are measured in the drill.' },
]
