import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';

describe('the installed launcher bin/glowtalk.mjs', () => {
  it('runs `glowtalk bias` on the diode sample in a separate Node process and prints the operating point', () => {
    const out = execFileSync(process.execPath, ['bin/glowtalk.mjs', 'bias', 'samples/circuits/diode-with-series-resistor.json'], {
      encoding: 'utf8',
      timeout: 30_000,
    });
    const report = JSON.parse(out) as { nodes: Record<string, number>; parts: Record<string, { voltage: number; current: number }> };
    expect(report.nodes.supply).toBe(3.3);
    // A silicon diode fed through 2.2 kΩ sits near 0.6 V (common practice, no source).
    expect(report.nodes.anode).toBeGreaterThan(0.5);
    expect(report.nodes.anode).toBeLessThan(0.7);
    expect(report.parts.R1.current).toBeCloseTo((3.3 - report.nodes.anode) / 2200, 12);
  });
});
