/** The scenario file format `glowtalk.scenario/1`: load, validate, summarise, set values for sweeps. */
export type * from './types.ts';
export { loadScenario, loadScenarioText } from './load.ts';
export type { ScenarioResolver } from './load.ts';
export { settingsSummary } from './summary.ts';
export type { JsonValue } from './summary.ts';
export { setScenarioValue } from './set-value.ts';
export { MAX_SOURCE_SECONDS, SCENARIO_DEFAULTS, SCENARIO_FORMAT, scenarioJsonSchema, scenarioSchema } from './schema.ts';
