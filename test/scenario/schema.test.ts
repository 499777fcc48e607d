import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { scenarioJsonSchema } from '../../src/scenario/schema.ts';
import { SCHEMAS, schemaText } from '../../scripts/write-schemas.ts';

describe('published scenario JSON Schema', () => {
  it('schema/glowtalk.scenario.schema.json equals the schema generated from the zod schema (run scripts/write-schemas.ts)', () => {
    const committed = readFileSync(new URL('../../schema/glowtalk.scenario.schema.json', import.meta.url), 'utf8');
    expect(committed).toBe(schemaText(scenarioJsonSchema()));
    expect(SCHEMAS.map(([path]) => path)).toContain('schema/glowtalk.scenario.schema.json');
  });

  it('is strict at the top level, requires the blocks and refers to the circuit schema for inline circuits', () => {
    const schema = scenarioJsonSchema() as Record<string, any>;
    expect(schema.additionalProperties).toBe(false);
    expect(schema.required).toEqual(['format', 'source', 'microphone', 'transmitter', 'lightPath', 'receiver']);
    expect(schema.properties.transmitter.properties.circuit.anyOf).toEqual([{ type: 'string', minLength: 1 }, { $ref: 'glowtalk.circuit.schema.json' }]);
    expect(schema.properties.source.oneOf.map((option: any) => option.properties.kind.const)).toEqual(['recording', 'tone', 'two-tone', 'sweep', 'pink-noise', 'speech-like']);
    expect(schema.properties.oversampling.enum).toEqual([2, 4, 8]);
  });
});
