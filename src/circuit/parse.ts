/**
 * `glowtalk.circuit/1` file -> Circuit: shape and values (schema.ts), then
 * refs, models and pins across parts, then topology (topology.ts). Every
 * problem is one InputError naming the JSON path and what was expected.
 */
import { InputError } from '../errors.ts';
import { issueToInputError, withArticle, type At } from './issues.ts';
import { jsonPath, parseJsonText } from './json-text.ts';
import { BUILT_IN_MODELS, MODEL_PARAMETERS, builtInModelNames, completeModel, type ModelKind, type ModelParameterName } from './models.ts';
import { circuitSchema, type ModelEntry, type PartEntry, type WaveEntry } from './schema.ts';
import { checkTopology } from './topology.ts';
import type { Circuit, Drive, Model, Part, Wave } from './types.ts';

export const DEFAULT_TEMPERATURE_CELSIUS = 27;

/** Parses the text of a circuit file. `fileLabel` (e.g. the file name) starts every error location. */
export function parseCircuitText(text: string, fileLabel?: string): Circuit {
  const json = parseJsonText(text, fileLabel ?? 'circuit');
  return parseCircuit(json, fileLabel ? `${fileLabel}:` : '');
}

/**
 * Validates an already-parsed JSON value. `pathPrefix` starts every error path,
 * e.g. `chain[2].circuit` gives `chain[2].circuit.parts[0].value`.
 */
export function parseCircuit(json: unknown, pathPrefix = ''): Circuit {
  const at = (...segments: PropertyKey[]) => jsonPath(pathPrefix, segments);
  const result = circuitSchema.safeParse(json, { reportInput: true });
  if (!result.success) throw issueToInputError(result.error.issues[0], at);
  const file = result.data;

  checkUniqueRefs(file.parts, at);
  const models = resolveModels(file.parts, file.models ?? {}, at);
  const circuit: Circuit = {
    ...(file.title === undefined ? {} : { title: file.title }),
    temperatureCelsius: file.temperature ?? DEFAULT_TEMPERATURE_CELSIUS,
    parts: file.parts.map((part, index) => toPart(part, models[index])),
  };
  checkTopology(circuit, pathPrefix);
  return circuit;
}

function checkUniqueRefs(parts: readonly PartEntry[], at: At): void {
  const firstIndex = new Map<string, number>();
  parts.forEach((part, index) => {
    const earlier = firstIndex.get(part.ref);
    if (earlier !== undefined) {
      throw new InputError(at('parts', index, 'ref'), 'a reference designator used by no other part', `"${part.ref}" is already parts[${earlier}].ref`);
    }
    firstIndex.set(part.ref, index);
  });
}

const PART_MODEL_KIND: Partial<Record<PartEntry['kind'], ModelKind>> = {
  diode: 'diode',
  led: 'led',
  npn: 'npn',
  pnp: 'pnp',
  phototransistor: 'phototransistor',
};

/**
 * The model of each part (undefined for parts without one). A file model's
 * kind comes from the parts that name it; a file model shadows a built-in of
 * the same name within this file.
 */
