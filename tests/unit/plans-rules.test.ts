import { describe, expect, it } from 'vitest'
import { canonicalJson } from '../../shared/plans/canonical'
import { RULES } from '../../shared/plans/rule-list'
import { DETECTOR_LAG_S, generatePlan } from '../../shared/plans/rules'
import { PlanContent } from '../../shared/schemas/plans'
import { fixtureFloor, fixtureSummary } from './plans-fixtures'
import { doorLabel, formatEventTime, summaryForStatus } from '../../shared/plans/format'

const floor = { name: 'Level 1', siteName: 'Test site', plan: fixtureFloor() }
const run = { id: 7, label: 'NH3 cylinder, normal', summary: fixtureSummary() }

describe('plan rules on the hand-computed case', () => {
  const plan = generatePlan(floor, [run])

  it('produces a valid plan document', () => {
    expect(() => PlanContent.parse(plan)).not.toThrow()
    expect(DETECTOR_LAG_S).toBe(30)
  })

  it('R1: hazard names the gas, source, release and limits with their sources', () => {
    const h = plan.hazard.items[0]!
    expect(h.gasName).toBe('Ammonia')
    expect(h.sources[0]).toMatchObject({ name: 'NH3 cylinder', roomName: 'Gas room A', inventoryM3: 28.7 })
    expect(h.limits.map((l) => l.key)).toEqual(['rel_twa', 'rel_stel', 'idlh', 'lel_100'])
    expect(h.limits[2]!.source).toBe('NIOSH IDLH')
    expect(h.properties).toContain('lighter than or close to air')
    expect(h.from).toMatchObject({ runId: 7, rule: 'R1' })
  })

  it('R2: first alarm, time to each limit at every workstation, room critical levels, egress margin', () => {
    const row = (id: string) => plan.timeline.rows.find((r) => r.id === id)
    expect(row('tl-7-first')).toMatchObject({ timeS: 40, where: 'Detector A', event: 'First detector alarm: low (warning) set point' })
    // The first alarm is Detector A's low set point: one row, not two
    expect(row('tl-7-det-a-low')).toBeUndefined()
    expect(row('tl-7-det-a-high')!.timeS).toBe(70)
    expect(row('tl-7-ws-a-rel_twa')!.timeS).toBe(100)
    expect(row('tl-7-ws-a-idlh')!.timeS).toBe(150)
    expect(row('tl-7-ws-b-idlh')!.timeS).toBeNull()
    // Detector set points tracked by the run are not limits: no rows, no effect on evacuation or isolation
    expect(plan.timeline.rows.some((r) => /alarm_12_5|setpoint_40/.test(r.id))).toBe(false)
    expect(row('tl-7-A-idlh')!.timeS).toBe(120)
    expect(row('tl-7-B-idlh')!.timeS).toBeNull()
    // Bench A: critical at 120 s (room A IDLH, earlier than the bench's own 150 s), alarm heard at 40 + 30 = 70 s.
    expect(row('tl-7-ws-a-egress')).toMatchObject({ timeS: 50, limitKey: 'idlh' })
    expect(row('tl-7-ws-a-egress')!.from).toMatchObject({ runId: 7, subjectKind: 'receptor', subjectId: 'ws-a', rule: 'R2d' })
    expect(row('tl-7-ws-b-egress')!.timeS).toBeNull()
    // Timed events in order
    const timed = plan.timeline.rows.filter((r) => r.kind !== 'egress' && r.timeS !== null).map((r) => r.timeS!)
    expect(timed).toEqual([...timed].sort((a, b) => a - b))
  })

  it('R3: rooms, alarm levels and doors from the floor plan', () => {
    const byId = Object.fromEntries(plan.evacuation.rooms.map((r) => [r.roomId, r]))
    expect(plan.evacuation.rooms.map((r) => r.roomId)).toEqual(['A', 'B', 'C'])
    expect(byId.A!.alarmLevel).toBe('low')
    expect(byId.B!.alarmLevel).toBe('high')
    expect(byId.C!.alarmLevel).toBe('none')
    expect(byId.A!.doors.map((d) => d.name)).toEqual(['Door A'])
    expect(byId.A!.doors[0]!.note).toBe('Leads into Corridor C')
    expect(byId.B!.doors.map((d) => d.name)).toEqual(['Door B'])
    // Door A leads into the gas room, which reaches IDLH: never listed as a way out, named as a door not to use.
    expect(byId.C!.doors.map((d) => d.name)).toEqual(['Door B', 'East exit'])
    expect(byId.C!.avoid).toMatch(/^Do not use: Door A \(leads into Gas room A, IDLH at 2 min/)
    expect(byId.C!.doors[1]!.note).toBe('Leads outside the drawn rooms')
    expect(byId.A!.from).toMatchObject({ runId: 7, subjectKind: 'room', subjectId: 'A' })
  })

  it('R4: shut-off on the high alarm at 70 s, isolation per source, exhaust for evacuated rooms', () => {
    const shut = plan.actions.items.find((a) => a.id === 'act-7-shutoff')!
    expect(shut.text).toContain('Detector A')
    expect(shut.text).toContain('1 min 10 s')
    expect(plan.actions.items.some((a) => a.id === 'act-7-isolate-cyl')).toBe(true)
    expect(plan.actions.items.filter((a) => a.id.startsWith('act-exhaust-')).map((a) => a.id)).toEqual(['act-exhaust-A', 'act-exhaust-B'])
    expect(plan.actions.items.some((a) => /flammable/.test(a.text))).toBe(false)
  })

  it('R5: SCBA above IDLH, re-entry below the lowest exposure limit with a calibrated meter', () => {
    expect(plan.protection.ppe.find((p) => p.id === 'ppe-7-scba')!.text).toMatch(/self-contained breathing apparatus/)
    const below = plan.protection.reentry.find((p) => p.id === 're-7-below')!
    expect(below.text).toContain('25 ppm')
    expect(below.text).toMatch(/calibrated/)
    expect(below.text).toMatch(/high points/)
    expect(plan.protection.reentry.some((p) => p.id === 're-7-o2')).toBe(false)
  })

  it('R7: checklist times from the results', () => {
    const step = (id: string) => plan.checklist.find((s) => s.id === id)!
    expect(step('ck-evac-A')).toMatchObject({ targetS: 50, measure: 'alarm_to_evacuated' })
    expect(step('ck-evac-A').what).toContain('Door A')
    expect(step('ck-evac-B').targetS).toBeNull()
    expect(step('ck-isolate').targetS).toBe(30)
    expect(plan.predicted).toEqual({ egressMarginS: 50, isolationByS: 30, firstAlarmS: 40 })
    expect(plan.checklist.some((s) => s.id.startsWith('ck-evac-C'))).toBe(false)
  })

  it('a flammable asphyxiant with no detector alarm changes the lines', () => {
    const s = fixtureSummary({
      gas: { id: 'H2', name: 'Hydrogen', asphyxiant: true, flammable: true, pyrophoric: false, molarMassGMol: 2 },
      limits: [{ key: 'lel_10', label: '10 % LEL', ppm: 4000, source: 'common practice' }, { key: 'lel_25', label: '25 % LEL', ppm: 10000, source: 'code' },
        { key: 'o2_19_5', label: 'O2 19.5 %', ppm: 66986, source: '29 CFR 1910.134' }],
      firstAlarm: null,
    })
    s.receptors = s.receptors.map((r) => ({ ...r, alarmLowS: null, alarmHighS: null, firstExceedS: (r.kind === 'workstation' ? { lel_25: 90 } : {}) as Record<string, number | null> }))
    s.rooms = s.rooms.map((r) => ({ ...r, firstExceedS: {} }))
    const p = generatePlan(floor, [{ id: 9, label: 'H2', summary: s }])
    expect(p.timeline.rows.find((r) => r.id === 'tl-9-ws-a-egress')!.event).toMatch(/no detector alarm/)
    expect(p.actions.items.find((a) => a.id === 'act-9-shutoff')!.text).toMatch(/would not trip/)
    expect(p.actions.items.some((a) => a.id === 'act-9-ignition')).toBe(true)
    expect(p.protection.reentry.some((r) => r.id === 're-9-o2')).toBe(true)
    expect(p.protection.reentry.find((r) => r.id === 're-9-lel')!.text).toContain('4,000 ppm')
    expect(p.evacuation.rooms.find((r) => r.roomId === 'A')!.alarmLevel).toBe('low')
  })

  it('two results: the strictest level wins and every line keeps its own run', () => {
    const quiet = fixtureSummary()
    quiet.rooms = quiet.rooms.map((r) => ({ ...r, firstExceedS: {} }))
    quiet.receptors = quiet.receptors.map((r) => ({ ...r, firstExceedS: {} }))
    const p = generatePlan(floor, [{ id: 3, label: 'quiet', summary: quiet }, run])
    expect(p.evacuation.rooms.find((r) => r.roomId === 'A')).toMatchObject({ alarmLevel: 'low', from: { runId: 7 } })
    expect(p.hazard.items.map((h) => h.from!.runId)).toEqual([3, 7])
  })

  it('drafts carry no review reminder in the stored summary; unnamed doors say where they lead', () => {
    expect(plan.summary).not.toMatch(/Review every section/)
    const f = fixtureFloor()
    f.openings = f.openings.map((o) => (o.id === 'door-a' || o.id === 'door-b' ? { ...o, name: '' } : o))
    const p = generatePlan({ ...floor, plan: f }, [run])
    expect(p.evacuation.rooms.find((r) => r.roomId === 'A')!.doors[0]!.name).toBe('Door to Corridor C')
    expect(p.evacuation.rooms.find((r) => r.roomId === 'C')!.doors[0]!.name).toBe('Door to Lab B')
  })

  it('a room crossing IDLH within the first step says so, and drives its evacuation target without a workstation', () => {
    const s = fixtureSummary()
    s.rooms = s.rooms.map((r) => (r.id === 'A' ? { ...r, firstExceedS: { ...r.firstExceedS, idlh: 0.04 } } : r))
    // No workstation in room A reaches a critical level
    s.receptors = s.receptors.map((r) => (r.id === 'ws-a' ? { ...r, roomId: 'B', roomName: 'Lab B', firstExceedS: { rel_twa: 100 } } : r))
    const p = generatePlan(floor, [{ id: 5, label: 'strong', summary: s }])
    const a = p.evacuation.rooms.find((r) => r.roomId === 'A')!
    expect(a.reason).toMatch(/^IDLH reached within the first second \(< 1 s\)/)
    expect(a.reason).not.toMatch(/ 0 s/)
    const step = p.checklist.find((x) => x.id === 'ck-evac-A')!
    expect(step.targetS).toBe(0)
    expect(step.basis).toMatch(/IDLH is reached in the room within the first second .*before the alarm is heard/)
    expect(step.from).toMatchObject({ subjectKind: 'room', subjectId: 'A' })
    expect(p.predicted.egressMarginS).toBe(0)
    // A room critical time after the alarm is heard gives the margin from the room
    s.rooms = s.rooms.map((r) => (r.id === 'A' ? { ...r, firstExceedS: { ...r.firstExceedS, idlh: 100 } } : r))
    const q = generatePlan(floor, [{ id: 5, label: 'strong', summary: s }])
    expect(q.checklist.find((x) => x.id === 'ck-evac-A')).toMatchObject({ targetS: 30 })
    expect(q.checklist.find((x) => x.id === 'ck-evac-A')!.basis).toMatch(/at 1 min 40 s, 30 s after the alarm is heard/)
  })

  it('is deterministic, and every rule id used is documented', () => {
    expect(canonicalJson(generatePlan(floor, [run]))).toBe(canonicalJson(plan))
    const used = new Set(JSON.stringify(plan).match(/"rule":"(R\d\w?)"/g)!.map((m) => m.slice(8, -1)))
    const documented = RULES.flatMap((r) => r.id.split('/'))
    for (const id of used) expect(documented.some((d) => d === id || (d === 'R7' && id.startsWith('R7')))).toBe(true)
  })

  it('display helpers: event times, door labels, published summaries', () => {
    expect(formatEventTime(0)).toBe('within the first second (< 1 s)')
    expect(formatEventTime(12)).toBe('12 s')
    expect(formatEventTime(null)).toBe('not within the run')
    expect(doorLabel('  ', 'Process lab')).toBe('Door to Process lab')
    expect(doorLabel('', null)).toBe('Door to outside')
    expect(doorLabel('East exit', 'Process lab')).toBe('East exit')
    expect(summaryForStatus('Generated from 1 result. Review every section before publishing.', 'published')).toBe('Generated from 1 result.')
    expect(summaryForStatus('Generated. Review every section before publishing.', 'draft')).toContain('Review every section')
  })

  it('canonical JSON sorts keys at every level', () => {
    expect(canonicalJson({ b: 1, a: { d: [1, { z: 1, y: 2 }], c: null } })).toBe('{"a":{"c":null,"d":[1,{"y":2,"z":1}]},"b":1}')
  })
})
