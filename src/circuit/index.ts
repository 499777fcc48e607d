/** The circuit file format `glowtalk.circuit/1`: parse, validate, built-in models, topology. */
export type * from './types.ts';
export { GROUND } from './types.ts';
export { parseCircuit, parseCircuitText, DEFAULT_TEMPERATURE_CELSIUS } from './parse.ts';
export { checkTopology } from './topology.ts';
export { BUILT_IN_MODELS, MODEL_KINDS, MODEL_PARAMETERS, builtInModelNames, completeModel } from './models.ts';
export type { ModelKind, ModelParameterName } from './models.ts';
export { CIRCUIT_FORMAT, PART_KINDS, circuitSchema, circuitJsonSchema } from './schema.ts';
export { jsonPath, parseJsonText } from './json-text.ts';
