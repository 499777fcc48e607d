import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { biasPoint, type PartBias } from '../../src/solver/bias-report.ts';
import { circuitOf, transientTrace } from '../helpers/circuits.ts';
import { networkParts, networkSpec } from '../helpers/random-network.ts';

/*
 * Invariants that hold for every circuit: Kirchhoff's current law at every
 * node, Tellegen's theorem (Σ v·i = 0 over all branches; Tellegen, Philips
 * Research Reports 7, 1952) with every passive part absorbing power, and the
 * energy balance of an RC charged through its resistor.
 */

const RUNS = { seed: 7_041_952, numRuns: 100 };

type TwoTerminalBias = { voltage: number; current: number };

function twoTerminal(bias: PartBias): TwoTerminalBias {
  if (!('voltage' in bias)) throw new Error('expected a two-terminal part');
  return bias;
}

describe('random resistor / source / diode networks at their DC operating point', () => {
  it("satisfy Kirchhoff's current law at every node to 1e-9 A (currents from the bias report, into pins[0], out of pins[1])", () => {
    fc.assert(
      fc.property(networkSpec, (spec) => {
        const { parts, models } = networkParts(spec);
        const report = biasPoint(circuitOf(parts, { models }));
        const leaving = new Map<string, number>();
        for (const part of parts) {
          const { current } = twoTerminal(report.parts[part.ref]);
          expect(Number.isFinite(current)).toBe(true);
          leaving.set(part.pins[0], (leaving.get(part.pins[0]) ?? 0) + current);
          leaving.set(part.pins[1], (leaving.get(part.pins[1]) ?? 0) - current);
        }
        for (const [node, sum] of leaving) if (node !== 'gnd') expect(Math.abs(sum)).toBeLessThan(1e-9);
        // Ground closes the books: what leaves every other node arrives there.
        expect(Math.abs(leaving.get('gnd') ?? 0)).toBeLessThan(1e-9 * parts.length);
      }),
      RUNS,
    );
  });

  it('every passive part absorbs power ≥ 0 and the sources deliver what the parts absorb to 1e-9 relative (Tellegen)', () => {
    fc.assert(
      fc.property(networkSpec, (spec) => {
        const { parts, models } = networkParts(spec);
        const report = biasPoint(circuitOf(parts, { models }));
        let absorbed = 0;
        let delivered = 0;
        for (const part of parts) {
          const { voltage, current } = twoTerminal(report.parts[part.ref]);
          const power = voltage * current;
          if (part.kind === 'resistor' || part.kind === 'diode') {
            expect(power).toBeGreaterThanOrEqual(0);
            absorbed += power;
          } else {
            delivered -= power;
          }
        }
        expect(Math.abs(delivered - absorbed)).toBeLessThanOrEqual(1e-9 * Math.max(absorbed, delivered) + 1e-15);
      }),
      RUNS,
    );
  });
});

describe('energy in an RC charged from a piecewise-linear source', () => {
  it('the energy delivered by the source up to t is ≥ ½CV² and equals ½CV² plus the resistor heat to the integration error', () => {
    const spec = fc.record({
      ohms: fc.double({ min: 100, max: 1e4, noNaN: true }),
      farads: fc.double({ min: 1e-9, max: 1e-6, noNaN: true }),
      levels: fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: 3, maxLength: 3 }),
    });
    fc.assert(
      fc.property(spec, ({ ohms, farads, levels }) => {
        const tau = ohms * farads;
        // Corners at τ, 2τ, 3τ (on the output grid); 0 V at t = 0 so nothing is stored at the start.
        const points = [[0, 0], ...levels.map((v, i) => [(i + 1) * tau, v])];
        const circuit = circuitOf([
          { ref: 'V1', kind: 'voltage-source', pins: ['in', 'gnd'], wave: { shape: 'points', points } },
          { ref: 'R1', kind: 'resistor', pins: ['in', 'out'], value: ohms },
          { ref: 'C1', kind: 'capacitor', pins: ['out', 'gnd'], value: farads },
        ]);
        const h = tau / 40;
        const trace = transientTrace(circuit, { stopSeconds: 5 * tau, stepSeconds: h, mode: 'fixed' }, ['in', 'out', 'V1', 'R1']);
        const { in: vin, out, V1: sourceCurrent, R1: resistorCurrent } = trace.values;
        let source = 0;
        let heat = 0;
        const balance: Array<{ source: number; heat: number; stored: number }> = [];
        for (let n = 1; n < trace.seconds.length; n++) {
          // Trapezoidal quadrature of p = −v·i (source) and i²R on the output grid.
          source += (h / 2) * (-vin[n] * sourceCurrent[n] - vin[n - 1] * sourceCurrent[n - 1]);
          heat += (h / 2) * ohms * (resistorCurrent[n] ** 2 + resistorCurrent[n - 1] ** 2);
          balance.push({ source, heat, stored: 0.5 * farads * out[n] ** 2 });
        }
        // Errors relative to the largest energy of the run; below 1e-24 J it is rounding.
        const scale = Math.max(1e-24, ...balance.map((b) => Math.max(b.source, b.heat, b.stored)));
        for (const b of balance) {
          expect(b.source).toBeGreaterThanOrEqual(b.stored - 1e-12 * scale);
          // Second-order error of TR and of the quadrature: measured up to 6.0e-4 at h = τ/40, 1.5e-4 at τ/80.
          expect(Math.abs(b.source - b.stored - b.heat)).toBeLessThanOrEqual(1e-3 * scale);
        }
      }),
      { seed: 1952, numRuns: 20 },
    );
  });
});
