export { ARCHETYPES, type Archetype } from './archetypes.ts';
export { CLIMATE_DEFAULTS, type ClimateOptions } from './climate.ts';
export { OPERATOR } from './default-fleet.ts';
export type { FaultSpec, MaintenanceEvent, SensorSignal } from './faults.ts';
export {
  createScenario,
  type FaultPlan,
  SCENARIO_DEFAULTS,
  type Scenario,
  type ScenarioOptions,
  type TimeRange,
} from './scenario.ts';
export type { SimTrip } from './vehicle-stream.ts';
export type { TripTruth } from './truth.ts';
export { CSV_COLUMNS, csvRow, writeCsv } from './csv.ts';
export { mergeByTime } from './merge.ts';
export { PACE_DEFAULTS, type PaceOptions, paceSamples } from './pace.ts';
export { PUBLISH_DEFAULTS, type PublishOptions, type PublishResult, publishScenario } from './publish.ts';
