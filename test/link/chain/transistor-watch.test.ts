import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../../src/circuit/index.ts';
import { Bjt } from '../../../src/devices/bjt.ts';
import { updateWatches, watchTransistors } from '../../../src/link/chain/transistor-watch.ts';
import { Simulator } from '../../../src/solver/simulator.ts';

/*
 * The watch's written-out classification against the transistor's own `region`
 * (active, saturation, cut-off, reverse) on solutions drawn at random: NPN and PNP,
 * grounded emitters, internal collector nodes; the solution read in place from a block of rows.
 */
describe('transistor watches', () => {
  it('classify every transistor of the demo receiver as Bjt.region does, sample for sample', () => {
    const circuit = parseCircuitText(readFileSync(new URL('../../../samples/demo-bay/receiver.json', import.meta.url), 'utf8'), 'receiver.json');
    const simulator = new Simulator(circuit);
    const bjts = simulator.system.devices.filter((d): d is Bjt => d instanceof Bjt);
    const size = simulator.system.size;
    fc.assert(
      fc.property(fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: size, maxLength: size }), (volts) => {
        const watches = watchTransistors('receiver', simulator, 1e-5, 0);
        const x = new Float64Array(size + 1);
        x.set(volts);
        // Read in place as a row of a block of solutions, with other rows around it.
        const block = new Float64Array(3 * size).fill(99);
        block.set(volts, size);
        updateWatches(watches, 0, block, size);
        watches.forEach((w, k) => {
          w.saturation.finish();
          w.cutoff.finish();
          const region = bjts[k].region(x);
          expect(w.saturation.count).toBe(region === 'saturation' ? 1 : 0);
          expect(w.cutoff.count).toBe(region === 'cutoff' ? 1 : 0);
        });
      }),
      { numRuns: 300 },
    );
    expect(bjts.some((b) => b.terminals.polarity < 0)).toBe(true);
    expect(bjts.some((b) => b.terminals.emitter < 0)).toBe(true);
  });
});
