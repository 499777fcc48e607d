/**
 * One edit from the page applied to the scenario document and checked by the
 * loader. Returns the new document and scenario, or the reason the value
 * cannot stand (the loader's message without the file label).
 */
import { InputError, isUserFacing } from '../../src/errors.ts';
import type { Scenario } from '../../src/scenario/index.ts';
import { FIELDS } from './field-catalogue.ts';
import { loadDoc, readAt, writeCircuitValue, writeField, type Json, type ScenarioDoc } from './scenario-doc.ts';

const SPECS = Object.values(FIELDS).flat();

export type EditOutcome = { ok: true; doc: ScenarioDoc; scenario: Scenario } | { ok: false; reason: string };

export function applyEdit(doc: ScenarioDoc, path: string, value: Json): EditOutcome {
  try {
    const spec = SPECS.find((s) => s.path === path);
    let json;
    if (spec?.apply) json = spec.apply(doc.json, value);
    else if (path.includes('.circuit.')) {
      if (typeof value !== 'number') throw new InputError(path, 'a number');
      json = writeCircuitValue(doc.json, path, value);
    } else json = writeField(doc.json, path, value);
    const next = { ...doc, json };
    return { ok: true, doc: next, scenario: loadDoc(next) };
  } catch (error) {
    if (!isUserFacing(error)) throw error;
    return { ok: false, reason: partsByRef(withoutLabel(error.message, doc.label), doc) };
  }
}

/** The loader names parts by position ("parts[5]"); the page shows them by ref ("parts[RB]"), as the parts table does. */
function partsByRef(message: string, doc: ScenarioDoc): string {
  return message.replace(/\b(transmitter|receiver)\.circuit\.parts\[(\d+)\]/g, (whole, block: string, index: string) => {
    const ref = readAt(doc.json, `${block}.circuit.parts.${index}.ref`);
    return typeof ref === 'string' ? `${block}.circuit.parts[${ref}]` : whole;
  });
}

/** "demo-bay/scenario.json: microphone.sensitivity: got…" → "microphone.sensitivity: got…". */
export function withoutLabel(message: string, label: string): string {
  return message.startsWith(`${label}: `) ? message.slice(label.length + 2) : message;
}
