/**
 * The scenario as the page edits it: the file's JSON with both circuits
 * inline (so one document holds everything and saves as one file), plus a
 * label for messages and file names. Edits return changed copies; the loader
 * (src/scenario) decides what is valid.
 */
import { parseJsonText } from '../../src/circuit/index.ts';
import { InputError } from '../../src/errors.ts';
import { loadScenario, setScenarioValue, type Scenario } from '../../src/scenario/index.ts';
import { readEngineering } from '../../src/units/engineering.ts';

export type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
export type JsonObject = { [key: string]: Json };

export interface ScenarioDoc {
  json: JsonObject;
  /** File name without folders, e.g. "scenario.json" or "demo-bay/scenario.json". */
  label: string;
  /** Folder of a bundled demo, where its relative file names (recordings) start. */
  baseDir?: string;
}

const isObject = (value: unknown): value is JsonObject => typeof value === 'object' && value !== null && !Array.isArray(value);

function clone<T>(value: T): T {
  return structuredClone(value);
}

/**
 * A document from scenario text and the circuit files beside it (by the name
 * the scenario uses, or by bare file name). Throws InputError naming the file
 * and path when the text or a circuit is not valid.
 */
export function docFromText(text: string, label: string, circuitFiles: Record<string, string>): { doc: ScenarioDoc; scenario: Scenario } {
  const parsed = parseJsonText(text, label);
  if (!isObject(parsed)) throw new InputError(label, 'a scenario object {"format": "glowtalk.scenario/1", ...}', 'got something else');
  const json = clone(parsed) as JsonObject;
  for (const block of ['transmitter', 'receiver'] as const) {
    const entry = json[block];
    if (!isObject(entry) || typeof entry.circuit !== 'string') continue;
    const name = entry.circuit;
    const text = circuitFiles[name] ?? circuitFiles[baseName(name)];
    if (text === undefined) {
      throw new InputError(`${label}: ${block}.circuit`, `the circuit file "${name}" opened together with the scenario`, 'it was not among the files given');
    }
    entry.circuit = parseJsonText(text, baseName(name)) as Json;
  }
  const doc = { json, label };
  return { doc, scenario: loadDoc(doc) };
}

export function baseName(path: string): string {
  return path.split(/[\\/]/).pop() ?? path;
}

/** Loads (validates) a document; circuits are inline, so nothing is read. */
export function loadDoc(doc: ScenarioDoc): Scenario {
  return loadScenario(doc.json, { readText: (name) => { throw new Error(`circuit "${name}" should be inline`); } }, doc.label);
}

/** Reads a value by a dotted path with [ref] steps for circuit parts and models; undefined when absent. */
export function readAt(json: Json, path: string): Json | undefined {
  let here: Json | undefined = json;
  for (const step of steps(path)) {
    if (here === undefined || here === null || typeof here !== 'object') return undefined;
    if (Array.isArray(here)) {
      here = /^\d+$/.test(step) ? here[Number(step)] : here.find((item) => isObject(item) && item.ref === step);
    } else {
      here = Object.hasOwn(here, step) ? here[step] : undefined;
    }
  }
  return here;
}

function steps(path: string): string[] {
  return path.split('.').flatMap((segment) => {
    const match = /^([^[\]]+)((?:\[[^[\]]+\])*)$/.exec(segment);
    if (!match) return [segment];
    return [match[1], ...[...match[2].matchAll(/\[([^[\]]+)\]/g)].map((m) => m[1])];
  });
}

/**
 * Writes a value at a path of plain field names (scenario settings), creating
 * the last field when it was left out (a default being overridden). Circuit
 * values go through setScenarioValue instead (see writeCircuitValue).
 */
export function writeField(json: JsonObject, path: string, value: Json): JsonObject {
  const names = path.split('.');
  const copy = clone(json);
  let parent: JsonObject = copy;
  for (const name of names.slice(0, -1)) {
    const child = parent[name];
    if (child === undefined) parent[name] = {};
    else if (!isObject(child)) throw new InputError(path, `an object at ${name}`, `got ${JSON.stringify(child)}`);
    parent = parent[name] as JsonObject;
  }
  const last = names[names.length - 1];
  if (value === undefined) delete parent[last];
  else parent[last] = value;
  return copy;
}

/** Removes a field (back to its default). */
export function removeField(json: JsonObject, path: string): JsonObject {
  const names = path.split('.');
  const copy = clone(json);
  let parent: Json | undefined = copy;
  for (const name of names.slice(0, -1)) parent = isObject(parent) ? parent[name] : undefined;
  if (isObject(parent)) delete parent[names[names.length - 1]];
  return copy;
}

/** A circuit part or model value, e.g. "transmitter.circuit.parts[R3].value" (the loader's own setter). */
export function writeCircuitValue(json: JsonObject, path: string, value: number): JsonObject {
  return setScenarioValue(json, path, value) as JsonObject;
}

/**
 * Every setting as path → value text, circuit parts and models addressed by
 * name, for comparing two documents. Numbers written in engineering notation
 * are compared by value ("4.7k" equals 4700).
 */
export function flattenSettings(json: Json): Map<string, string> {
  const out = new Map<string, string>();
  const walk = (value: Json, path: string): void => {
    if (Array.isArray(value)) {
      const byRef = value.every((item) => isObject(item) && typeof item.ref === 'string');
      if (byRef && value.length > 0) {
        for (const item of value as JsonObject[]) walk(item, `${path}[${item.ref as string}]`);
      } else if (value.every((item) => item === null || typeof item !== 'object')) {
        out.set(path, JSON.stringify(value));
      } else {
        value.forEach((item, i) => walk(item, `${path}[${i}]`));
      }
    } else if (isObject(value)) {
      for (const [key, item] of Object.entries(value)) {
        if (key !== 'ref') walk(item, path === '' ? key : `${path}.${key}`);
      }
    } else {
      const read = typeof value === 'string' ? readEngineering(value) : null;
      out.set(path, read && read.ok ? String(read.value) : typeof value === 'string' ? value : JSON.stringify(value));
    }
  };
  walk(json, '');
  return out;
}

export interface SettingDifference {
  path: string;
  before: string | null;
  after: string | null;
}

/** Settings that differ between two documents (absent on one side shows as null). */
export function settingDifferences(before: Json, after: Json): SettingDifference[] {
  const a = flattenSettings(before);
  const b = flattenSettings(after);
  const paths = [...new Set([...a.keys(), ...b.keys()])].sort();
  const out: SettingDifference[] = [];
  for (const path of paths) {
    if (path === 'title' || path === 'description') continue;
    const x = a.get(path) ?? null;
    const y = b.get(path) ?? null;
    if (x !== y) out.push({ path, before: x, after: y });
  }
  return out;
}
