/** Molar volume used by NIOSH/OSHA to convert ppm and mg/m³ (25 °C, 1 atm), L/mol. */
export const MOLAR_VOLUME_L_MOL = 24.45
/** Molar mass of dry air, g/mol. */
export const AIR_MOLAR_MASS_G_MOL = 28.96
/** Oxygen in normal air, vol %. */
export const OXYGEN_IN_AIR_PCT = 20.9

/** ppm by volume → mg/m³ at 25 °C, 1 atm (24.45 L/mol convention). */
export function ppmToMgM3(ppm: number, molarMassGMol: number): number {
  return (ppm * molarMassGMol) / MOLAR_VOLUME_L_MOL
}

/** mg/m³ → ppm by volume at 25 °C, 1 atm. */
export function mgM3ToPpm(mgM3: number, molarMassGMol: number): number {
  return (mgM3 * MOLAR_VOLUME_L_MOL) / molarMassGMol
}

/** Oxygen percent after mixing a gas volume fraction x into air: 20.9 (1 − x). */
export function oxygenPercent(volumeFraction: number): number {
  const x = volumeFraction < 0 ? 0 : volumeFraction > 1 ? 1 : volumeFraction
  return OXYGEN_IN_AIR_PCT * (1 - x)
}

/** Gas concentration (ppm) at which oxygen falls to `o2Pct` by displacement. */
export function ppmForOxygenPercent(o2Pct: number): number {
  return (1 - o2Pct / OXYGEN_IN_AIR_PCT) * 1e6
}
