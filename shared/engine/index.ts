/** Public API of the Driftwarden dispersion engine. Pure TypeScript: no DOM, no I/O. */
export { simulate, type SimulateOptions, type SimulationResult, type ProbeResult } from './simulate'
export { resultToJson, type ResultJsonOptions } from './result-json'
export { validateScenario, estimateMemoryBytes, MAX_CELLS, type ValidScenario } from './validate'
export { ScenarioSchema, ReleaseSchema, RoomSchema, OpeningSchema, type Scenario, type ScenarioInput, type Release } from './scenario-schema'
export { ScenarioError, SimulationCancelled } from './errors'
export { releaseHistory, orificeMassFlow, criticalPressureRatio, blowdownTimeConstant, massToReferenceVolume, type ReleaseHistory } from './releases'
export { chooseDiffusivity, chengEddyDiffusivity } from './eddy-diffusivity'
export { thresholdsFor, type Threshold } from './thresholds'
