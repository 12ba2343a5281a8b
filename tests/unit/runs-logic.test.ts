import { describe, expect, it } from 'vitest'
import { demoFloorPlan } from '../../server/seed/demo-floor'
import { ScenarioSchema } from '../../shared/engine/scenario-schema'
import { buildRunScenario } from '../../shared/runs/build-scenario'
import { colourScale, convertPpm, formatTime, frameAt, isolines, limitTableRows, scaleRange, unitsFor } from '../../shared/runs/display'
import { limitLines } from '../../shared/runs/limits'
import { sweepWorstCase } from '../../shared/runs/sweep'
import { findGas } from '../../shared/gases/library'
import { ScenarioConfig } from '../../shared/schemas/runs'

const cfg = (over: Partial<ScenarioConfig> = {}) => ScenarioConfig.parse({ name: 't', sourceIds: ['nh3-cabinet'], durationS: 600, ...over })

describe('plan + ceiling + scenario → engine input', () => {
  const plan = demoFloorPlan()
  const build = (over: Partial<ScenarioConfig> = {}) => {
    const r = buildRunScenario(plan, 3, cfg(over))
    if (!r.ok) throw new Error(JSON.stringify(r.fields))
    return ScenarioSchema.parse(r.scenario)
  }
  it('normal: only the chosen sources, the gas of them, set points tracked, other gases\' detectors dropped', () => {
    const s = build()
    expect(s.sources.map((x) => x.id)).toEqual(['nh3-cabinet'])
    expect(s.gas).toEqual({ id: 'NH3' })
    expect(s.thresholds_ppm).toEqual(expect.arrayContaining([12.5, 35]))
    expect(s.probes.map((p) => p.id)).not.toContain('detector:det-cl2-gr')
    expect(s.probes.map((p) => p.id)).toContain('workstation:ws-cvd')
    expect(s.local_exhausts.length).toBe(4)
    expect(s.rooms.find((r) => r.id === 'gas-room')!.ventilation.air_changes_per_hour).toBe(20)
  })
  it('exhaust failed: no local exhausts, no room extract, downflow recirculates without exhaust', () => {
    const s = build({ ventilationState: 'exhaust_failed' })
    expect(s.local_exhausts).toEqual([])
    expect(s.rooms.every((r) => r.ventilation.air_changes_per_hour === 0)).toBe(true)
    expect(s.rooms.find((r) => r.id === 'bay-3')!.ventilation.downflow!.exhaust_fraction).toBe(0)
  })
  it('door propped open: the chosen door opens; with none chosen every door does', () => {
    expect(build({ ventilationState: 'door_propped_open', proppedOpeningIds: ['door-gas-room'] }).openings.find((o) => o.id === 'door-gas-room')!.open).toBe(true)
    const all = build({ ventilationState: 'door_propped_open' })
    expect(all.openings.filter((o) => o.id.startsWith('door')).every((o) => o.open)).toBe(true)
    expect(all.openings.find((o) => o.id === 'pass-lab-bay')!.open).toBe(false)
  })
  it('downflow off: the cleanroom bay has no downflow and no dilution', () => {
    const bay = build({ ventilationState: 'downflow_off' }).rooms.find((r) => r.id === 'bay-3')!
    expect(bay.ventilation.downflow).toBeUndefined()
    expect(bay.ventilation.air_changes_per_hour).toBe(0)
  })
  it('constant release and a diffusivity override', () => {
    const s = build({ release: 'constant', constantRateM3S: 0.001, diffusivityM2S: 0.005 })
    expect(s.sources[0]!.release).toMatchObject({ kind: 'constant', rate_m3_s: 0.001 })
    expect(s.effective_diffusivity_m2_s).toBe(0.005)
  })
  it('refuses with field names: unknown source, mixed gases, unknown opening, constant without a rate', () => {
    const f = (over: Partial<ScenarioConfig>) => { const r = buildRunScenario(plan, 3, cfg(over)); return r.ok ? {} : r.fields }
    expect(f({ sourceIds: ['x'] })).toHaveProperty(['sourceIds.0'])
    expect(f({ sourceIds: ['nh3-cabinet', 'cl2-cabinet'] })).toHaveProperty(['sourceIds.1'])
    expect(f({ ventilationState: 'door_propped_open', proppedOpeningIds: ['nope'] })).toHaveProperty(['proppedOpeningIds.0'])
    expect(f({ release: 'constant' })).toHaveProperty('constantRateM3S')
  })
})

