import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';
import { renderScenario } from '../../../src/link/chain/chain.ts';
import { loadScenarioText } from '../../../src/scenario/index.ts';

/*
 * Taps that read a device's own state (a capacitor's current, a transistor's pin current
 * with its capacitances) must see it right after their own step, even though the circuits
 * now step a chunk at a time in the generated kernels. Checked against the general step
 * loop fed one audio sample (four internal samples) per chunk: a stage that read such a
 * tap once per chunk would disagree with it.
 */
const scenarioFile = new URL('../../../samples/demo-bay/scenario.json', import.meta.url).pathname;

function demo(): ReturnType<typeof loadScenarioText> {
  const json = JSON.parse(readFileSync(scenarioFile, 'utf8'));
  json.source = { kind: 'tone', frequency: '1k', seconds: 0.05, level: { dbSpl: 80 } };
  const base = path.dirname(scenarioFile);
  return loadScenarioText(JSON.stringify(json), { readText: (p) => readFileSync(path.resolve(base, p), 'utf8') }, scenarioFile);
}

describe('taps of device state with stepping by chunks', () => {
  it('give the same capacitor and pin currents, sample for sample, as the general step loop (within 1e-6 of their peak: taps are 32-bit floats)', () => {
    const taps = ['transmitter.CIN', 'transmitter.Q2.collector', 'receiver.CIN', 'receiver.Q4.base', 'transmitter.led', 'receiver.mid'];
    const fast = renderScenario(demo(), { taps });
    const general = renderScenario(demo(), { taps, chunkSamples: 1, solver: { generatedSteps: false } });
    expect(fast.report.solver.generatedSteps).toBeGreaterThan(0.99 * (fast.report.solver.transmitterSteps + fast.report.solver.receiverSteps));
    expect(general.report.solver.generatedSteps).toBe(0);
    for (const name of taps) {
      const a = fast.taps.find((t) => t.name === name)!.samples;
      const b = general.taps.find((t) => t.name === name)!.samples;
      expect(a.length).toBe(b.length);
      const peak = b.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
      expect(peak).toBeGreaterThan(0);
      let worst = 0;
      for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
      // Taps are stored as 32-bit floats: allow their rounding.
      expect(worst, name).toBeLessThanOrEqual(1e-6 * peak);
    }
  });
});