function resolveModels(parts: readonly PartEntry[], fileModels: Readonly<Record<string, ModelEntry>>, at: At): Array<Model | undefined> {
  const usedAs = new Map<string, { kind: ModelKind; index: number }>();
  parts.forEach((part, index) => {
    const kind = PART_MODEL_KIND[part.kind];
    if (!kind || !('model' in part) || !Object.hasOwn(fileModels, part.model)) return;
    const earlier = usedAs.get(part.model);
    if (earlier && earlier.kind !== kind) {
      throw new InputError(
        at('parts', index, 'model'),
        `${withArticle(kind)} model (define a separate model for each kind)`,
        `model "${part.model}" is already used as ${withArticle(earlier.kind)} model by parts[${earlier.index}]`,
      );
    }
    if (!earlier) usedAs.set(part.model, { kind, index });
  });

  const completed = new Map<string, Model>();
  for (const [name, entry] of Object.entries(fileModels)) {
    const { kind: declared, ...parameters } = entry;
    const use = usedAs.get(name);
    if (declared && use && declared !== use.kind) {
      throw new InputError(at('models', name, 'kind'), `"${use.kind}", the kind of parts[${use.index}] that uses it`, `got "${declared}"`);
    }
    const kind = use?.kind ?? declared;
    // An unused model without "kind" has had its values checked; its kind is unknown.
    if (!kind) continue;
    const result = completeModel(kind, parameters as Partial<Record<ModelParameterName, number>>);
    if (!result.ok) {
      const allowed = Object.keys(MODEL_PARAMETERS[kind]).join(', ');
      const why = use ? `used by parts[${use.index}] as ${withArticle(kind)} model` : `declared "${kind}"`;
      throw new InputError(
        at('models', name, result.parameter),
        result.problem === 'missing' ? `a value: ${kind} models need it` : `only the ${kind} parameters ${allowed}`,
        result.problem === 'missing' ? `missing (model ${why})` : `not ${withArticle(kind)} parameter (model ${why})`,
      );
    }
    completed.set(name, result.model);
  }

  return parts.map((part, index) => {
    const kind = PART_MODEL_KIND[part.kind];
    if (!kind || !('model' in part)) return undefined;
    // hasOwn: a name like "constructor" must not find Object.prototype members.
    const model = completed.get(part.model) ?? (Object.hasOwn(BUILT_IN_MODELS, part.model) ? BUILT_IN_MODELS[part.model] : undefined);
    const fileNames = Object.keys(fileModels).filter((name) => usedAs.get(name)?.kind === kind || fileModels[name].kind === kind);
    const choices = [...fileNames, ...builtInModelNames(kind)].join(', ');
    if (!model) {
      throw new InputError(at('parts', index, 'model'), `the name of ${withArticle(kind)} model: ${choices}`, `no model "${part.model}" in this file's "models" or among the built-in models`);
    }
    if (model.kind !== kind) {
      throw new InputError(at('parts', index, 'model'), `${withArticle(kind)} model: ${choices}`, `"${part.model}" is a built-in ${model.kind} model`);
    }
    return model;
  });
}

function toWave(wave: WaveEntry): Wave {
  switch (wave.shape) {
    case 'sine':
      return {
        shape: 'sine',
        amplitude: wave.amplitude,
        frequencyHertz: wave.frequency,
        phaseDegrees: wave.phase ?? 0,
        delaySeconds: wave.delay ?? 0,
      };
    case 'points':
      return { shape: 'points', points: wave.points.map(([seconds, value]) => [seconds, value] as const) };
    case 'upstream':
      return { shape: 'upstream' };
  }
}

function toDrive(dc: number | undefined, wave: WaveEntry | undefined): Drive {
  return wave ? { dc: dc ?? 0, wave: toWave(wave) } : { dc: dc ?? 0 };
}

function toPart(part: PartEntry, model: Model | undefined): Part {
  const base = { ref: part.ref, pins: part.pins };
  switch (part.kind) {
    case 'resistor':
    case 'capacitor':
    case 'inductor':
      return { ...base, kind: part.kind, value: part.value };
    case 'voltage-source':
    case 'current-source':
      return { ...base, kind: part.kind, ...toDrive(part.dc, part.wave) };
    case 'diode':
      return { ...base, kind: part.kind, modelName: part.model, model: model as Extract<Model, { kind: 'diode' }> };
    case 'led':
      return { ...base, kind: part.kind, modelName: part.model, model: model as Extract<Model, { kind: 'led' }> };
    case 'npn':
    case 'pnp':
      return { ...base, kind: part.kind, modelName: part.model, model: model as Extract<Model, { kind: 'npn' | 'pnp' }> };
    case 'phototransistor':
      return {
        ...base,
        kind: part.kind,
        modelName: part.model,
        model: model as Extract<Model, { kind: 'phototransistor' }>,
        light: toDrive(part.light?.dc, part.light?.wave),
      };
  }
}
