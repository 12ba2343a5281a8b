import type { LimitLine, RunSummary, VentilationState } from '../schemas/runs'

/** A finished run to compare: the same leak under different conditions, or different leaks of one floor. */
export interface CompareInput {
  id: number
  label: string
  summary: RunSummary
}

/** One cell of the comparison: a time, or why there is none. */
export type CompareTime =
  | { kind: 'time'; timeS: number; earliest: boolean }
  | { kind: 'not_reached' }
  /** The receptor or room is not in that run (drawn after it was computed, or another floor version). */
  | { kind: 'absent' }

export interface CompareRow {
  /** `receptor:<id>` or `room:<id>`. */
  key: string
  kind: 'workstation' | 'detector' | 'room'
  name: string
  roomName: string | null
  /** Per limit key, one entry per run (in input order). */
  times: Record<string, CompareTime[]>
}

export interface Comparison {
  runs: { id: number; label: string; gasName: string; ventilationState: VentilationState; firstAlarmS: number | null }[]
  /** Limits every run tracked (same key and ppm), in the first run's order. */
  limits: LimitLine[]
  rows: CompareRow[]
  /** The runs release different gases: only limits with the same key and value are compared. */
  mixedGases: boolean
}

const KIND_ORDER = { workstation: 0, detector: 1, room: 2 } as const

/**
 * Line the runs up receptor by receptor and room by room: for every limit all of them tracked, when each
 * run first exceeds it there. The earliest time of a row (the worst case) is marked when at least two
 * runs have one. Workstations come first (people), then detectors, then rooms (critical levels only,
 * which is all a run records for rooms).
 */
export function compareRuns(inputs: readonly CompareInput[]): Comparison {
  const first = inputs[0]?.summary
  const limits = (first?.limits ?? []).filter((l) => inputs.every((r) => r.summary.limits.some((o) => o.key === l.key && o.ppm === l.ppm)))
  const rows = new Map<string, CompareRow>()
  const rowFor = (key: string, kind: CompareRow['kind'], name: string, roomName: string | null) => {
    let row = rows.get(key)
    if (!row) {
      row = { key, kind, name, roomName, times: Object.fromEntries(limits.map((l) => [l.key, inputs.map((): CompareTime => ({ kind: 'absent' }))])) }
      rows.set(key, row)
    }
    return row
  }
  const put = (row: CompareRow, run: number, firstExceedS: Record<string, number | null>) => {
    for (const l of limits) {
      if (!(l.key in firstExceedS)) continue
      const t = firstExceedS[l.key]
      row.times[l.key]![run] = t === null || t === undefined ? { kind: 'not_reached' } : { kind: 'time', timeS: t, earliest: false }
    }
  }
  inputs.forEach((r, i) => {
    for (const rec of r.summary.receptors) put(rowFor(`receptor:${rec.id}`, rec.kind, rec.name, rec.roomName), i, rec.firstExceedS)
    for (const room of r.summary.rooms) put(rowFor(`room:${room.id}`, 'room', room.name, null), i, room.firstExceedS)
  })
  // The worst case of each row and limit: the earliest time, where at least two runs have one.
  for (const row of rows.values()) {
    for (const cells of Object.values(row.times)) {
      const times = cells.flatMap((c) => (c.kind === 'time' ? [c.timeS] : []))
      if (times.length < 2) continue
      const min = Math.min(...times)
      for (const c of cells) if (c.kind === 'time' && c.timeS === min) c.earliest = true
    }
  }
  return {
    runs: inputs.map((r) => ({ id: r.id, label: r.label, gasName: r.summary.gas.name, ventilationState: r.summary.ventilationState, firstAlarmS: r.summary.firstAlarm?.timeS ?? null })),
    limits,
    rows: [...rows.values()].sort((a, b) => KIND_ORDER[a.kind] - KIND_ORDER[b.kind] || a.name.localeCompare(b.name)),
    mixedGases: new Set(inputs.map((r) => r.summary.gas.id)).size > 1,
  }
}

/** Whether a row has anything to show for a limit (rooms only record critical levels). */
export const rowTracks = (row: CompareRow, limitKey: string) => (row.times[limitKey] ?? []).some((c) => c.kind !== 'absent')

/** The limit a comparison opens on: IDLH where tracked (the evacuation decision), else the first. */
export const defaultLimitKey = (limits: readonly LimitLine[]): string | null => (limits.find((l) => l.key === 'idlh') ?? limits[0])?.key ?? null
