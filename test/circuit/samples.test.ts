import { readFileSync, readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../src/circuit/parse.ts';

const DIR = new URL('../../samples/circuits/', import.meta.url);
const FILES = readdirSync(DIR).filter((name) => name.endsWith('.json'));

describe('sample circuits', () => {
  it('there are at least three', () => {
    expect(FILES.length).toBeGreaterThanOrEqual(3);
  });

  for (const name of FILES) {
    it(`${name} parses, passes the topology check and has a title`, () => {
      const circuit = parseCircuitText(readFileSync(new URL(name, DIR), 'utf8'), name);
      expect(circuit.title).toBeTruthy();
      expect(circuit.parts.length).toBeGreaterThan(0);
    });
  }
});

describe('docs/circuit-format.md', () => {
  it('its complete example parses', () => {
    const doc = readFileSync(new URL('../../docs/circuit-format.md', import.meta.url), 'utf8');
    const example = /```json\n([\s\S]*?)```/.exec(doc);
    expect(example).not.toBeNull();
    const circuit = parseCircuitText(example![1], 'circuit-format.md');
    expect(circuit.parts.map((part) => part.kind)).toEqual(['voltage-source', 'resistor', 'led']);
  });
});
