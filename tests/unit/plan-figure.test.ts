import { interpolateViridis } from 'd3-scale-chromatic'
import { describe, expect, it } from 'vitest'
import { limitColours } from '../../shared/plans/figure'
import { colourScale } from '../../shared/runs/display'

// The PDF's limit areas use the results map's own scale (viridis over log ppm, d3-scale-chromatic), not a
// three-step warm sequence: a limit's area has the colour its concentration has on the map.
describe('plan figure colours', () => {
  const limits = [
    { key: 'niosh_rel_twa', label: 'NIOSH REL (TWA)', ppm: 25 },
    { key: 'osha_pel_twa', label: 'OSHA PEL (TWA)', ppm: 50 },
    { key: 'idlh', label: 'IDLH', ppm: 300 },
  ] as never
  it('take each limit’s colour from the map scale spanning a decade either side', () => {
    const scale = colourScale(2.5, 3000)
    expect(limitColours(limits)).toEqual([scale.colour(25), scale.colour(50), scale.colour(300)])
  })
  it('are viridis samples, increasing along the scale, none of them the old warm steps', () => {
    const c = limitColours(limits)
    expect(c[0]).toBe(interpolateViridis(Math.log10(10) / Math.log10(1200)))
    expect(new Set(c).size).toBe(3)
    for (const old of ['#f5d25c', '#f0913a', '#c0392b']) expect(c).not.toContain(old)
  })
})
