import type { Role } from '../schemas/common'
import type { Area } from './access'

/** One suggested next step on the overview page; `area` links it to that part of the app when it exists. */
export interface NextStep {
  title: string
  detail: string
  area?: Area
}

export interface OverviewGuidance {
  intro: string
  steps: NextStep[]
}

/** What each role is here to do, in the order they would usually do it. */
export const OVERVIEW_GUIDANCE: Record<Role, OverviewGuidance> = {
  admin: {
    intro: 'You manage who works in this organization and keep an eye on the mail Driftwarden sends.',
    steps: [
      { title: 'Invite your team', detail: 'Add EHS officers, lab managers and staff, each with the role that fits their work.', area: 'users' },
      { title: 'Draw the floors', detail: 'Sketch rooms, doors and ventilation, then place gas cylinders and detectors.', area: 'floors' },
      { title: 'Check outgoing mail', detail: 'Make sure invitations and drill notices are delivered.', area: 'outbox' },
    ],
  },
  ehs_officer: {
    intro: 'You model the floors, screen gas-release scenarios and turn the results into response plans and drills.',
    steps: [
      { title: 'Draw or update a floor', detail: 'Rooms, doors, ventilation, gas sources and detectors.', area: 'floors' },
      { title: 'Screen a release scenario', detail: 'Pick a source and a leak, run the screening simulation and read the cautions.', area: 'scenarios' },
      { title: 'Write a response plan', detail: 'Turn a result into actions that the lab manager acknowledges.', area: 'plans' },
      { title: 'Schedule a drill', detail: 'Staff are e-mailed the time, place and what to do.', area: 'drills' },
    ],
  },
  lab_manager: {
    intro: 'You review the floors and plans for your labs and make sure your people take part in drills.',
    steps: [
      { title: 'Acknowledge response plans', detail: 'Read the plans for your labs and confirm them, or raise questions with your EHS officer.', area: 'plans' },
      { title: 'Review your floors', detail: 'Check that rooms, gas sources and detectors match what is really there.', area: 'floors' },
      { title: 'See upcoming drills', detail: 'Know when your labs take part.', area: 'drills' },
    ],
  },
  staff: {
    intro: 'You will find the drills you are asked to take part in here.',
    steps: [
      { title: 'See your drills', detail: 'Time, place, and what to do when the alarm sounds.', area: 'drills' },
      { title: 'Know your site plan', detail: 'Your site emergency action plan and your supervisor come first in a real emergency.' },
    ],
  },
}
