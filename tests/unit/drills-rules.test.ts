import { describe, expect, it } from 'vitest'
import { compareMeasured, compareSteps, nextDrillDue } from '../../shared/drills/compare'
import { formatLocal, localToUtc, utcToLocal } from '../../shared/drills/time'
import { NewDrill } from '../../shared/schemas/drills'

describe('drill times in IANA zones', () => {
  it('converts wall-clock times, across daylight saving', () => {
    expect(localToUtc('2026-12-14', '09:30', 'Europe/Berlin').toISOString()).toBe('2026-12-14T08:30:00.000Z')
    expect(localToUtc('2026-07-14', '09:30', 'Europe/Berlin').toISOString()).toBe('2026-07-14T07:30:00.000Z')
    expect(localToUtc('2026-07-14', '09:30', 'America/Los_Angeles').toISOString()).toBe('2026-07-14T16:30:00.000Z')
    expect(localToUtc('2026-12-14', '09:30', 'Asia/Kolkata').toISOString()).toBe('2026-12-14T04:00:00.000Z')
    expect(localToUtc('2026-12-14', '09:30', 'UTC').toISOString()).toBe('2026-12-14T09:30:00.000Z')
    // 02:30 does not exist on 29 March 2026 in Berlin: it moves to 03:30 local (01:30 UTC)
    expect(localToUtc('2026-03-29', '02:30', 'Europe/Berlin').toISOString()).toBe('2026-03-29T01:30:00.000Z')
    expect(utcToLocal(new Date('2026-07-14T16:30:00Z'), 'America/Los_Angeles')).toEqual({ date: '2026-07-14', time: '09:30' })
    expect(formatLocal('2026-12-14T08:30:00Z', 'Europe/Berlin')).toBe('Mon, 14 Dec 2026, 09:30 (Europe/Berlin)')
  })
  it('rejects bad zones, dates and times naming the field', () => {
    const r = NewDrill.safeParse({ planId: 1, planVersion: 1, title: 'x', date: '2026-02-30', time: '25:00', timeZone: 'Mars/Olympus', location: 'x', scenario: 'x', officerId: 1, participants: {} })
    expect(r.success).toBe(false)
    expect(r.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['date', 'time', 'timeZone'])
  })
})

describe('measured against predicted', () => {
  const predicted = { egressMarginS: 50, isolationByS: 30, firstAlarmS: 40 }
  it('compares each measure', () => {
    const c = compareMeasured(predicted, { alarmToEvacuatedS: 65, alarmToIsolationS: 25, alarmToHeadcountS: null })
    expect(c.map((x) => [x.measure, x.verdict, x.deltaS])).toEqual([
      ['alarm_to_evacuated', 'over', 15], ['alarm_to_isolation', 'within', -5], ['alarm_to_headcount', 'not_measured', null],
    ])
    expect(compareMeasured(predicted, { alarmToEvacuatedS: null, alarmToIsolationS: null, alarmToHeadcountS: 240 })[2]!.verdict).toBe('no_prediction')
  })
  it('compares steps against their target times', () => {
    const steps = [
      { id: 'a', who: 'x', what: 'Leave', targetS: 50, basis: '', measure: 'alarm_to_evacuated' as const, from: null },
      { id: 'b', who: 'y', what: 'Isolate', targetS: 30, basis: '', measure: 'alarm_to_isolation' as const, from: null },
      { id: 'c', who: 'z', what: 'Call', targetS: null, basis: '', measure: 'none' as const, from: null },
    ]
    const r = compareSteps(steps, [{ stepId: 'a', done: true, atS: 45, note: '' }, { stepId: 'b', done: false, atS: null, note: '' }, { stepId: 'c', done: true, atS: 20, note: '' }])
    expect(r.map((s) => s.verdict)).toEqual(['within', 'not_measured', 'no_prediction'])
  })
  it('a site is overdue when its last drill is older than its frequency', () => {
    const now = new Date('2026-12-01T00:00:00Z')
    expect(nextDrillDue(new Date('2026-08-01T00:00:00Z'), 90, now)).toEqual({ nextDueAt: new Date('2026-10-30T00:00:00Z'), overdue: true })
    expect(nextDrillDue(new Date('2026-11-01T00:00:00Z'), 90, now).overdue).toBe(false)
    expect(nextDrillDue(null, 90, now).overdue).toBe(true)
  })
})

describe('drill wording', async () => {
  const c = await import('../../shared/drills/compare')
  it('a zero prediction is detection coming too late, not a slow drill', () => {
    expect(c.verdictLabel('over', 0)).toBe(c.TOO_LATE_LABEL)
    expect(c.verdictLabel('over', 50)).toBe('Slower than predicted')
    expect(c.verdictLabel('within', 0)).toBe('Within the predicted time')
    expect(c.isTooLate({ verdict: 'over', measure: 'alarm_to_evacuated', predictedS: 0 })).toBe(true)
    expect(c.isTooLate({ verdict: 'over', measure: 'alarm_to_evacuated', targetS: 0 })).toBe(true)
    expect(c.isTooLate({ verdict: 'over', measure: 'alarm_to_evacuated', predictedS: 10 })).toBe(false)
    // The first step's 0 s is the start of the drill, not a prediction about detection
    expect(c.isTooLate({ verdict: 'over', measure: 'none', targetS: 0 })).toBe(false)
    expect(c.verdictText({ verdict: 'over', measure: 'none', targetS: 0 })).toBe('Slower than predicted')
    expect(c.verdictText({ verdict: 'over', measure: 'alarm_to_evacuated', predictedS: 0 })).toBe(c.TOO_LATE_LABEL)
    expect(c.stepVerdict(50, 65, true)).toBe('over')
    expect(c.stepVerdict(50, 40, true)).toBe('within')
    expect(c.stepVerdict(null, 40, true)).toBe('no_prediction')
    expect(c.stepVerdict(50, 40, false)).toBe('not_measured')
  })
  it('titles, notice versions and participant sources in words', () => {
    expect(c.titleWithoutDrillPrefix('Drill: Ammonia release')).toBe('Ammonia release')
    expect(c.titleWithoutDrillPrefix('NH3 leak drill <Bay A>')).toBe('NH3 leak drill <Bay A>')
    expect(c.defaultDrillTitle('Ammonia release – Level 1')).not.toMatch(/^Drill:/)
    expect(c.noticeVersion(0)).toBe('notice version 1')
    expect(c.PARTICIPANT_SOURCE_LABELS.person).toBe('by name')
    expect(c.PARTICIPANT_SOURCE_LABELS.floor_staff).toBe('as floor staff')
  })
})
