import { describe, expect, it } from 'vitest'
import { newerResults, refreshFromResults } from '../../shared/plans/refresh'
import { generatePlan } from '../../shared/plans/rules'
import { PlanContent } from '../../shared/schemas/plans'
import { fixtureFloor, fixtureSummary } from './plans-fixtures'

const floor = { name: 'Level 1', siteName: 'Test site', plan: fixtureFloor() }
const oldRun = { id: 7, label: 'NH3 cylinder, normal', summary: fixtureSummary() }
// The newer result: the detector alarms later (low 55 s, high 90 s), the room reaches IDLH later (180 s).
const newRun = {
  id: 9, label: 'NH3 cylinder, after the exhaust upgrade',
  summary: fixtureSummary({
    firstAlarm: { detectorId: 'det-a', level: 'low', timeS: 55 },
    receptors: fixtureSummary().receptors.map((r) => (r.id === 'det-a' ? { ...r, alarmLowS: 55, alarmHighS: 90 } : r)),
    rooms: fixtureSummary().rooms.map((r) => (r.id === 'A' ? { ...r, firstExceedS: { ...r.firstExceedS, idlh: 180 } } : r)),
  }),
}

/** The officer's edits to a generated plan: a typed action, a person on a rule line, notes, roles, a door note. */
function edited(): PlanContent {
  const p = generatePlan(floor, [oldRun])
  p.title = 'Ammonia in gas room A – site plan'
  p.summary = `${p.summary}\nReviewed with the facilities manager.`
  p.actions.items[0] = { ...p.actions.items[0]!, who: 'Reception desk (ext. 2222)' }
  p.actions.items.push({ id: 'officer-1', text: 'Send the lift to the ground floor and keep it there.', who: 'Floor warden', from: null })
  p.timeline.notes = 'Times checked against the 2026 drill.'
  p.evacuation.assemblyPoint = 'Car park P2, north corner'
  p.evacuation.rooms[0]!.doors[0]!.note = 'Push bar sticks: push hard'
  p.roles[0] = { ...p.roles[0]!, person: 'R. Imani', phone: '+1 555 0100' }
  p.checklist.push({ id: 'officer-ck', who: 'Security', what: 'Hold the lifts', targetS: null, basis: '', measure: 'none', from: null })
  return PlanContent.parse(p)
}

describe('refreshing a plan from newer results', () => {
  const current = edited()
  const fresh = generatePlan(floor, [newRun])
  const { content, rebuilt, kept } = refreshFromResults(current, fresh)

  it('rebuilds every rule-derived entry from the new result', () => {
    expect(() => PlanContent.parse(content)).not.toThrow()
    const ruleRows = content.timeline.rows.filter((r) => r.from !== null)
    expect(ruleRows.length).toBeGreaterThan(0)
    expect(ruleRows.every((r) => r.from!.runId === 9)).toBe(true)
    expect(content.timeline.rows.find((r) => r.kind === 'first_alarm')!.timeS).toBe(55)
    expect(content.hazard.items.map((h) => h.from?.runId)).toEqual([9])
    // The hand-computed egress margin moves with the result: the alarm is now heard at 55 + 30 = 85 s, and the
    // earliest critical level for Bench A is its own IDLH at 150 s (room A now reaches IDLH only at 180 s): 65 s.
    expect(content.predicted.egressMarginS).toBe(65)
    expect(content.predicted.firstAlarmS).toBe(55)
    expect(rebuilt).toBe(fresh.hazard.items.length + fresh.timeline.rows.length + fresh.evacuation.rooms.length + fresh.actions.items.length +
      fresh.protection.ppe.length + fresh.protection.reentry.length + fresh.afterIncident.items.length + fresh.checklist.length)
  })

  it("keeps the officer's own lines, people, notes, roles, contacts and title", () => {
    expect(kept).toBe(2)
    expect(content.title).toBe('Ammonia in gas room A – site plan')
    expect(content.actions.items.at(-1)).toMatchObject({ id: 'officer-1', from: null })
    expect(content.checklist.at(-1)).toMatchObject({ id: 'officer-ck', who: 'Security' })
    expect(content.actions.items[0]!.who).toBe('Reception desk (ext. 2222)')
    expect(content.timeline.notes).toBe('Times checked against the 2026 drill.')
    expect(content.evacuation.assemblyPoint).toBe('Car park P2, north corner')
    expect(content.evacuation.rooms[0]!.doors[0]!.note).toBe('Push bar sticks: push hard')
    expect(content.roles[0]).toMatchObject({ person: 'R. Imani', phone: '+1 555 0100' })
  })

  it('replaces only the generated first line of the summary', () => {
    expect(content.summary.split('\n')).toEqual([fresh.summary, 'Reviewed with the facilities manager.'])
    expect(content.summary).toContain('#9 NH3 cylinder, after the exhaust upgrade')
    expect(content.summary).not.toContain('#7')
  })

  it('changes nothing but the generated content when refreshed from the same result', () => {
    const same = refreshFromResults(current, generatePlan(floor, [oldRun]))
    expect(same.content).toEqual(current)
  })
})

describe('which results are offered for a refresh', () => {
  const run = (id: number, finishedAt: string | null) => ({ id, label: `run ${id}`, finishedAt, gasName: 'Ammonia' })
  const runs = [run(3, '2026-11-01T10:00:00Z'), run(5, '2026-11-20T10:00:00Z'), run(8, '2026-11-25T09:00:00Z'), run(9, '2026-10-01T00:00:00Z')]

  it('offers the results that finished after all of the plan\'s, newest first', () => {
    expect(newerResults(runs, [3]).map((r) => r.id)).toEqual([8, 5])
    expect(newerResults(runs, [3, 5]).map((r) => r.id)).toEqual([8])
    expect(newerResults(runs, [8])).toEqual([])
  })

  it('offers nothing when the plan\'s results are no longer listed', () => {
    expect(newerResults(runs, [42])).toEqual([])
  })
})
