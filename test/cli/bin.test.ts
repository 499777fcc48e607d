import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';

function bias(env: NodeJS.ProcessEnv): string {
  return execFileSync(process.execPath, ['bin/glowtalk.mjs', 'bias', 'samples/circuits/diode-with-series-resistor.json'], {
    encoding: 'utf8',
    timeout: 30_000,
    env,
  });
}

describe('the installed launcher bin/glowtalk.mjs', () => {
  it('runs `glowtalk bias` on the diode sample in a separate Node process and prints the operating point', () => {
    const { GLOWTALK_DEBUG: _, ...env } = process.env;
    const out = bias(env);
    const report = JSON.parse(out) as { nodes: Record<string, number>; parts: Record<string, { voltage: number; current: number }> };
    expect(report.nodes.supply).toBe(3.3);
    // A silicon diode fed through 2.2 kΩ sits near 0.6 V (common practice, no source).
    expect(report.nodes.anode).toBeGreaterThan(0.5);
    expect(report.nodes.anode).toBeLessThan(0.7);
    expect(report.parts.R1.current).toBeCloseTo((3.3 - report.nodes.anode) / 2200, 12);
    // It ran from the bundle it keeps of the sources, made from the command line's entry module.
    const bundle = readFileSync('node_modules/.cache/glowtalk/main.mjs', 'utf8');
    const record = JSON.parse(bundle.slice(bundle.indexOf('{'), bundle.indexOf('\n'))) as { inputs: [string, number, number][] };
    expect(record.inputs.map(([input]) => input)).toContain('main.ts');
    // With GLOWTALK_DEBUG it runs the sources through tsx instead, with the same answer.
    expect(bias({ ...env, GLOWTALK_DEBUG: '1' })).toBe(out);
  });
});
