import { Plan } from '../../shared/floorplan/plan-schema'

/** What the editor keeps in localStorage until the server has it: nothing typed is lost to a network error. */
export interface LocalDraft {
  floorId: number
  /** Server version the draft was edited from. */
  baseVersion: number
  plan: Plan
  /** ISO time of the last local change. */
  changedAt: string
}

const key = (floorId: number) => `driftwarden.floor-draft.${floorId}`

export function readDraft(floorId: number): LocalDraft | null {
  try {
    const raw = localStorage.getItem(key(floorId))
    if (!raw) return null
    const value = JSON.parse(raw) as LocalDraft
    const plan = Plan.safeParse(value.plan)
    return plan.success && typeof value.baseVersion === 'number' ? { ...value, plan: plan.data } : null
  } catch {
    return null
  }
}

export function writeDraft(draft: LocalDraft): void {
  try {
    localStorage.setItem(key(draft.floorId), JSON.stringify(draft))
  } catch {
    // Storage full or disabled: the in-memory copy and the retry loop still hold the work.
  }
}

export function clearDraft(floorId: number): void {
  try {
    localStorage.removeItem(key(floorId))
  } catch {
    // ignore
  }
}
