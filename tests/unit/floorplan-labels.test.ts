import { describe, expect, it } from 'vitest'
import { candidateOffsets, overlapArea, placeLabels, type LabelRequest } from '../../shared/floorplan/label-placement'
import { defaultGas, gasDefaultNote, makeElement } from '../../shared/floorplan/plan-edit'
import { emptyPlan } from '../../shared/floorplan/plan-schema'

const req = (id: string, x: number, y: number, text: string, extra: Partial<LabelRequest> = {}): LabelRequest =>
  ({ id, x, y, text, w: text.length * 7, h: 16, ...extra })

describe('placeLabels', () => {
  it('puts a lone label to the right of its anchor', () => {
    const [p] = placeLabels([req('a', 100, 100, 'NH3')], { gap: 12 })
    expect(p).toMatchObject({ id: 'a', text: 'NH3', x: 112, y: 92, crowded: false })
  })

  it('moves the second of two labels on the same spot (a detector on a cylinder) so they do not overlap', () => {
    const placed = placeLabels([req('source', 100, 100, 'NH3'), req('det', 102, 101, 'NH3')], { gap: 12 })
    expect(placed).toHaveLength(2)
    expect(overlapArea(placed[0]!, placed[1]!)).toBe(0)
    expect(placed.every((p) => !p.crowded)).toBe(true)
  })

  it('keeps clear of obstacles and stays inside the bounds', () => {
    const glyph = { x: 105, y: 85, w: 30, h: 30 } // right of the anchor
    const [p] = placeLabels([req('a', 100, 100, 'Cylinder')], { gap: 12, obstacles: [glyph], bounds: { x: 0, y: 0, w: 400, h: 400 } })
    expect(overlapArea(p!, glyph)).toBe(0)
    expect(p!.x).toBeLessThan(100) // to the left
    const [edge] = placeLabels([req('b', 395, 100, 'Cylinder')], { gap: 12, bounds: { x: 0, y: 0, w: 400, h: 400 } })
    expect(edge!.x + edge!.w).toBeLessThanOrEqual(400)
  })

  it('falls back to the shorter text, drops optional labels, and overlaps least when nothing is free', () => {
    // Free only close to the anchor: room for "NH3", not for "NH3 cabinet".
    const around = [{ x: 140, y: 0, w: 200, h: 400 }, { x: 0, y: 0, w: 60, h: 400 }, { x: 0, y: 0, w: 400, h: 80 }, { x: 0, y: 120, w: 400, h: 200 }]
    expect(candidateOffsets(70, 16, 12)).toHaveLength(8)
    const [short] = placeLabels([req('s', 100, 100, 'NH3 cabinet', { w: 70, alt: { text: 'NH3', w: 21 } })], { gap: 12, obstacles: around })
    expect(short!.text).toBe('NH3')
    expect(short!.crowded).toBe(false)
    const all = [{ x: 0, y: 0, w: 300, h: 300 }]
    expect(placeLabels([req('o', 100, 100, 'Hood', { optional: true })], { obstacles: all })).toEqual([])
    const [forced] = placeLabels([req('f', 100, 100, 'Hood')], { obstacles: all })
    expect(forced!.crowded).toBe(true)
  })
})

describe('defaultGas', () => {
  it('follows the last source, else the last detector, else N2, and says so', () => {
    const plan = emptyPlan()
    expect(defaultGas(plan)).toEqual({ gasId: 'N2', basis: 'first' })
    const withDetector = { ...plan, detectors: [makeElement.detector(plan, [1, 1], 'Cl2')] }
    expect(defaultGas(withDetector)).toEqual({ gasId: 'Cl2', basis: 'last-detector' })
    const withSource = { ...withDetector, sources: [makeElement.source(withDetector, [2, 2], 'NH3')] }
    expect(defaultGas(withSource)).toEqual({ gasId: 'NH3', basis: 'last-source' })
    expect(gasDefaultNote('NH3', 'last-source', 'source')).toMatch(/^Gas: NH3 \(the same as the last source\)/)
    expect(gasDefaultNote('N2', 'first', 'detector')).toContain('default for a first detector')
  })
})
