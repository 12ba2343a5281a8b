import type { Gas, GasLimits } from './gas-schema'
import { chapmanEnskogDiffusivityCm2S, FULLER_VOLUMES as V, fullerDiffusivityCm2S } from './diffusivity'

// Provenance words follow the project's reference sheet: "verified" values were checked against the
// cited public page; "from memory" values were recalled without a source in hand and must be
// re-verified before release; "common practice" marks facts of the trade with no single source.
const NPG = 'NIOSH Pocket Guide to Chemical Hazards (DHHS (NIOSH) 2005-149, web ed.)'
const IDLH = (cas: string) => `NIOSH IDLH documentation (1994), cdc.gov/niosh/idlh/${cas.replace(/-/g, '')}.html`
const PEL = 'OSHA 29 CFR 1910.1000 Table Z-1/Z-2'
const MEM = ' (from memory)'
const GAMMA = 'ideal-gas Cp/Cv at 298 K from JANAF-type tables (from memory)'
const CRC = 'CRC Handbook "Diffusion in gases" (Marrero & Mason 1972), 293 K scaled to 298 K by T^1.75'
const MASSMAN = 'Massman (1998) Atmos. Environ. 32:1111, STP value scaled by T^1.81 (value from memory)'
const FULLER = 'Fuller, Schettler & Giddings (1966) with 1969 volumes (Poling et al. 2001 Table 11-1, from memory), 298.15 K'
const CE = 'Chapman-Enskog, Svehla (1962) Lennard-Jones parameters via Poling et al. App. B (from memory), 298.15 K'
const ZAB = 'Zabetakis (1965) US Bureau of Mines Bull. 627 (from memory)'

const NONE: GasLimits = { rel_twa_ppm: null, rel_stel_ppm: null, rel_ceiling_ppm: null, pel_twa_ppm: null, pel_ceiling_ppm: null, idlh_ppm: null }
const cm2 = (d: number) => d * 1e-4

interface Entry extends Omit<Gas, 'relative_density' | 'oxidizer' | 'pyrophoric' | 'asphyxiant' | 'limits'> {
  limits?: Partial<GasLimits>
  oxidizer?: boolean
  pyrophoric?: boolean
  asphyxiant?: boolean
}

function entry(e: Entry): Gas {
  return {
    ...e,
    relative_density: Math.round((e.molar_mass_g_mol / 28.96) * 1000) / 1000,
    limits: { ...NONE, ...e.limits },
    oxidizer: e.oxidizer ?? false,
    pyrophoric: e.pyrophoric ?? false,
    asphyxiant: e.asphyxiant ?? false,
    sources: { relative_density: 'M / 28.96, ideal gas (derived)', ...e.sources },
  }
}

const fuller = (m: number, sv: number) => cm2(fullerDiffusivityCm2S(m, sv))
const ce = (m: number, sigma: number, eps: number) => cm2(chapmanEnskogDiffusivityCm2S(m, sigma, eps))

