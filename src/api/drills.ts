import { z } from 'zod'
import {
  ConfirmInfo, DRILL_API, DrillDetail, DrillList, DrillOverview, type DrillChange, type DrillRecordInput, type NewDrill,
} from '../../shared/schemas/drills'
import { http } from './http'

const People = z.object({ people: z.array(z.object({ id: z.number(), name: z.string(), email: z.string(), role: z.string() })) })

export const drillsApi = {
  list: async () => (await http.get(DRILL_API.drills, { schema: DrillList })).drills,
  overview: () => http.get(DRILL_API.overview, { schema: DrillOverview }),
  people: async () => (await http.get(DRILL_API.people, { schema: People })).people,
  get: (id: number) => http.get(DRILL_API.drill(id), { schema: DrillDetail }),
  schedule: (input: NewDrill) => http.post(DRILL_API.drills, input, { schema: DrillDetail }),
  change: (id: number, change: DrillChange) => http.patch(DRILL_API.drill(id), change, { schema: DrillDetail }),
  cancel: (id: number, reason: string) => http.post(DRILL_API.cancel(id), { reason }, { schema: DrillDetail }),
  record: (id: number, input: DrillRecordInput) => http.put(DRILL_API.record(id), input, { schema: DrillDetail }),
  addFinding: (id: number, f: { finding: string; action: string; ownerId: number; dueDate: string }) => http.post(DRILL_API.findings(id), f, { schema: DrillDetail }),
  setFinding: (findingId: number, status: 'open' | 'closed', note: string) => http.patch(DRILL_API.finding(findingId), { status, note }, { schema: DrillDetail }),
  setFrequency: (siteId: number, days: number) => http.put(DRILL_API.siteFrequency(siteId), { drillFrequencyDays: days }, { schema: DrillOverview }),
  receiptInfo: (token: string) => http.get(DRILL_API.confirm, { query: { token }, schema: ConfirmInfo, expectUnauthorized: true }),
  confirm: (token: string) => http.post(DRILL_API.confirm, { token }, { schema: ConfirmInfo, expectUnauthorized: true }),
  pdfUrl: (id: number) => DRILL_API.pdf(id),
}
