// Polygon primitives: hand-checkable shapes (areas by shoelace on paper).
import { describe, expect, it } from 'vitest'
import {
  findSelfIntersection, isSelfIntersecting, pointInPolygon, pointOnPolygonEdge, polygonArea,
  polygonsOverlap, segmentIntersection, segmentOnPolygonEdge,
} from '../../shared/geometry/polygon'

const square = [[0, 0], [4, 0], [4, 4], [0, 4]] as const
const right = [[4, 0], [8, 0], [8, 4], [4, 4]] as const

describe('polygon primitives', () => {
  it('area of a 4x4 square and an L shape', () => {
    expect(polygonArea(square)).toBe(16)
    expect(polygonArea([[0, 0], [4, 0], [4, 2], [2, 2], [2, 4], [0, 4]])).toBe(12)
  })
  it('point in polygon', () => {
    expect(pointInPolygon([1, 1], square)).toBe(true)
    expect(pointInPolygon([5, 1], square)).toBe(false)
    expect(pointInPolygon([3, 3], [[0, 0], [4, 0], [4, 2], [2, 2], [2, 4], [0, 4]])).toBe(false)
  })
  it('segment intersection point', () => {
    expect(segmentIntersection([0, 0], [2, 2], [0, 2], [2, 0])).toEqual([1, 1])
    expect(segmentIntersection([0, 0], [1, 0], [0, 1], [1, 1])).toBeNull()
  })
  it('self-intersection (bow tie) and simple polygons', () => {
    expect(isSelfIntersecting([[0, 0], [2, 2], [2, 0], [0, 2]])).toBe(true)
    expect(findSelfIntersection(square)).toBeNull()
    expect(isSelfIntersecting([[0, 0], [1, 0], [2, 0]])).toBe(true) // zero area
  })
  it('overlap: shared edge allowed, crossing, containment and identical polygons rejected', () => {
    expect(polygonsOverlap(square, right)).toBe(false)
    expect(polygonsOverlap(square, [[3, 1], [6, 1], [6, 3], [3, 3]])).toBe(true)
    expect(polygonsOverlap(square, [[1, 1], [2, 1], [2, 2], [1, 2]])).toBe(true)
    expect(polygonsOverlap(square, square)).toBe(true)
    expect(polygonsOverlap(square, [[4, 4], [6, 4], [6, 6], [4, 6]])).toBe(false) // corner only
    expect(polygonsOverlap(square, [[4, 1], [8, 1], [8, 2], [4, 2]])).toBe(false) // part of an edge
  })
  it('point and segment on edge with tolerance', () => {
    expect(pointOnPolygonEdge([4.0005, 2], square)).toBe(1)
    expect(pointOnPolygonEdge([3.9, 2], square)).toBe(-1)
    expect(segmentOnPolygonEdge([4, 1], [4, 2], square)).toBe(1)
    expect(segmentOnPolygonEdge([4, 1], [4, 5], square)).toBe(-1)
  })
})
