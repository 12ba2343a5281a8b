import type { Gas } from '../gases/gas-schema'
import { pointInPolygon } from '../geometry/polygon'
import type { Plan } from '../floorplan/plan-schema'

/**
 * Detector advisor. times[c][s] is the first time (s) candidate point c reaches the alarm set point in leak
 * scenario s (Infinity = never within the run). A set S of detectors alarms for scenario s at min over c ∈ S.
 *
 * - Min-max objective: choose N points minimising the worst case over scenarios of the time to first alarm
 *   (ties: more scenarios covered within the deadline, then more ever detected, then the smaller sum of times).
 *   Solved exactly by enumeration when C(candidates, N) ≤ EXHAUSTIVE_LIMIT, otherwise by greedy addition,
 *   which is a heuristic with no approximation guarantee for this objective.
 * - Coverage objective: choose N points maximising the number of scenarios that alarm within the deadline.
 *   Coverage is monotone submodular, so greedy reaches at least (1 − 1/e) ≈ 63 % of the optimum
 *   (Nemhauser, Wolsey & Fisher 1978).
 */

export const EXHAUSTIVE_LIMIT = 20_000

export interface Choice {
  method: 'exhaustive' | 'greedy'
  chosen: number[]
  worst: number
  /** Per scenario: time to first alarm and the index (into chosen) of the detector that gives it. */
  perScenario: { time: number; by: number | null }[]
  covered: number
}

type Score = [number, number, number, number]

function evaluate(times: readonly ArrayLike<number>[], set: readonly number[], nScen: number, deadline: number): { score: Score; per: { time: number; by: number | null }[] } {
  let worst = 0, covered = 0, detected = 0, sum = 0
  const per: { time: number; by: number | null }[] = []
  for (let s = 0; s < nScen; s++) {
    let best = Infinity, by: number | null = null
    set.forEach((c, k) => { const t = times[c]![s]!; if (t < best) { best = t; by = k } })
    per.push({ time: best, by })
    if (best > worst) worst = best
    if (best <= deadline) covered++
    if (Number.isFinite(best)) { detected++; sum += best }
  }
  return { score: [worst, -covered, -detected, sum], per }
}

const better = (a: Score, b: Score) => {
  for (let i = 0; i < 4; i++) { if (a[i]! < b[i]!) return true; if (a[i]! > b[i]!) return false }
  return false
}

export function binomial(n: number, k: number): number {
  if (k < 0 || k > n) return 0
  let r = 1
  for (let i = 1; i <= k; i++) { r = (r * (n - k + i)) / i; if (r > 1e12) return Infinity }
  return Math.round(r)
}

/** Min-max choice of `count` detectors among the candidates (see the module comment for what it guarantees). */
export function chooseMinMax(times: readonly ArrayLike<number>[], nScen: number, count: number, deadline: number, opts: { forceGreedy?: boolean } = {}): Choice {
  const n = times.length
  const k = Math.min(count, n)
  let bestSet: number[] = []
  let best: ReturnType<typeof evaluate> | null = null
  const exhaustive = !opts.forceGreedy && binomial(n, k) <= EXHAUSTIVE_LIMIT
  if (exhaustive) {
    const idx = Array.from({ length: k }, (_, i) => i)
    for (;;) {
      const e = evaluate(times, idx, nScen, deadline)
      if (!best || better(e.score, best.score)) { best = e; bestSet = [...idx] }
      let i = k - 1
      while (i >= 0 && idx[i] === n - k + i) i--
      if (i < 0) break
      idx[i]!++
      for (let j = i + 1; j < k; j++) idx[j] = idx[j - 1]! + 1
    }
  } else {
    for (let round = 0; round < k; round++) {
      let pick = -1, pickEval: ReturnType<typeof evaluate> | null = null
      for (let c = 0; c < n; c++) {
        if (bestSet.includes(c)) continue
        const e = evaluate(times, [...bestSet, c], nScen, deadline)
        if (!pickEval || better(e.score, pickEval.score)) { pick = c; pickEval = e }
      }
      if (pick < 0) break
      bestSet.push(pick)
      best = pickEval
    }
  }
  const final = best ?? evaluate(times, [], nScen, deadline)
  return { method: exhaustive ? 'exhaustive' : 'greedy', chosen: bestSet, worst: final.score[0], perScenario: final.per, covered: -final.score[1] }
}

