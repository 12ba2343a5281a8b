import { contract } from '../../shared/contract'
import type { DrillChange, DrillRecordInput, NewDrill } from '../../shared/schemas/drills'
import { call, urlOf } from './http'

const c = contract.drills

export const drillsApi = {
  list: async () => (await call(c.list)).drills,
  overview: () => call(c.overview),
  people: async () => (await call(c.people)).people,
  get: (id: number) => call(c.get, { params: { id } }),
  schedule: (input: NewDrill) => call(c.schedule, { body: input }),
  change: (id: number, change: DrillChange) => call(c.change, { params: { id }, body: change }),
  cancel: (id: number, reason: string) => call(c.cancel, { params: { id }, body: { reason } }),
  record: (id: number, input: DrillRecordInput) => call(c.record, { params: { id }, body: input }),
  addFinding: (id: number, f: { finding: string; action: string; ownerId: number; dueDate: string }) => call(c.addFinding, { params: { id }, body: f }),
  setFinding: (findingId: number, status: 'open' | 'closed', note: string) => call(c.setFinding, { params: { id: findingId }, body: { status, note } }),
  setFrequency: (siteId: number, days: number) => call(c.setFrequency, { params: { siteId }, body: { drillFrequencyDays: days } }),
  receiptInfo: (token: string) => call(c.receiptInfo, { query: { token } }),
  confirm: (token: string) => call(c.confirm, { body: { token } }),
  pdfUrl: (id: number) => urlOf(c.pdf, { id }),
}