/** The built-in gas library (21 lab and fab gases). Values and their sources: see each entry's `sources`. */
export const GAS_LIBRARY: readonly Gas[] = [
  entry({ id: 'NH3', name: 'Ammonia', cas: '7664-41-7', molar_mass_g_mol: 17.031,
    limits: { rel_twa_ppm: 25, rel_stel_ppm: 35, pel_twa_ppm: 50, idlh_ppm: 300 },
    lel_pct: 15, uel_pct: 28, gamma: 1.31, diffusivity_m2_s: cm2(0.232), diffusivity_method: 'measured',
    notes: 'Cold releases of liquefied ammonia sink at first despite M < 29.',
    sources: { limits: `${NPG}; ${PEL}; ${IDLH("7664-41-7")} (verified)`, lel_pct: 'gas-supplier data sheet (partly verified)', gamma: GAMMA, diffusivity_m2_s: MASSMAN } }),
  entry({ id: 'Cl2', name: 'Chlorine', cas: '7782-50-5', molar_mass_g_mol: 70.906, oxidizer: true,
    limits: { rel_ceiling_ppm: 0.5, pel_ceiling_ppm: 1, idlh_ppm: 10 },
    lel_pct: null, uel_pct: null, gamma: 1.32, diffusivity_m2_s: fuller(70.906, V.Cl2), diffusivity_method: 'fuller',
    sources: { limits: `${IDLH('7782-50-5')} (verified)`, gamma: GAMMA, diffusivity_m2_s: FULLER } }),
  entry({ id: 'HCl', name: 'Hydrogen chloride', cas: '7647-01-0', molar_mass_g_mol: 36.461,
    limits: { rel_ceiling_ppm: 5, pel_ceiling_ppm: 5, idlh_ppm: 45 },
    lel_pct: null, uel_pct: null, gamma: 1.4, diffusivity_m2_s: fuller(36.461, V.H + V.Cl), diffusivity_method: 'fuller',
    notes: 'IDLH 50 ppm (1994) re-derived as 45 ppm in the 2025 NIOSH IDLH value profile; 45 used.',
    sources: { limits: 'OSHA chemical sampling page (verified); 2025 NIOSH IDLH value profile via AIHA news (verified)', gamma: GAMMA, diffusivity_m2_s: FULLER } }),
  entry({ id: 'HF', name: 'Hydrogen fluoride', cas: '7664-39-3', molar_mass_g_mol: 20.006,
    limits: { rel_twa_ppm: 3, rel_ceiling_ppm: 6, pel_twa_ppm: 3, idlh_ppm: 30 },
    lel_pct: null, uel_pct: null, gamma: 1.4, diffusivity_m2_s: fuller(20.006, V.H + V.F), diffusivity_method: 'fuller',
    notes: 'Associates into (HF)n near room temperature; real vapour density exceeds 0.69.',
    sources: { limits: 'OSHA chemical sampling page (verified)', gamma: 'diatomic ideal-gas value 1.40 (from memory)', diffusivity_m2_s: FULLER } }),
  entry({ id: 'HBr', name: 'Hydrogen bromide', cas: '10035-10-6', molar_mass_g_mol: 80.912,
    limits: { rel_ceiling_ppm: 3, pel_twa_ppm: 3, idlh_ppm: 35 },
    lel_pct: null, uel_pct: null, gamma: 1.4, diffusivity_m2_s: fuller(80.912, V.H + V.Br), diffusivity_method: 'fuller',
    notes: 'IDLH 30 ppm (1994) re-derived as 35 ppm in the 2025 NIOSH IDLH value profile; 35 used.',
    sources: { limits: `${IDLH('10035-10-6')}; 2025 profile via AIHA news (verified)`, gamma: GAMMA, diffusivity_m2_s: FULLER } }),
  entry({ id: 'SiH4', name: 'Silane', cas: '7803-62-5', molar_mass_g_mol: 32.117, pyrophoric: true,
    limits: { rel_twa_ppm: 5 },
    lel_pct: 1.37, uel_pct: 96, gamma: 1.24, diffusivity_m2_s: ce(32.117, 4.084, 207.6), diffusivity_method: 'chapman-enskog',
    notes: 'May ignite spontaneously in air; fast releases may form pockets that explode later. OSHA PEL vacated.',
    sources: { limits: 'OSHA chemical data page; NIOSH pel88 page (verified)', lel_pct: `supplier data${MEM}`, pyrophoric: 'ICSC 0564 (verified)', gamma: GAMMA, diffusivity_m2_s: CE } }),
  entry({ id: 'PH3', name: 'Phosphine', cas: '7803-51-2', molar_mass_g_mol: 33.998, pyrophoric: true,
    limits: { rel_twa_ppm: 0.3, rel_stel_ppm: 1, pel_twa_ppm: 0.3, idlh_ppm: 50 },
    lel_pct: 1.79, uel_pct: null, gamma: 1.29, diffusivity_m2_s: ce(33.998, 3.981, 251.5), diffusivity_method: 'chapman-enskog',
    sources: { limits: `${NPG} npgd0505 (verified)`, lel_pct: `${NPG} (verified)`, gamma: GAMMA, diffusivity_m2_s: CE } }),
  entry({ id: 'AsH3', name: 'Arsine', cas: '7784-42-1', molar_mass_g_mol: 77.945,
    limits: { rel_ceiling_ppm: 0.0006, pel_twa_ppm: 0.05, idlh_ppm: 3 },
    lel_pct: 5.1, uel_pct: 78, gamma: 1.27, diffusivity_m2_s: ce(77.945, 4.145, 259.8), diffusivity_method: 'chapman-enskog',
    notes: 'NIOSH: potential carcinogen; REL C 0.002 mg/m³ (15 min) ≈ 0.0006 ppm, below most detectors.',
    sources: { limits: `${NPG} npgd0040 (verified); ppm from 0.002 mg/m³ at 24.45 L/mol (derived)`, lel_pct: `${NPG} (verified)`, gamma: GAMMA, diffusivity_m2_s: CE } }),
  entry({ id: 'B2H6', name: 'Diborane', cas: '19287-45-7', molar_mass_g_mol: 27.67, pyrophoric: true,
    limits: { rel_twa_ppm: 0.1, pel_twa_ppm: 0.1, idlh_ppm: 15 },
    lel_pct: 0.8, uel_pct: 88, gamma: 1.17, diffusivity_m2_s: cm2(0.14), diffusivity_method: 'estimate',
    notes: 'Usually supplied as a dilute mixture in H2, Ar, N2 or He.',
    sources: { limits: `${NPG} npgd0183 (verified); IDLH${MEM}`, lel_pct: `${NPG} (verified)`, gamma: `ethane-like polyatomic estimate${MEM}`, diffusivity_m2_s: `analogy with ethane${MEM}` } }),
  entry({ id: 'CO', name: 'Carbon monoxide', cas: '630-08-0', molar_mass_g_mol: 28.01,
    limits: { rel_twa_ppm: 35, rel_ceiling_ppm: 200, pel_twa_ppm: 50, idlh_ppm: 1200 },
    lel_pct: 12.5, uel_pct: 74, gamma: 1.4, diffusivity_m2_s: cm2(0.214), diffusivity_method: 'measured',
    sources: { limits: `${IDLH('630-08-0')} (verified; IDLH partly verified)`, lel_pct: `${IDLH('630-08-0')}; UEL${MEM}`, gamma: GAMMA, diffusivity_m2_s: CRC } }),
  entry({ id: 'H2S', name: 'Hydrogen sulfide', cas: '7783-06-4', molar_mass_g_mol: 34.081,
    limits: { rel_ceiling_ppm: 10, pel_ceiling_ppm: 20, idlh_ppm: 100 },
    lel_pct: 4.0, uel_pct: 44, gamma: 1.32, diffusivity_m2_s: fuller(34.081, 2 * V.H + V.S), diffusivity_method: 'fuller',
    notes: 'NIOSH ceiling is a 10-minute limit.',
    sources: { limits: `${IDLH('7783-06-4')} (verified)`, lel_pct: `${IDLH('7783-06-4')} (verified); UEL partly verified`, gamma: GAMMA, diffusivity_m2_s: FULLER } }),
  entry({ id: 'NO2', name: 'Nitrogen dioxide', cas: '10102-44-0', molar_mass_g_mol: 46.006, oxidizer: true,
    limits: { rel_stel_ppm: 1, pel_ceiling_ppm: 5, idlh_ppm: 13 },
    lel_pct: null, uel_pct: null, gamma: 1.29, diffusivity_m2_s: cm2(0.16), diffusivity_method: 'measured',
    notes: 'IDLH 20 ppm (1994) re-derived as 13 ppm (NIOSH 2017-202); 13 used.',
    sources: { limits: 'NIOSH IDLH value profile DHHS (NIOSH) 2017-202 (verified)', gamma: `triatomic ideal-gas estimate${MEM}`, diffusivity_m2_s: MASSMAN } }),
  entry({ id: 'NF3', name: 'Nitrogen trifluoride', cas: '7783-54-2', molar_mass_g_mol: 71.002, oxidizer: true,
    limits: { rel_twa_ppm: 10, pel_twa_ppm: 10, idlh_ppm: 1000 },
    lel_pct: null, uel_pct: null, gamma: 1.22, diffusivity_m2_s: fuller(71.002, V.N + 3 * V.F), diffusivity_method: 'fuller',
    notes: 'Strong oxidizer; can displace oxygen in low spaces.',
    sources: { limits: `${IDLH('7783-54-2')} (verified); IDLH via NLM Haz-Map (partly verified)`, oxidizer: 'ICSC 1234 (verified)', gamma: `polyatomic estimate${MEM}`, diffusivity_m2_s: FULLER } }),
  entry({ id: 'WF6', name: 'Tungsten hexafluoride', cas: '7783-82-6', molar_mass_g_mol: 297.83,
    // Hydrolysis WF6 + 3 H2O -> WO3 + 6 HF: the HF limits divided by 6, as fabs alarm WF6 as HF.
    limits: { rel_twa_ppm: 0.5, rel_ceiling_ppm: 1, pel_twa_ppm: 0.5, idlh_ppm: 5 },
    lel_pct: null, uel_pct: null, gamma: 1.08, diffusivity_m2_s: cm2(0.08), diffusivity_method: 'estimate',
    notes: 'No WF6-specific REL/PEL/IDLH. Limits here are HF limits ÷ 6 (1 mol WF6 can give 6 mol HF).',
    sources: { limits: `HF limits / 6 by hydrolysis stoichiometry (derived; common practice to alarm WF6 as HF); hydrolysis${MEM}`, cas: `CAS${MEM}`, gamma: `heavy polyatomic estimate${MEM}`, diffusivity_m2_s: 'SF6 value scaled by mass and size ratio, sigma 5.4 A assumed (weak estimate)' } }),
  entry({ id: 'H2', name: 'Hydrogen', cas: '1333-74-0', molar_mass_g_mol: 2.016, asphyxiant: true,
    lel_pct: 4.0, uel_pct: 75, gamma: 1.41, diffusivity_m2_s: cm2(0.779), diffusivity_method: 'measured',
    sources: { lel_pct: ZAB, cas: `CAS${MEM}`, gamma: GAMMA, diffusivity_m2_s: CRC } }),
  entry({ id: 'CH4', name: 'Methane', cas: '74-82-8', molar_mass_g_mol: 16.043, asphyxiant: true,
    lel_pct: 5.0, uel_pct: 15, gamma: 1.3, diffusivity_m2_s: cm2(0.216), diffusivity_method: 'measured',
    notes: 'IEC 60079-20-1 lists about 4.4/17 vol % (from memory).',
    sources: { lel_pct: ZAB, cas: `CAS${MEM}`, gamma: GAMMA, diffusivity_m2_s: CRC } }),
  entry({ id: 'N2', name: 'Nitrogen', cas: '7727-37-9', molar_mass_g_mol: 28.014, asphyxiant: true,
    lel_pct: null, uel_pct: null, gamma: 1.4, diffusivity_m2_s: fuller(28.014, V.N2), diffusivity_method: 'fuller',
    sources: { asphyxiant: 'common practice', cas: `CAS${MEM}`, gamma: GAMMA, diffusivity_m2_s: FULLER } }),
  entry({ id: 'Ar', name: 'Argon', cas: '7440-37-1', molar_mass_g_mol: 39.948, asphyxiant: true,
    lel_pct: null, uel_pct: null, gamma: 1.67, diffusivity_m2_s: cm2(0.195), diffusivity_method: 'measured',
    sources: { asphyxiant: 'common practice', cas: `CAS${MEM}`, gamma: 'monatomic ideal gas 5/3', diffusivity_m2_s: CRC } }),
  entry({ id: 'He', name: 'Helium', cas: '7440-59-7', molar_mass_g_mol: 4.0026, asphyxiant: true,
    lel_pct: null, uel_pct: null, gamma: 1.67, diffusivity_m2_s: cm2(0.718), diffusivity_method: 'measured',
    sources: { asphyxiant: 'common practice', cas: `CAS${MEM}`, gamma: 'monatomic ideal gas 5/3', diffusivity_m2_s: CRC } }),
  entry({ id: 'CO2', name: 'Carbon dioxide', cas: '124-38-9', molar_mass_g_mol: 44.01,
    limits: { rel_twa_ppm: 5000, rel_stel_ppm: 30000, pel_twa_ppm: 5000, idlh_ppm: 40000 },
    lel_pct: null, uel_pct: null, gamma: 1.29, diffusivity_m2_s: cm2(0.165), diffusivity_method: 'measured',
    notes: 'Toxic in its own right well before oxygen displacement matters; pools in low spaces.',
    sources: { limits: `${IDLH('124-38-9')} (verified)`, gamma: GAMMA, diffusivity_m2_s: CRC } }),
  entry({ id: 'O3', name: 'Ozone', cas: '10028-15-6', molar_mass_g_mol: 47.998, oxidizer: true,
    limits: { rel_ceiling_ppm: 0.1, pel_twa_ppm: 0.1, idlh_ppm: 5 },
    lel_pct: null, uel_pct: null, gamma: 1.27, diffusivity_m2_s: cm2(0.169), diffusivity_method: 'measured',
    notes: 'Generated on site, not shipped in cylinders.',
    sources: { limits: `${IDLH('10028-15-6')}; OSHA page (verified)`, gamma: `triatomic estimate${MEM}`, diffusivity_m2_s: MASSMAN } }),
]

const BY_ID = new Map(GAS_LIBRARY.map((g) => [g.id.toLowerCase(), g]))

/** Library gas by id (case-insensitive), or undefined. */
export function findGas(id: string): Gas | undefined {
  return BY_ID.get(id.toLowerCase())
}

/** Ids of all library gases, in library order. */
export function listGasIds(): string[] {
  return GAS_LIBRARY.map((g) => g.id)
}