/** Greedy maximum coverage within the deadline: at least (1 − 1/e) of the best achievable with `count` detectors. */
export function chooseCoverage(times: readonly ArrayLike<number>[], nScen: number, count: number, deadline: number): { chosen: number[]; covered: number } {
  const covered = new Uint8Array(nScen)
  const chosen: number[] = []
  let total = 0
  for (let round = 0; round < Math.min(count, times.length); round++) {
    let pick = -1, gain = 0, tieSum = Infinity
    for (let c = 0; c < times.length; c++) {
      if (chosen.includes(c)) continue
      let g = 0, sum = 0
      for (let s = 0; s < nScen; s++) { const t = times[c]![s]!; if (!covered[s] && t <= deadline) { g++; sum += t } }
      if (g > gain || (g === gain && g > 0 && sum < tieSum)) { pick = c; gain = g; tieSum = sum }
    }
    if (pick < 0 || gain === 0) break
    chosen.push(pick)
    for (let s = 0; s < nScen; s++) if (times[pick]![s]! <= deadline && !covered[s]) { covered[s] = 1; total++ }
  }
  return { chosen, covered: total }
}

/** Candidate points on a square grid over the rooms (cell centres of a `spacing` grid that fall inside a room). */
export function gridCandidates(plan: Plan, spacing: number, max = 2000): [number, number][] {
  const out: [number, number][] = []
  const xs = plan.rooms.flatMap((r) => r.polygon.map((p) => p[0])), ys = plan.rooms.flatMap((r) => r.polygon.map((p) => p[1]))
  if (!xs.length) return out
  const x0 = Math.min(...xs), x1 = Math.max(...xs), y0 = Math.min(...ys), y1 = Math.max(...ys)
  for (let y = y0 + spacing / 2; y < y1; y += spacing) {
    for (let x = x0 + spacing / 2; x < x1; x += spacing) {
      if (plan.rooms.some((r) => pointInPolygon([x, y], r.polygon))) out.push([Math.round(x * 1000) / 1000, Math.round(y * 1000) / 1000])
      if (out.length >= max) return out
    }
  }
  return out
}

/** Mounting height by density (common practice, domain notes §7.3): heavy gases low, light gases high, others in the breathing zone. */
export function mountingHeightFor(gas: Pick<Gas, 'relative_density' | 'name'>, ceilingM: number): { heightM: number; basis: string } {
  if (gas.relative_density >= 1.2) return { heightM: 0.45, basis: `${gas.name} is heavier than air (relative density ${gas.relative_density}): 0.3–0.45 m above the floor is common practice` }
  if (gas.relative_density <= 0.8) {
    return { heightM: Math.max(0.3, Math.round((ceilingM - 0.3) * 100) / 100), basis: `${gas.name} is lighter than air (relative density ${gas.relative_density}): within about 0.3 m of the ceiling is common practice; cold releases of liquefied gas may sink at first` }
  }
  return { heightM: 1.5, basis: `${gas.name} is near air density (relative density ${gas.relative_density}): the breathing zone (1.2–1.8 m) is common practice` }
}

export const MINMAX_GUARANTEE = {
  exhaustive: 'Exact for these candidates: every combination was evaluated, so no other choice of this many candidate points has a shorter worst-case time to alarm over the selected runs.',
  greedy: 'Greedy heuristic: detectors are added one at a time, each the one that most shortens the worst-case time to alarm. This has no approximation guarantee for the worst case; a better set may exist.',
} as const
export const COVERAGE_GUARANTEE = 'Coverage choice: greedy on the number of runs that alarm within the deadline; coverage is monotone submodular, so this covers at least (1 − 1/e) ≈ 63 % of what the best set of this size could cover.'

/** Common practice: a detector goes near a likely leak point, not on it (there it reads only the jet, and is in the way). */
export const SOURCE_CLEARANCE_M = 1

/** Candidates farther than `clearance` from every leak source, and how many were left out. */
export function awayFromSources(candidates: [number, number][], sources: { position: [number, number] | readonly number[] }[], clearance = SOURCE_CLEARANCE_M) {
  const kept = candidates.filter(([x, y]) => sources.every((s) => Math.hypot(x - s.position[0]!, y - s.position[1]!) > clearance))
  return { kept, excluded: candidates.length - kept.length }
}
