// Gas library: unit conversions (reference sheet §9.1, §12 #1-3), diffusivity correlations vs measured
// values (CRC Handbook "Diffusion in gases", data of Marrero & Mason 1972; reference sheet §2.5), and
// spot checks of exposure limits against the NIOSH Pocket Guide / IDLH documentation (§1.2).
import { describe, expect, it } from 'vitest'
import {
  chapmanEnskogDiffusivityCm2S, defaultAlarmSetPoints, findGas, fullerDiffusivityCm2S, FULLER_VOLUMES, GAS_LIBRARY,
  GasSchema, mgM3ToPpm, oxygenPercent, ppmForOxygenPercent, ppmToMgM3,
} from '../../shared/gases/index'

describe('units', () => {
  it('25 ppm NH3 = 17.414 mg/m3 at 24.45 L/mol (§12 #1)', () => expect(ppmToMgM3(25, 17.031)).toBeCloseTo(17.414, 3))
  it('0.002 mg/m3 AsH3 = 0.000627 ppm (§12 #2)', () => expect(mgM3ToPpm(0.002, 77.945)).toBeCloseTo(0.000627, 6))
  it('O2 19.5 % at 6.699 % inert (§12 #3)', () => {
    expect(ppmForOxygenPercent(19.5) / 1e4).toBeCloseTo(6.699, 3)
    expect(oxygenPercent(0.06699)).toBeCloseTo(19.5, 3)
  })
})

describe('diffusivity correlations vs measured (CRC / Marrero & Mason)', () => {
  it('Fuller CO2-air 293.15 K = 0.1530 cm2/s, within 5 % of measured 0.160 (§12 #5)', () => {
    const d = fullerDiffusivityCm2S(44.01, FULLER_VOLUMES.CO2, 293.15)
    expect(d).toBeCloseTo(0.153, 3)
    expect(Math.abs(d / 0.16 - 1)).toBeLessThan(0.05)
  })
  it('Fuller H2-air 293.15 K = 0.7372 cm2/s, within 3 % of measured 0.756 (§12 #6)', () => {
    const d = fullerDiffusivityCm2S(2.016, FULLER_VOLUMES.H2, 293.15)
    expect(d).toBeCloseTo(0.7372, 3)
    expect(Math.abs(d / 0.756 - 1)).toBeLessThan(0.03)
  })
  it.each([['He', 4.0026, FULLER_VOLUMES.He, 0.697], ['Ar', 39.948, FULLER_VOLUMES.Ar, 0.189], ['CH4', 16.043, FULLER_VOLUMES.C + 4 * FULLER_VOLUMES.H, 0.21]])(
    'Fuller %s-air at 293.15 K within 5 %% of measured %s', (_id, m, v, measured) => {
      expect(Math.abs(fullerDiffusivityCm2S(m as number, v as number, 293.15) / (measured as number) - 1)).toBeLessThan(0.05)
    })
  it('Chapman-Enskog Ar-air 293.15 K = 0.1883 cm2/s (§12 #7)', () => {
    expect(chapmanEnskogDiffusivityCm2S(39.948, 3.542, 93.3, 293.15)).toBeCloseTo(0.1883, 3)
  })
})

describe('library', () => {
  it('has at least 20 gases, all valid against the schema and all with sources', () => {
    expect(GAS_LIBRARY.length).toBeGreaterThanOrEqual(20)
    for (const g of GAS_LIBRARY) {
      expect(() => GasSchema.parse(g)).not.toThrow()
      expect(g.sources.diffusivity_m2_s, g.id).toBeTruthy()
      expect(g.sources.gamma, g.id).toBeTruthy()
    }
  })
  it.each([
    // gas, field, value: NIOSH Pocket Guide / IDLH documentation as quoted in the reference sheet §1.2
    ['NH3', 'rel_twa_ppm', 25], ['NH3', 'rel_stel_ppm', 35], ['NH3', 'idlh_ppm', 300], ['NH3', 'pel_twa_ppm', 50],
    ['PH3', 'rel_twa_ppm', 0.3], ['PH3', 'rel_stel_ppm', 1], ['PH3', 'idlh_ppm', 50],
    ['AsH3', 'pel_twa_ppm', 0.05], ['B2H6', 'rel_twa_ppm', 0.1], ['Cl2', 'rel_ceiling_ppm', 0.5], ['Cl2', 'idlh_ppm', 10],
    ['CO', 'rel_twa_ppm', 35], ['CO', 'rel_ceiling_ppm', 200], ['CO', 'idlh_ppm', 1200], ['H2S', 'rel_ceiling_ppm', 10],
    ['H2S', 'idlh_ppm', 100], ['CO2', 'rel_stel_ppm', 30000], ['O3', 'rel_ceiling_ppm', 0.1], ['SiH4', 'rel_twa_ppm', 5],
  ])('%s %s = %s', (id, field, value) => {
    expect(findGas(id as string)!.limits[field as keyof ReturnType<typeof findGas> & string as never]).toBe(value)
  })
  it('flammability and flags', () => {
    expect(findGas('SiH4')!.pyrophoric).toBe(true)
    expect(findGas('PH3')!.lel_pct).toBe(1.79)
    expect(findGas('N2')!.asphyxiant).toBe(true)
    expect(findGas('nh3')!.id).toBe('NH3')
  })
  it('default alarm set points follow common practice (§7.2)', () => {
    const cl2 = defaultAlarmSetPoints(findGas('Cl2')!).filter((a) => a.hazard === 'toxic').map((a) => a.ppm)
    expect(cl2).toEqual([0.25, 0.5])
    const h2 = defaultAlarmSetPoints(findGas('H2')!)
    expect(h2.filter((a) => a.hazard === 'flammable').map((a) => a.ppm)).toEqual([4000, 10000])
    expect(h2.find((a) => a.hazard === 'oxygen')!.ppm).toBeCloseTo(66986, -1)
    expect(defaultAlarmSetPoints(findGas('AsH3')!).filter((a) => a.hazard === 'toxic').map((a) => a.ppm)).toEqual([0.025, 0.05])
  })
})
