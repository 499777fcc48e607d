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
