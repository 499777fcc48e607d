import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { circuitJsonSchema } from '../../src/circuit/schema.ts';
import { SCHEMAS, schemaText } from '../../scripts/write-schemas.ts';

describe('published JSON Schema', () => {
  it('schema/glowtalk.circuit.schema.json equals the schema generated from the zod schema (run scripts/write-schemas.ts)', () => {
    const committed = readFileSync(new URL('../../schema/glowtalk.circuit.schema.json', import.meta.url), 'utf8');
    expect(committed).toBe(schemaText(circuitJsonSchema()));
    expect(SCHEMAS.map(([path]) => path)).toContain('schema/glowtalk.circuit.schema.json');
  });

  it('is strict at the top level and lists every part kind', () => {
    const schema = circuitJsonSchema() as { additionalProperties: boolean; required: string[]; properties: { parts: { items: { oneOf: Array<{ properties: { kind: { const: string } } }> } } } };
    expect(schema.additionalProperties).toBe(false);
    expect(schema.required).toEqual(['format', 'parts']);
    expect(schema.properties.parts.items.oneOf.map((option) => option.properties.kind.const)).toEqual([
      'resistor',
      'capacitor',
      'inductor',
      'voltage-source',
      'current-source',
      'diode',
      'led',
      'npn',
      'pnp',
      'phototransistor',
    ]);
  });
});
