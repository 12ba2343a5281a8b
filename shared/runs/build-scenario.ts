import type { ScenarioInput } from '../engine/scenario-schema'
import { LIBRARY_GAS_IDS } from '../floorplan/gas-ids'
import type { Plan } from '../floorplan/plan-schema'
import { planToScenario } from '../floorplan/scenario-io'
import { defaultAlarmSetPoints } from '../gases/alarm-setpoints'
import { findGas } from '../gases/library'
import { MOLAR_VOLUME_L_MOL } from '../gases/units'
import { VENTILATION_STATE_LABELS, type ScenarioConfig } from '../schemas/runs'

/**
 * Plan + floor ceiling + scenario → the engine's scenario file, with the ventilation state applied.
 * Pure: the job worker and the API (to refuse a bad scenario with 400 before queueing) both call it.
 */

export type BuildResult =
  | { ok: true; scenario: ScenarioInput; gasId: string; notes: string[]; setPointsPpm: number[] }
  | { ok: false; fields: Record<string, string> }

/** Residual air change rate assumed when the room extract has failed: infiltration only, 1/h. */
export const FAILED_EXTRACT_ACH = 0

export function buildRunScenario(plan: Plan, ceilingM: number, config: ScenarioConfig, name?: string): BuildResult {
  const fields: Record<string, string> = {}
  const chosen = config.sourceIds.map((id) => plan.sources.find((s) => s.id === id))
  chosen.forEach((s, i) => { if (!s) fields[`sourceIds.${i}`] = `No source "${config.sourceIds[i]}" on this floor` })
  if (Object.keys(fields).length) return { ok: false, fields }
  const gasId = chosen[0]!.gasId
  chosen.forEach((s, i) => { if (s!.gasId !== gasId) fields[`sourceIds.${i}`] = `Leaks together must be one gas (${gasId}); this source releases ${s!.gasId}` })
  const gas = findGas(gasId)
  if (!gas) fields['sourceIds.0'] = `Gas ${gasId} is not in the library`
  if (config.release === 'constant' && config.constantRateM3S === undefined) fields.constantRateM3S = 'Give the flow for a constant release'
  for (const [i, id] of config.proppedOpeningIds.entries()) {
    if (!plan.openings.some((o) => o.id === id)) fields[`proppedOpeningIds.${i}`] = `No opening "${id}" on this floor`
  }
  if (Object.keys(fields).length) return { ok: false, fields }

  const exported = planToScenario(plan, {
    knownGasIds: LIBRARY_GAS_IDS, ceilingM, gasId, name, durationS: config.durationS, outputIntervalS: config.outputIntervalS,
    cellM: config.cellM, layers: config.layers,
  })
  if (!exported.ok) {
    for (const p of exported.problems) fields[`plan.${p.path}`] = fields[`plan.${p.path}`] ? `${fields[`plan.${p.path}`]}; ${p.message}` : p.message
    return { ok: false, fields }
  }
  const s: ScenarioInput = structuredClone(exported.scenario)
  const notes: string[] = []
  const others = plan.sources.filter((p) => !config.sourceIds.includes(p.id)).length
  if (others) notes.push(`${others} other source(s) on the floor are assumed intact`)
  if (chosen.some((c) => c!.kind === 'line')) notes.push(exported.notes.find((n) => /line/i.test(n)) ?? 'Gas lines are modelled as a large reservoir at the line pressure')
  const only = new Set(config.sourceIds)
  s.sources = s.sources.filter((src) => only.has(src.id))

  if (config.release === 'constant') {
    s.sources = s.sources.map((src) => {
      const plSrc = plan.sources.find((p) => p.id === src.id)!
      const inventory = plSrc.inventoryKg ? (plSrc.inventoryKg * 1000 / gas!.molar_mass_g_mol) * MOLAR_VOLUME_L_MOL / 1000 : undefined
      return { ...src, release: { kind: 'constant' as const, rate_m3_s: config.constantRateM3S!, ...(inventory ? { inventory_m3: inventory } : {}) } }
    })
    notes.push(`Constant release of ${config.constantRateM3S} m³/s per source (25 °C, 1 atm) until the inventory is used up`)
  } else {
    notes.push('Release: the full contents blow down through the valve orifice (or the restrictive flow orifice where fitted)')
  }

  applyVentilation(s, plan, config, notes)
  if (config.diffusivityM2S !== undefined) s.effective_diffusivity_m2_s = config.diffusivityM2S

  // Fronts are tracked at the detectors' own set points and the gas's default ones, so alarms and the advisor can use them.
  const setPoints = new Set<number>()
  for (const d of plan.detectors) if (d.gasId === gasId) { setPoints.add(d.alarmLowPpm); setPoints.add(d.alarmHighPpm) }
  for (const a of defaultAlarmSetPoints(gas!)) setPoints.add(a.ppm)
  const setPointsPpm = [...setPoints].filter((p) => p > 0 && p <= 1e6).sort((a, b) => a - b).slice(0, 20)
  s.thresholds_ppm = setPointsPpm
  // Detectors of other gases do not measure this one.
  s.probes = (s.probes ?? []).filter((p) => {
    if (!p.id.startsWith('detector:')) return true
    const d = plan.detectors.find((x) => `detector:${x.id}` === p.id)
    return d?.gasId === gasId
  })
  return { ok: true, scenario: s, gasId, notes, setPointsPpm }
}

function applyVentilation(s: ScenarioInput, plan: Plan, config: ScenarioConfig, notes: string[]) {
  const state = config.ventilationState
  notes.push(`Ventilation state: ${VENTILATION_STATE_LABELS[state]}`)
  if (state === 'exhaust_failed') {
    const n = s.local_exhausts?.length ?? 0
    s.local_exhausts = []
    s.rooms = s.rooms.map((r) => ({
      ...r,
      ventilation: r.ventilation?.downflow
        // Recirculation fans keep running; nothing is exhausted or made up.
        ? { air_changes_per_hour: 0, downflow: { ...r.ventilation.downflow, exhaust_fraction: 0 } }
        : { air_changes_per_hour: FAILED_EXTRACT_ACH },
    }))
    notes.push(`${n} local exhaust(s) off; room extract off (no dilution); cleanroom recirculation assumed running with no exhaust`)
  } else if (state === 'door_propped_open') {
    const ids = config.proppedOpeningIds.length ? new Set(config.proppedOpeningIds) : new Set(plan.openings.filter((o) => o.kind === 'door').map((o) => o.id))
    s.openings = (s.openings ?? []).map((o) => (ids.has(o.id) ? { ...o, open: true } : o))
    const names = plan.openings.filter((o) => ids.has(o.id)).map((o) => o.name || o.id)
    notes.push(config.proppedOpeningIds.length ? `Held open: ${names.join(', ')}` : `No opening chosen: every door held open (${names.join(', ') || 'none'})`)
  } else if (state === 'downflow_off') {
    let n = 0
    s.rooms = s.rooms.map((r) => {
      if (!r.ventilation?.downflow) return r
      n++
      return { ...r, ventilation: { air_changes_per_hour: 0 } }
    })
    notes.push(n ? `Downflow off in ${n} cleanroom bay(s): no air movement there beyond eddy mixing` : 'No cleanroom bay with downflow on this floor: same as normal ventilation')
  }
}
