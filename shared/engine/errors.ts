/** Bad scenario input. `field` is the JSON path of the offending value, e.g. `rooms[1].polygon_m`. */
export class ScenarioError extends Error {
  readonly field: string
  constructor(field: string, detail: string) {
    super(`${field}: ${detail}`)
    this.name = 'ScenarioError'
    this.field = field
  }
}

/** The run was cancelled through its signal. */
export class SimulationCancelled extends Error {
  constructor() {
    super('simulation cancelled')
    this.name = 'SimulationCancelled'
  }
}

/** JSON path of a zod issue path: ['rooms', 1, 'polygon_m'] → 'rooms[1].polygon_m'. */
export function formatPath(path: readonly PropertyKey[]): string {
  let s = ''
  for (const k of path) s += typeof k === 'number' ? `[${k}]` : s ? `.${String(k)}` : String(k)
  return s || '(root)'
}
