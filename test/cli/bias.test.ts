import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cli.ts';

const SAMPLES_DIR = 'samples/circuits';
const SAMPLES = readdirSync(SAMPLES_DIR).filter((f) => f.endsWith('.json'));
const TRANSISTOR_KINDS = new Set(['npn', 'pnp', 'phototransistor']);
const REGIONS = ['active', 'saturation', 'cutoff', 'reverse'];

describe('glowtalk bias', () => {
  it('has sample circuits to run', () => {
    expect(SAMPLES.length).toBeGreaterThanOrEqual(4);
  });

  for (const file of SAMPLES) {
    it(`${file}: prints {"nodes": {name: volts}, "parts": {ref: …}} with voltage/current for two-terminal parts and currents/region for transistors`, async () => {
      const path = `${SAMPLES_DIR}/${file}`;
      const { code, out, err } = await runCli(['bias', path]);
      expect(err).toBe('');
      expect(code).toBe(0);
      const report = JSON.parse(out) as { nodes: Record<string, unknown>; parts: Record<string, Record<string, unknown>> };
      expect(Object.keys(report).sort()).toEqual(['nodes', 'parts']);

      const file_ = JSON.parse(readFileSync(path, 'utf8')) as { parts: Array<{ ref: string; kind: string; pins: string[] }> };
      const nodeNames = new Set(file_.parts.flatMap((p) => p.pins).filter((n) => n !== 'gnd'));
      expect(Object.keys(report.nodes).sort()).toEqual([...nodeNames].sort());
      for (const volts of Object.values(report.nodes)) expect(Number.isFinite(volts)).toBe(true);

      expect(Object.keys(report.parts).sort()).toEqual(file_.parts.map((p) => p.ref).sort());
      for (const part of file_.parts) {
        const entry = report.parts[part.ref];
        if (TRANSISTOR_KINDS.has(part.kind)) {
          expect(Object.keys(entry).sort()).toEqual(['currents', 'region']);
          const currents = entry.currents as Record<string, number>;
          expect(Object.keys(currents).sort()).toEqual(['base', 'collector', 'emitter']);
          for (const amperes of Object.values(currents)) expect(Number.isFinite(amperes)).toBe(true);
          // Pin currents are conserved.
          expect(Math.abs(currents.collector + currents.base + currents.emitter)).toBeLessThan(1e-15);
          expect(REGIONS).toContain(entry.region);
        } else {
          expect(Object.keys(entry).sort()).toEqual(['current', 'voltage']);
          expect(Number.isFinite(entry.voltage)).toBe(true);
          expect(Number.isFinite(entry.current)).toBe(true);
          // The voltage is pins[0] − pins[1] from the printed node voltages.
          const v = (name: string) => (name === 'gnd' ? 0 : (report.nodes[name] as number));
          expect(entry.voltage).toBeCloseTo(v(part.pins[0]) - v(part.pins[1]), 12);
        }
      }
    });
  }
});
