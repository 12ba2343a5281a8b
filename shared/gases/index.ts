/** Public API of the gas library. */
export { GasSchema, GasLimitsSchema, DiffusivityMethodSchema, type Gas, type GasLimits } from './gas-schema'
export { GAS_LIBRARY, findGas, listGasIds } from './library'
export { defaultAlarmSetPoints, type AlarmSetPoint } from './alarm-setpoints'
export { ppmToMgM3, mgM3ToPpm, oxygenPercent, ppmForOxygenPercent, MOLAR_VOLUME_L_MOL, AIR_MOLAR_MASS_G_MOL, OXYGEN_IN_AIR_PCT } from './units'
export { GAS_LIBRARY_VERSION, gasEntryFingerprint, currentGasFingerprint } from './version'
export { fullerDiffusivityCm2S, chapmanEnskogDiffusivityCm2S, FULLER_VOLUMES } from './diffusivity'
