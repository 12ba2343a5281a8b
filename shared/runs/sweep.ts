import type { LimitLine, RunSummary, SweepWorstCase } from '../schemas/runs'

/**
 * Worst case per workstation over a sweep (one run per source): the earliest time each limit is crossed and
 * which source did it, and the highest peak. Runs without a summary (not finished) are ignored.
 */
export function sweepWorstCase(runs: readonly { sourceId: string; summary: RunSummary | null }[]): { limits: LimitLine[]; worstCase: SweepWorstCase[] } {
  const done = runs.filter((r) => r.summary)
  const limits: LimitLine[] = []
  for (const r of done) for (const l of r.summary!.limits) if (!limits.some((x) => x.key === l.key)) limits.push(l)
  limits.sort((a, b) => a.ppm - b.ppm)
  const byWs = new Map<string, SweepWorstCase>()
  for (const r of done) {
    for (const rc of r.summary!.receptors) {
      if (rc.kind !== 'workstation') continue
      let w = byWs.get(rc.id)
      if (!w) {
        w = { workstationId: rc.id, name: rc.name, peakPpm: 0, peakSourceId: null, firstExceed: Object.fromEntries(limits.map((l) => [l.key, { timeS: null, sourceId: null }])) }
        byWs.set(rc.id, w)
      }
      if (rc.peakPpm > w.peakPpm) { w.peakPpm = rc.peakPpm; w.peakSourceId = r.sourceId }
      for (const [key, t] of Object.entries(rc.firstExceedS)) {
        const cur = w.firstExceed[key] ?? { timeS: null, sourceId: null }
        if (t !== null && (cur.timeS === null || t < cur.timeS)) w.firstExceed[key] = { timeS: t, sourceId: r.sourceId }
        else w.firstExceed[key] = cur
      }
    }
  }
  return { limits, worstCase: [...byWs.values()].sort((a, b) => a.name.localeCompare(b.name)) }
}
