/**
 * Test-only generator of random DC networks that are always valid circuits:
 * a random spanning tree of resistors joins every node to ground, then extra
 * resistors, voltage sources (never closing a loop of sources), current
 * sources and diodes (each behind its own series resistor) are added.
 */
import fc from 'fast-check';
import type { PartEntry } from './circuits.ts';

const extraPart = fc.record({
  type: fc.constantFrom('resistor', 'voltage-source', 'current-source', 'diode'),
  a: fc.nat(),
  b: fc.nat(),
  value: fc.double({ min: 0, max: 1, noNaN: true }),
  model: fc.constantFrom('d', 'generic-silicon-diode'),
});

export const networkSpec = fc.record({
  nodes: fc.integer({ min: 1, max: 6 }),
  parents: fc.array(fc.nat(), { minLength: 6, maxLength: 6 }),
  treeOhms: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 6, maxLength: 6 }),
  extras: fc.array(extraPart, { maxLength: 7 }),
});
export type NetworkSpec = typeof networkSpec extends fc.Arbitrary<infer T> ? T : never;

/** 100 Ω … 100 kΩ, log-uniform from u in [0, 1]. */
const ohms = (u: number) => 100 * 1000 ** u;

/** The circuit-file parts of a spec, and the file models they use. */
export function networkParts(spec: NetworkSpec): { parts: PartEntry[]; models: Record<string, unknown> } {
  const name = (i: number) => (i === 0 ? 'gnd' : `n${i}`);
  const parts: PartEntry[] = [];
  for (let i = 1; i <= spec.nodes; i++) {
    parts.push({ ref: `RT${i}`, kind: 'resistor', pins: [name(i), name(spec.parents[i - 1] % i)], value: ohms(spec.treeOhms[i - 1]) });
  }
  // Disjoint sets over nodes joined by voltage sources, so no loop of sources forms.
  const parent = Array.from({ length: spec.nodes + 1 }, (_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  spec.extras.forEach((extra, k) => {
    const a = extra.a % (spec.nodes + 1);
    const b = extra.b % (spec.nodes + 1);
    if (a === b) return;
    switch (extra.type) {
      case 'resistor':
        parts.push({ ref: `RX${k}`, kind: 'resistor', pins: [name(a), name(b)], value: ohms(extra.value) });
        break;
      case 'voltage-source':
        if (find(a) === find(b)) return;
        parent[find(a)] = find(b);
        parts.push({ ref: `V${k}`, kind: 'voltage-source', pins: [name(a), name(b)], dc: 10 * extra.value - 5 });
        break;
      case 'current-source':
        parts.push({ ref: `I${k}`, kind: 'current-source', pins: [name(a), name(b)], dc: 2e-3 * extra.value - 1e-3 });
        break;
      case 'diode':
        parts.push({ ref: `D${k}`, kind: 'diode', pins: [name(a), `m${k}`], model: extra.model });
        parts.push({ ref: `RD${k}`, kind: 'resistor', pins: [`m${k}`, name(b)], value: ohms(extra.value) });
        break;
    }
  });
  return { parts, models: { d: { saturationCurrent: 1e-14 } } };
}
