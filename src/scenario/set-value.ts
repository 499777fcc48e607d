/**
 * Sets one numeric value in scenario JSON by a dotted path, for sweeps:
 *   lightPath.channel.length
 *   transmitter.circuit.parts[R3].value          (parts addressed by ref)
 *   transmitter.circuit.models[my-led].saturationCurrent
 *   lightPath.ambient.harmonics[1]               (other arrays by index)
 * Returns a changed deep copy; the input is never modified. The value must
 * already be written in the file (a number or engineering string): a default
 * left out is not swept by accident through a misspelt path.
 */
import { parseJsonText } from '../circuit/json-text.ts';
import { InputError } from '../errors.ts';
import { describeInput, readEngineering } from '../units/engineering.ts';
import type { ScenarioResolver } from './load.ts';

type Step = { kind: 'field'; name: string } | { kind: 'bracket'; key: string };

const PATH_EXPECTED = 'a dotted path such as lightPath.channel.length or transmitter.circuit.parts[R3].value';

function parsePath(path: string): Step[] {
  const steps: Step[] = [];
  const segments = typeof path === 'string' && path !== '' ? path.split('.') : [];
  for (const segment of segments) {
    const match = /^([^[\]]+)((?:\[[^[\]]+\])*)$/.exec(segment);
    if (!match) throw new InputError(`path ${JSON.stringify(path)}`, PATH_EXPECTED, `cannot read the part ${JSON.stringify(segment)}`);
    steps.push({ kind: 'field', name: match[1] });
    for (const bracket of match[2].matchAll(/\[([^[\]]+)\]/g)) steps.push({ kind: 'bracket', key: bracket[1] });
  }
  if (steps.length === 0) throw new InputError('path', PATH_EXPECTED, `got ${describeInput(path)}`);
  return steps;
}

function cloneJson(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(cloneJson);
  if (typeof value === 'object' && value !== null) {
    const copy: Record<string, unknown> = {};
    for (const [key, item] of Object.entries(value)) copy[key] = cloneJson(item);
    return copy;
  }
  return value;
}

const isObject = (value: unknown): value is Record<string, unknown> => typeof value === 'object' && value !== null && !Array.isArray(value);

function stepText(step: Step): string {
  return step.kind === 'field' ? step.name : `[${step.key}]`;
}

/**
 * A copy of `json` with the number at `path` replaced by `value`. With
 * `resolve`, a path that runs through a circuit given as a file
 * (`transmitter.circuit: "circuits/tx.json"`) inlines that file's circuit in
 * the copy; without it, such a path is an error.
 */
export function setScenarioValue(json: unknown, path: string, value: number, resolve?: ScenarioResolver): unknown {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new InputError(`value for ${path}`, 'a finite number', `got ${describeInput(value)}`);
  const steps = parsePath(path);
  const where = String(path);
  const root = cloneJson(json);
  if (!isObject(root)) throw new InputError(where, 'scenario JSON (an object) to change', `got ${describeInput(json)}`);

  let parent: Record<string, unknown> | unknown[] = root;
  let walked = '';
  for (let i = 0; i < steps.length; i++) {
    const step = steps[i];
    const last = i === steps.length - 1;
    const key = childKey(parent, step, where, walked);
    const shownHere = walked === '' ? stepText(step) : step.kind === 'field' ? `${walked}.${step.name}` : `${walked}${stepText(step)}`;
    let child: unknown = (parent as Record<string | number, unknown>)[key];
    if (last) {
      const read = readEngineering(child);
      if (!read.ok) throw new InputError(where, 'the path of a numeric value (a number or engineering-notation string)', `${shownHere} is ${describeInput(child)}`);
      (parent as Record<string | number, unknown>)[key] = value;
      return root;
    }
    if (typeof child === 'string' && step.kind === 'field' && step.name === 'circuit') {
      if (!resolve) {
        throw new InputError(where, 'a resolver to read the circuit file (or an inline circuit) to change a value inside it', `${shownHere} is the file "${child}"`);
      }
      child = inlineCircuit(child, resolve, where, shownHere);
      (parent as Record<string | number, unknown>)[key] = child;
    }
    if (!isObject(child) && !Array.isArray(child)) {
      throw new InputError(where, `an object or array at ${shownHere} to continue the path`, `${shownHere} is ${describeInput(child)}`);
    }
    parent = child;
    walked = shownHere;
  }
  // Unreachable: the loop returns at the last step.
  return root;
}

/** The key (field name or array index) a step selects in `parent`. */
function childKey(parent: Record<string, unknown> | unknown[], step: Step, where: string, walked: string): string | number {
  const at = walked === '' ? 'the top level' : walked;
  if (!Array.isArray(parent)) {
    const name = step.kind === 'field' ? step.name : step.key;
    if (!Object.hasOwn(parent, name)) {
      const fields = Object.keys(parent).join(', ');
      throw new InputError(where, `a field written at ${at} (${fields}); a default left out must be written in first`, `no field "${name}"`);
    }
    return name;
  }
  if (step.kind === 'field') throw new InputError(where, `[ref] or [index] after ${at}, which is an array`, `got ".${step.name}"`);
  const refs = parent.map((item) => (isObject(item) && typeof item.ref === 'string' ? item.ref : undefined));
  if (refs.some((ref) => ref !== undefined)) {
    const index = refs.indexOf(step.key);
    if (index < 0) throw new InputError(where, `the ref of an entry of ${at} (${refs.filter(Boolean).join(', ')})`, `no entry "${step.key}"`);
    return index;
  }
  const index = /^(?:0|[1-9][0-9]*)$/.test(step.key) ? Number(step.key) : -1;
  if (index < 0 || index >= parent.length) {
    throw new InputError(where, `an index from 0 to ${parent.length - 1} in ${at}`, `got [${step.key}]`);
  }
  return index;
}

function inlineCircuit(file: string, resolve: ScenarioResolver, where: string, shown: string): unknown {
  let text: string;
  try {
    text = resolve.readText(file);
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new InputError(where, `a readable circuit file at ${shown}`, `cannot read "${file}" (${reason})`);
  }
  return parseJsonText(text, file);
}
