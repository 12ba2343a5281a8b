/**
 * Binary gas diffusivity correlations in air (used for gases without a measured value).
 * Fuller, Schettler & Giddings, Ind. Eng. Chem. 58(5):18 (1966), volumes revised by Fuller, Ensley &
 * Giddings, J. Phys. Chem. 73:3679 (1969), as tabulated in Poling, Prausnitz & O'Connell (2001) Table 11-1
 * (volumes from memory, see shared/reference domain sheet §2.2). Chapman–Enskog with the Neufeld et al.
 * (1972) collision-integral fit, Poling eq. 11-3.2.
 */

/** Atomic and molecular diffusion volumes (cm³/mol), 1969 set. */
export const FULLER_VOLUMES = {
  C: 15.9, H: 2.31, O: 6.11, N: 4.54, F: 14.7, Cl: 21.0, Br: 21.9, I: 29.8, S: 22.9,
  He: 2.67, Ar: 16.2, H2: 6.12, N2: 18.5, O2: 16.3, Air: 19.7, CO: 18.0, CO2: 26.9, NH3: 20.7,
  H2O: 13.1, SF6: 71.3, Cl2: 38.4, SO2: 41.8, Kr: 24.5, Xe: 32.7, Ne: 5.98,
} as const

/**
 * Fuller–Schettler–Giddings diffusivity of gas A in air, cm²/s.
 * @param molarMassGMol molar mass of A, g/mol
 * @param diffusionVolume Σv of A, cm³/mol
 * @param temperatureK temperature, K
 * @param pressureAtm pressure, atm
 */
export function fullerDiffusivityCm2S(molarMassGMol: number, diffusionVolume: number, temperatureK = 298.15, pressureAtm = 1): number {
  const mAir = 28.96
  const s = Math.cbrt(diffusionVolume) + Math.cbrt(FULLER_VOLUMES.Air)
  return (1e-3 * Math.pow(temperatureK, 1.75) * Math.sqrt(1 / molarMassGMol + 1 / mAir)) / (pressureAtm * s * s)
}

/** Lennard-Jones σ (Å) and ε/k (K) of air (Svehla 1962, from memory). */
export const AIR_LENNARD_JONES = { sigma: 3.711, epsK: 78.6 }

/**
 * Chapman–Enskog diffusivity of gas A in air, cm²/s, with Lennard-Jones parameters of A.
 * @param sigmaA collision diameter of A, Å
 * @param epsKA well depth ε/k of A, K
 */
export function chapmanEnskogDiffusivityCm2S(molarMassGMol: number, sigmaA: number, epsKA: number, temperatureK = 298.15, pressureBar = 1.01325): number {
  const mAB = 2 / (1 / molarMassGMol + 1 / 28.96)
  const sigma = (sigmaA + AIR_LENNARD_JONES.sigma) / 2
  const tStar = temperatureK / Math.sqrt(epsKA * AIR_LENNARD_JONES.epsK)
  const omega = 1.06036 / Math.pow(tStar, 0.1561) + 0.193 / Math.exp(0.47635 * tStar) +
    1.03587 / Math.exp(1.52996 * tStar) + 1.76474 / Math.exp(3.89411 * tStar)
  return (0.00266 * Math.pow(temperatureK, 1.5)) / (pressureBar * Math.sqrt(mAB) * sigma * sigma * omega)
}
