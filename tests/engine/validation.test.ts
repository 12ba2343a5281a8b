// Bad input is rejected before any work, with a message naming the field.
import { describe, expect, it } from 'vitest'
import { validateScenario } from '../../shared/engine/validate'
import { simulate } from '../../shared/engine/simulate'
import { rect } from './helpers'

const good = () => ({
  format: 'driftwarden-scenario/1', duration_s: 60, output_interval_s: 10, grid: { cell_m: 0.5, layers: 2 }, ceiling_m: 3,
  rooms: [{ id: 'lab', polygon_m: rect(0, 0, 4, 4) }, { id: 'hall', polygon_m: rect(4, 0, 8, 2) }],
  openings: [{ id: 'd', segment_m: [[4, 0.5], [4, 1.5]], open: true }],
  gas: { id: 'NH3' },
  sources: [{ id: 's', position_m: [1, 1, 1], release: { kind: 'constant', rate_m3_s: 1e-4, start_s: 0, end_s: 30 } }],
  probes: [{ id: 'p', position_m: [5, 1, 1.5] }],
}) as Record<string, any>

const message = (mutate: (s: Record<string, any>) => void) => {
  const s = good()
  mutate(s)
  try { validateScenario(s) } catch (e) { return (e as Error).message }
  return 'no error'
}

describe('scenario validation', () => {
  it('accepts the good scenario', () => expect(message(() => {})).toBe('no error'))
  it.each([
    ['overlapping rooms', (s: any) => { s.rooms[1].polygon_m = rect(3, 0, 8, 2) }, 'rooms[1].polygon_m: overlaps room "lab"'],
    ['self-intersecting room', (s: any) => { s.rooms[0].polygon_m = [[0, 0], [4, 4], [4, 0], [0, 3]] }, 'rooms[0].polygon_m: self-intersecting (edges 0 and 2 meet)'],
    ['source outside every room', (s: any) => { s.sources[0].position_m = [9, 9, 1] }, 'sources[0].position_m: (9, 9) is outside every room'],
    ['source above the ceiling', (s: any) => { s.sources[0].position_m = [1, 1, 3.5] }, 'sources[0].position_m: z = 3.5 m is above ceiling_m 3 m'],
    ['unknown gas', (s: any) => { s.gas = { id: 'XX9' } }, 'gas.id: unknown gas "XX9"'],
    ['negative rate', (s: any) => { s.sources[0].release.rate_m3_s = -1 }, 'sources[0].release.rate_m3_s: '],
    ['end before start', (s: any) => { s.sources[0].release.end_s = -0 + 0; s.sources[0].release.start_s = 10 }, 'sources[0].release.end_s: end_s 0 is before start_s 10'],
    ['door off the walls', (s: any) => { s.openings[0].segment_m = [[2, 2], [3, 2]] }, 'openings[0].segment_m: does not lie on any room wall'],
    ['absurd duration', (s: any) => { s.duration_s = 1e12 }, 'duration_s: '],
    ['grid too large', (s: any) => { s.grid = { cell_m: 0.01, layers: 200 } }, 'grid.cell_m: grid of'],
    ['duplicate room id', (s: any) => { s.rooms[1].id = 'lab' }, 'rooms[1].id: duplicate id "lab"'],
    ['wrong format', (s: any) => { s.format = 'other/1' }, 'format: '],
    ['unknown field', (s: any) => { s.rooms[0].colour = 'red' }, 'rooms[0]: '],
    ['probe outside', (s: any) => { s.probes[0].position_m = [-1, 1, 1] }, 'probes[0].position_m: (-1, 1) is outside every room'],
    ['output interval longer than the run', (s: any) => { s.output_interval_s = 120 }, 'output_interval_s: 120 s exceeds duration_s 60 s'],
    ['transfer into a room not beside the door', (s: any) => { s.rooms.push({ id: 'far', polygon_m: rect(10, 0, 12, 2) }); s.openings[0].transfer = { flow_m3_s: 0.1, into: 'far' } }, 'openings[0].transfer.into: room "far" is not on either side of the opening'],
    // Issue 12: inputs that used to run silently although they describe an impossible state.
    ['transfer air through a closed door without an undercut', (s: any) => { s.openings[0].open = false; s.openings[0].transfer = { flow_m3_s: 0.05, into: 'hall' } }, 'openings[0].transfer: the door is closed and has no undercut_m'],
    ['liquefied gas above its cylinder pressure', (s: any) => { s.sources[0].release = { kind: 'cylinder', water_volume_m3: 0.05, pressure_pa: 860000, orifice_diameter_m: 5e-4, liquefied: { vapour_pressure_pa: 860000, contents_kg: 20 } }; s.sources[0].release.liquefied.vapour_pressure_pa = 2e6 }, 'sources[0].release.liquefied.vapour_pressure_pa: 2000000 Pa exceeds the cylinder pressure_pa 860000 Pa'],
    ['liquefied gas at or below ambient pressure', (s: any) => { s.sources[0].release = { kind: 'cylinder', water_volume_m3: 0.05, pressure_pa: 860000, orifice_diameter_m: 5e-4, liquefied: { vapour_pressure_pa: 860000, contents_kg: 20 } }; s.sources[0].release.pressure_pa = 9e4; s.sources[0].release.liquefied.vapour_pressure_pa = 9e4 }, 'sources[0].release.liquefied.vapour_pressure_pa: 90000 Pa is not above ambient'],
  ])('%s', (_name, mutate, expected) => {
    expect(message(mutate as (s: Record<string, any>) => void).startsWith(expected as string)).toBe(true)
  })
  it('a closed door with an undercut may carry transfer air, and an open door without one', () => {
    expect(message((s) => { s.openings[0].open = false; s.openings[0].undercut_m = 0.01; s.openings[0].transfer = { flow_m3_s: 0.05, into: 'hall' } })).toBe('no error')
    expect(message((s) => { s.openings[0].transfer = { flow_m3_s: 0.05, into: 'hall' } })).toBe('no error')
  })
  it('a room too small for the grid', () => {
    const s = good()
    s.rooms.push({ id: 'closet', polygon_m: rect(8, 0, 8.2, 0.2) })
    expect(() => simulate(s)).toThrow('rooms[2].polygon_m: no cell centre lies inside room "closet"; use a smaller grid.cell_m')
  })
  it('inline gas properties are validated too', () => {
    expect(message((s) => { s.gas = { id: 'X', name: 'X', cas: null, molar_mass_g_mol: -3 } })).toMatch(/^gas\.molar_mass_g_mol: /)
  })
})