describe('limits, units and colour', () => {
  const nh3 = findGas('NH3')!
  const limits = limitLines([{ label: '12.5 ppm', ppm: 12.5 }, { label: 'REL-TWA', ppm: 25 }, { label: 'REL-STEL', ppm: 35 }, { label: 'IDLH', ppm: 300 }], nh3)
  it('names limits and the default set points', () => {
    expect(limits.map((l) => l.key)).toEqual(['alarm_12_5', 'rel_twa', 'rel_stel', 'idlh'])
    expect(limits[2]!.label).toMatch(/STEL.*default alarm 2/)
  })
  it('converts ppm to % LEL and oxygen %', () => {
    expect(convertPpm(15000, 'pct_lel', 15)).toBeCloseTo(10)
    expect(convertPpm(66986, 'o2_pct', null)).toBeCloseTo(19.5, 3)
    expect(unitsFor({ flammable: true, asphyxiant: false })).toEqual(['ppm', 'pct_lel'])
    expect(unitsFor({ flammable: false, asphyxiant: true })).toEqual(['ppm', 'o2_pct'])
  })
  it('viridis on a log scale: the ends are viridis\'s ends, below the minimum is transparent', () => {
    const s = colourScale(1, 1000)
    expect(s.rgb(1)).toEqual([68, 1, 84])
    expect(s.rgb(1000)).toEqual([253, 231, 37])
    expect(s.rgb(0.5)).toBeNull()
    expect(s.t(Math.sqrt(1000))).toBeCloseTo(0.5)
    expect(s.ticks()).toEqual([1, 10, 100, 1000])
    const c = colourScale(1, 1000, 'cividis')
    expect(c.rgb(1)![2]).toBeGreaterThan(c.rgb(1)![0])
  })
  it('scale range runs from a tenth of the lowest limit to the peak', () => {
    expect(scaleRange(limits, Float32Array.from([0, 400, NaN]))).toEqual({ min: 1.25, max: 400 })
  })
  it('formats times', () => {
    expect(formatTime(null)).toBe('not reached')
    expect(formatTime(42.4)).toBe('42 s')
    expect(formatTime(150)).toBe('2 min 30 s')
    expect(frameAt([0, 10, 20], 15)).toBe(1)
  })
})

describe('isolines', () => {
  it('a square blob of 100 ppm on a 0.5 m grid gives one ring at 50 ppm around it, in metres, labelled', () => {
    const nx = 10, ny = 10
    const plane = new Float32Array(nx * ny)
    for (let j = 4; j < 6; j++) for (let i = 4; i < 6; i++) plane[i + nx * j] = 100
    const lines = isolines({ nx, ny, cellM: 0.5, originM: [10, 20] }, plane, [{ key: 'a', label: 'Half', ppm: 50, source: '' }, { key: 'b', label: 'Never', ppm: 500, source: '' }])
    expect(lines).toHaveLength(1)
    expect(lines[0]!.label).toBe('Half')
    const xs = lines[0]!.rings[0]!.points.map((p) => p[0])
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(11.5)
    expect(Math.max(...xs)).toBeLessThanOrEqual(13.5)
    expect(lines[0]!.labelAt![1]).toBeGreaterThan(22)
  })
})

describe('table rows and sweep worst case', () => {
  const limits = [{ key: 'twa', label: 'TWA', ppm: 25, source: '' }]
  const rc = (id: string, kind: 'detector' | 'workstation', t: number | null, peak: number) => ({
    id, kind, name: id, roomId: null, roomName: 'Lab', peakPpm: peak, peakTimeS: 0, maxStelPpm: 0, firstExceedS: { twa: t },
    alarmLowPpm: null, alarmHighPpm: null, alarmLowS: null, alarmHighS: null,
  })
  it('detectors first, earliest first, formatted', () => {
    const rows = limitTableRows({ limits, receptors: [rc('w1', 'workstation', 30, 40), rc('d2', 'detector', null, 1), rc('d1', 'detector', 12, 80)] }, 'ppm', null)
    expect(rows.map((r) => r.id)).toEqual(['d1', 'd2', 'w1'])
    expect(rows[0]!.times.twa).toBe('12 s')
    expect(rows[1]!.times.twa).toBe('not reached')
    expect(rows[2]!.peak).toBe('40.0 ppm')
  })
  it('takes, per workstation, the earliest crossing over sources and the source that caused it', () => {
    const summary = (t: number | null, peak: number) => ({ limits, receptors: [rc('ws', 'workstation', t, peak)] }) as never
    const { worstCase } = sweepWorstCase([{ sourceId: 'a', summary: summary(100, 30) }, { sourceId: 'b', summary: summary(40, 20) }, { sourceId: 'c', summary: null }])
    expect(worstCase[0]!.firstExceed.twa).toEqual({ timeS: 40, sourceId: 'b' })
    expect(worstCase[0]!.peakSourceId).toBe('a')
  })
})
