import { z } from 'zod'
import { IdParam, PathId } from '../schemas/common'
import {
  CancelDrill, ConfirmInfo, ConfirmToken, DrillChange, DrillDetail, DrillList, DrillOverview, DrillRecordInput, FindingUpdate,
  NewDrill, NewFinding, SiteFrequency,
} from '../schemas/drills'
import { OFFICERS, route } from './route'

const SiteIdParam = z.object({ siteId: PathId })
export const DrillPeople = z.object({ people: z.array(z.object({ id: z.number(), name: z.string(), email: z.string(), role: z.string() })) })

/** Drills. Fixed paths come before /api/drills/:id so that "confirm" or "overview" is never read as an id. */
export const drills = {
  receiptInfo: route({ method: 'get', path: '/api/drills/confirm', summary: 'What a receipt link confirms (does not use it up)', tag: 'drills', access: 'public', query: ConfirmToken, response: ConfirmInfo }),
  confirm: route({ method: 'post', path: '/api/drills/confirm', summary: 'Confirm receipt of a drill notice with the signed, single-use link (410 when used, replaced, tampered with or expired)', tag: 'drills', access: 'public', body: ConfirmToken, response: ConfirmInfo }),
  overview: route({ method: 'get', path: '/api/drills/overview', summary: 'Drill history per site and floor, overdue sites, open corrective actions', tag: 'drills', access: 'signed-in', response: DrillOverview }),
  setFrequency: route({ method: 'put', path: '/api/drills/site-frequency/:siteId', summary: "Set a site's drill frequency (days)", tag: 'drills', access: OFFICERS, params: SiteIdParam, body: SiteFrequency, response: DrillOverview }),
  people: route({ method: 'get', path: '/api/drills/people', summary: 'People who can be invited or put in charge', tag: 'drills', access: OFFICERS, response: DrillPeople }),
  list: route({ method: 'get', path: '/api/drills', summary: 'Drills the caller can see (staff: their own; lab managers: their floors)', tag: 'drills', access: 'signed-in', response: DrillList }),
  schedule: route({ method: 'post', path: '/api/drills', summary: 'Schedule a drill for a published plan version and e-mail the invitations with a calendar file', tag: 'drills', access: OFFICERS, body: NewDrill, response: DrillDetail, status: 201 }),
  get: route({ method: 'get', path: '/api/drills/:id', summary: 'A drill with its roster, record, comparison and findings', tag: 'drills', access: 'signed-in', params: IdParam, response: DrillDetail }),
  change: route({ method: 'patch', path: '/api/drills/:id', summary: 'Move or rename a scheduled drill (notice with the next SEQUENCE)', tag: 'drills', access: OFFICERS, params: IdParam, body: DrillChange, response: DrillDetail }),
  cancel: route({ method: 'post', path: '/api/drills/:id/cancel', summary: 'Cancel a drill (METHOD:CANCEL notice)', tag: 'drills', access: OFFICERS, params: IdParam, body: CancelDrill, response: DrillDetail }),
  record: route({ method: 'put', path: '/api/drills/:id/record', summary: 'Record the drill: steps, measured times, observations', tag: 'drills', access: OFFICERS, params: IdParam, body: DrillRecordInput, response: DrillDetail }),
  addFinding: route({ method: 'post', path: '/api/drills/:id/findings', summary: 'Add a finding with its corrective action, owner and due date', tag: 'drills', access: OFFICERS, params: IdParam, body: NewFinding, response: DrillDetail, status: 201 }),
  setFinding: route({ method: 'patch', path: '/api/drill-findings/:id', summary: 'Close (or reopen) a corrective action', tag: 'drills', access: OFFICERS, params: IdParam, body: FindingUpdate, response: DrillDetail }),
  pdf: route({ method: 'get', path: '/api/drills/:id/pdf', summary: 'The drill report as a PDF', tag: 'drills', access: 'signed-in', params: IdParam, responseContentType: 'application/pdf' }),
}
