/**
 * Plausible and possible ranges for the physical inputs of the editor, in stored SI units.
 * `refuse` mirrors the server's plan schema (shared/floorplan/plan-schema.ts, shared/schemas/floors.ts), so the
 * field refuses what the server would refuse, with the reason next to it. `usual` is where real lab equipment
 * sits; outside it the field warns but keeps the value. `why` says where the usual range comes from.
 */
export interface QuantityRange {
  /** Impossible below (or at, when `aboveZero`) / above these: the field refuses the value. */
  min?: number
  max?: number
  aboveZero?: boolean
  /** Outside these the value is kept with a warning. */
  usualMin?: number
  usualMax?: number
  why: string
}

export const RANGES = {
  ceiling: { min: 1.8, max: 30, usualMin: 2.2, usualMax: 8, why: 'labs and plant rooms are usually 2.4–4 m, high bays up to about 8 m (common practice)' },
  releaseHeight: { min: 0, max: 20, usualMax: 3, why: 'cylinder valves and gas-cabinet outlets sit 0.5–1.5 m above the floor; lines usually below 3 m (common practice)' },
  inventory: { min: 0, max: 100_000, usualMax: 1000, why: 'one cylinder holds up to about 70 kg; a one-ton liquefied-gas container about 900 kg (common practice, from memory)' },
  pressure: { min: 0, max: 1e8, usualMax: 3.1e7, why: 'compressed-gas cylinders are filled to 150–300 bar (DOT 3AA / EN ISO 9809 service pressures, from memory)' },
  waterVolume: { min: 0, aboveZero: true, max: 10, usualMin: 2e-4, usualMax: 1, why: 'small sample cylinders hold about 0.4 L of water, standard cylinders 40–50 L, one-ton containers about 0.8 m³ (common practice)' },
  orifice: { min: 0, aboveZero: true, max: 0.1, usualMin: 1e-4, usualMax: 0.025, why: 'restrictive flow orifices are 0.15–0.5 mm, cylinder valve bores about 3–6 mm, large lines up to 25 mm (common practice, from memory)' },
  exhaustFlow: { min: 0, aboveZero: true, max: 50, usualMin: 0.005, usualMax: 10, why: 'a gas cabinet draws about 0.1–0.5 m³/s, a room extract up to a few m³/s (common practice)' },
  airChanges: { min: 0, max: 1000, usualMax: 600, why: 'offices 2–6 per hour, labs 6–12, cleanrooms up to about 600 (ISO 14644 practice, from memory)' },
  downflow: { min: 0, aboveZero: true, max: 2, usualMin: 0.2, usualMax: 0.6, why: 'unidirectional cleanroom downflow is about 0.36–0.54 m/s (IEST-RP-CC012, from memory)' },
  mountingHeight: { min: 0, max: 20, usualMax: 6, why: 'detectors are mounted 0.3 m above the floor for heavy gases, near the ceiling for light ones (common practice)' },
  breathingHeight: { min: 0, max: 5, usualMin: 0.8, usualMax: 2, why: '1.5 m standing, 1.1 m seated (common practice)' },
  openingWidth: { min: 0, aboveZero: true, usualMin: 0.5, usualMax: 5, why: 'doors are 0.8–1.2 m wide, double and roller doors up to about 5 m (common practice)' },
} satisfies Record<string, QuantityRange>

/**
 * Vapour pressure at 20 °C of the library's gases that are usually stored liquefied, gauge Pa (about 1 bar below the
 * absolute handbook figure). From memory of CRC Handbook / gas-supplier data sheets; used as the default when a
 * source is switched to liquefied and as the top of the usual range for its pressure.
 */
export const LIQUEFIED_VAPOUR_PA: Record<string, number> = {
  NH3: 7.6e5, Cl2: 5.8e5, HCl: 41.6e5, HF: 0, HBr: 20.6e5, H2S: 17.2e5, CO2: 56.3e5, NO2: 0, WF6: 0.1e5, AsH3: 13.9e5, PH3: 33.6e5,
}

/** The usual range for a source's pressure: a liquefied gas cannot sit above its vapour pressure (with 20 % room for warm rooms). */
export function pressureRange(gasId: string, liquefied: boolean): QuantityRange {
  const vp = LIQUEFIED_VAPOUR_PA[gasId]
  if (!liquefied) return RANGES.pressure
  if (vp === undefined) return { ...RANGES.pressure, usualMax: 6e6, why: 'no common liquefied gas has a vapour pressure above about 57 bar at 20 °C (carbon dioxide; handbook value, from memory)' }
  return { ...RANGES.pressure, usualMax: Math.max(1.2 * vp, 2e4), why: `${gasId} has a vapour pressure of about ${(vp / 1e5).toFixed(1)} bar (gauge) at 20 °C (handbook value, from memory)` }
}
