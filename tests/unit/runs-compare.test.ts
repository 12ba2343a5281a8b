import { describe, expect, it } from 'vitest'
import { compareRuns, rowTracks } from '../../shared/runs/compare'
import { fixtureSummary } from './plans-fixtures'

// The hand-made result of tests/unit/plans-fixtures.ts (Bench A: TWA at 100 s, IDLH at 150 s; Bench B: TWA at
// 200 s, no IDLH; room A reaches IDLH at 120 s), and the same leak with the exhaust failed, worked out by hand:
// everything happens sooner (Bench A TWA 60 s, IDLH 90 s; Bench B IDLH 400 s; room A IDLH 80 s, room B IDLH 500 s).
const normal = { id: 1, label: 'Normal ventilation', summary: fixtureSummary() }
const failed = {
  id: 2, label: 'Exhaust failed',
  summary: fixtureSummary({
    ventilationState: 'exhaust_failed',
    firstAlarm: { detectorId: 'det-a', level: 'low', timeS: 25 },
    receptors: fixtureSummary().receptors.map((r) =>
      r.id === 'ws-a' ? { ...r, firstExceedS: { ...r.firstExceedS, rel_twa: 60, idlh: 90 } }
        : r.id === 'ws-b' ? { ...r, firstExceedS: { ...r.firstExceedS, idlh: 400 } } : r),
    rooms: fixtureSummary().rooms.map((r) => (r.id === 'A' ? { ...r, firstExceedS: { ...r.firstExceedS, idlh: 80 } } : r.id === 'B' ? { ...r, firstExceedS: { ...r.firstExceedS, idlh: 500 } } : r)),
  }),
}

describe('comparing results of one floor', () => {
  const c = compareRuns([normal, failed])
  const row = (key: string) => c.rows.find((r) => r.key === key)!

  it('lines the runs up per workstation, detector and room, for the limits both tracked', () => {
    expect(c.runs.map((r) => [r.label, r.ventilationState, r.firstAlarmS])).toEqual([['Normal ventilation', 'normal', 40], ['Exhaust failed', 'exhaust_failed', 25]])
    expect(c.limits.map((l) => l.key)).toEqual(fixtureSummary().limits.map((l) => l.key))
    expect(c.rows.map((r) => r.key)).toEqual(['receptor:ws-a', 'receptor:ws-b', 'receptor:det-a', 'room:C', 'room:A', 'room:B'])
    expect(c.mixedGases).toBe(false)
  })

  it('marks the earliest time of each row as the worst case', () => {
    expect(row('receptor:ws-a').times.idlh).toEqual([{ kind: 'time', timeS: 150, earliest: false }, { kind: 'time', timeS: 90, earliest: true }])
    expect(row('receptor:ws-b').times.idlh).toEqual([{ kind: 'not_reached' }, { kind: 'time', timeS: 400, earliest: false }])
    expect(row('room:A').times.idlh).toEqual([{ kind: 'time', timeS: 120, earliest: false }, { kind: 'time', timeS: 80, earliest: true }])
    // Equal times are both the worst case
    expect(row('receptor:ws-a').times.rel_stel).toEqual([{ kind: 'time', timeS: 110, earliest: true }, { kind: 'time', timeS: 110, earliest: true }])
  })

  it('tells a receptor missing from a run apart from a limit not reached, and rooms only carry what runs record for them', () => {
    const added = { id: 3, label: 'With a new detector', summary: fixtureSummary({ receptors: [...fixtureSummary().receptors, { ...fixtureSummary().receptors[0]!, id: 'det-new', name: 'Detector new' }] }) }
    const c3 = compareRuns([normal, added])
    expect(c3.rows.find((r) => r.key === 'receptor:det-new')!.times.idlh![0]).toEqual({ kind: 'absent' })
    expect(rowTracks(row('room:A'), 'idlh')).toBe(true)
    expect(rowTracks(row('room:A'), 'rel_stel')).toBe(false)
  })

  it('compares only the limits with the same key and value when the gases differ', () => {
    const chlorine = { id: 4, label: 'Chlorine', summary: fixtureSummary({ gas: { ...fixtureSummary().gas, id: 'Cl2', name: 'Chlorine' }, limits: [{ key: 'idlh', label: 'IDLH 10 ppm', ppm: 10, source: 'NIOSH IDLH' }, fixtureSummary().limits[5]!] }) }
    const c4 = compareRuns([normal, chlorine])
    expect(c4.mixedGases).toBe(true)
    expect(c4.limits.map((l) => l.key)).toEqual(['lel_100'])
  })
})

describe('the limit a comparison opens on', () => {
  it('is IDLH where tracked, else the first limit', async () => {
    const { defaultLimitKey } = await import('../../shared/runs/compare')
    expect(defaultLimitKey(fixtureSummary().limits)).toBe('idlh')
    expect(defaultLimitKey(fixtureSummary().limits.filter((l) => l.key !== 'idlh'))).toBe('rel_twa')
    expect(defaultLimitKey([])).toBeNull()
  })
})
