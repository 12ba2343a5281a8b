import type { ChecklistStep, EvacuationRoom, PlanContent, PlanLine, RunChoice } from '../schemas/plans'
import type { z } from 'zod'

type Run = z.infer<typeof RunChoice>

/** What a refresh did, for the audit log and the officer's notice. */
export interface RefreshOutcome {
  content: PlanContent
  /** Rule-derived entries rebuilt from the chosen results. */
  rebuilt: number
  /** Entries an officer typed (no `from`), carried over unchanged. */
  kept: number
}

const GENERATED_PREFIX = 'Generated from '

/**
 * Rebuild a plan's rule-derived content from newer results while keeping what officers wrote:
 *
 * - every entry with a `from` (hazard items, timeline rows, evacuation rooms, actions, protection,
 *   re-entry, after-incident lines, checklist steps) is replaced by the freshly generated ones;
 * - entries an officer added (`from` null) follow them, in their order, unchanged;
 * - a `who` an officer assigned to a rule line or step is kept when the rule produces the same id
 *   again, and so are the notes on the doors of an evacuation room (they describe the floor, which a
 *   newer result of the same floor does not change);
 * - title, notes, assembly point, roles and contacts are the officer's and stay as they are; the
 *   summary's "Generated from …" first line is replaced, any text after it kept.
 */
export function refreshFromResults(current: PlanContent, fresh: PlanContent): RefreshOutcome {
  let rebuilt = 0, kept = 0
  const merge = <T extends { id?: string; from: unknown }>(old: T[], next: T[], carry: (was: T, now: T) => T = (_w, n) => n, key: (x: T) => string = (x) => x.id ?? ''): T[] => {
    const officer = old.filter((x) => x.from === null)
    const byKey = new Map(old.filter((x) => x.from !== null).map((x) => [key(x), x]))
    rebuilt += next.length
    kept += officer.length
    return [...next.map((n) => { const was = byKey.get(key(n)); return was ? carry(was, n) : n }), ...officer]
  }
  const keepWho = <T extends PlanLine | ChecklistStep>(was: T, now: T): T => (was.who.trim() && was.who !== now.who ? { ...now, who: was.who } : now)
  const keepDoorNotes = (was: EvacuationRoom, now: EvacuationRoom): EvacuationRoom => ({
    ...now,
    doors: now.doors.map((d) => ({ ...d, note: was.doors.find((o) => o.openingId === d.openingId)?.note ?? d.note })),
  })

  const content: PlanContent = {
    ...current,
    summary: refreshSummary(current.summary, fresh.summary),
    hazard: { ...current.hazard, items: merge(current.hazard.items, fresh.hazard.items) },
    timeline: { ...current.timeline, rows: merge(current.timeline.rows, fresh.timeline.rows) },
    evacuation: { ...current.evacuation, rooms: merge(current.evacuation.rooms, fresh.evacuation.rooms, keepDoorNotes, (r) => r.roomId) },
    actions: { ...current.actions, items: merge(current.actions.items, fresh.actions.items, keepWho) },
    protection: {
      ...current.protection,
      ppe: merge(current.protection.ppe, fresh.protection.ppe, keepWho),
      reentry: merge(current.protection.reentry, fresh.protection.reentry, keepWho),
    },
    afterIncident: { ...current.afterIncident, items: merge(current.afterIncident.items, fresh.afterIncident.items, keepWho) },
    checklist: merge(current.checklist, fresh.checklist, keepWho),
    predicted: fresh.predicted,
  }
  return { content, rebuilt, kept }
}

/** Replace the generated first line of the summary; an officer's own summary stays, with the new line on top. */
function refreshSummary(current: string, fresh: string): string {
  if (!current.trim()) return fresh
  if (!current.startsWith(GENERATED_PREFIX)) return `${fresh}\n${current}`
  const eol = current.indexOf('\n')
  return eol < 0 ? fresh : fresh + current.slice(eol)
}

/**
 * Finished results of the floor that finished after every result the plan uses (newest first): the ones
 * an officer is offered to refresh the plan from. None when the plan's results are no longer listed.
 */
export function newerResults(runs: readonly Run[], planRunIds: readonly number[]): Run[] {
  const time = (r: Run) => (r.finishedAt ? Date.parse(r.finishedAt) : 0)
  const used = runs.filter((r) => planRunIds.includes(r.id))
  if (!used.length) return []
  const latest = Math.max(...used.map(time))
  return runs.filter((r) => !planRunIds.includes(r.id) && time(r) > latest).sort((a, b) => time(b) - time(a))
}
