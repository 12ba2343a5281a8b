import { describe, expect, it } from 'vitest'
import { awayFromSources, binomial, chooseCoverage, chooseMinMax, gridCandidates, mountingHeightFor } from '../../shared/runs/advisor'
import { demoFloorPlan } from '../../server/seed/demo-floor'

const never = Infinity

describe('detector advisor on a case solved by hand', () => {
  // Three leak scenarios s0, s1, s2 and three candidate points (times to alarm, s):
  //   A = [50, 50, 50]   sees every leak, none of them early
  //   B = [10, 10, —]    next to the leaks of s0 and s1, never sees s2
  //   C = [—, —, 10]     next to the leak of s2 only
  // With N = 2 the pairs give worst cases: A+B → 50, A+C → 50, B+C → max(10, 10, 10) = 10. The optimum is {B, C}, 10 s.
  // Greedy on the worst case takes A first (alone: 50 against ∞ for B or C), then cannot do better than 50:
  // min-max greedy is only a heuristic, which is why small cases are solved by enumeration.
  const times = [[50, 50, 50], [10, 10, never], [never, never, 10]]

  it('enumerates small cases and finds the optimum {B, C} with a 10 s worst case', () => {
    const c = chooseMinMax(times, 3, 2, 30)
    expect(c.method).toBe('exhaustive')
    expect([...c.chosen].sort()).toEqual([1, 2])
    expect(c.worst).toBe(10)
    expect(c.covered).toBe(3)
    expect(c.perScenario.map((p) => p.time)).toEqual([10, 10, 10])
  })
  it('greedy on min-max gets stuck at 50 s here (no guarantee), as reasoned above', () => {
    const g = chooseMinMax(times, 3, 2, 30, { forceGreedy: true })
    expect(g.method).toBe('greedy')
    expect(g.chosen[0]).toBe(0)
    expect(g.worst).toBe(50)
  })
  it('greedy coverage within 30 s takes B (2 leaks) then C (the third): all 3 covered, the optimum here', () => {
    const cov = chooseCoverage(times, 3, 2, 30)
    expect(cov.chosen).toEqual([1, 2])
    expect(cov.covered).toBe(3)
  })
  it('one detector: A is the only point that sees every leak, so the best single choice is A (worst 50 s)', () => {
    const c = chooseMinMax(times, 3, 1, 30)
    expect(c.chosen).toEqual([0])
    expect(c.worst).toBe(50)
  })
  it('a scenario no candidate sees leaves the worst case at infinity, and ties break on coverage', () => {
    const c = chooseMinMax([[5, never], [20, never]], 2, 1, 10)
    expect(c.worst).toBe(Infinity)
    expect(c.chosen).toEqual([0])
  })
  it('binomial counts', () => {
    expect(binomial(5, 2)).toBe(10)
    expect(binomial(200, 3)).toBe(1313400)
  })
})

describe('candidates and mounting height', () => {
  it('a grid over the rooms only, at the given spacing', () => {
    const pts = gridCandidates(demoFloorPlan(), 2)
    expect(pts.length).toBeGreaterThan(20)
    expect(pts).toContainEqual([1, 1])
    expect(pts.every(([x, y]) => x > 0 && y > 0 && x < 24 && y < 11)).toBe(true)
  })
  it('follows gas density (common practice)', () => {
    expect(mountingHeightFor({ name: 'Chlorine', relative_density: 2.45 }, 3).heightM).toBe(0.45)
    expect(mountingHeightFor({ name: 'Ammonia', relative_density: 0.59 }, 3).heightM).toBe(2.7)
    expect(mountingHeightFor({ name: 'Nitrogen', relative_density: 0.97 }, 3).heightM).toBe(1.5)
  })
})

describe('candidates keep clear of leak sources', () => {
  it('drops points within 1 m of any source and counts them', () => {
    const r = awayFromSources([[0, 0], [0.9, 0], [1.01, 0], [5, 5], [5.5, 5]], [{ position: [0, 0] }, { position: [5, 5.2] }])
    expect(r.kept).toEqual([[1.01, 0]])
    expect(r.excluded).toBe(4)
    expect(awayFromSources([[3, 3]], []).kept).toEqual([[3, 3]])
  })
})
