import { describe, expect, it } from 'vitest';
import { JUNCTION_GMIN_SIEMENS } from '../../src/devices/device.ts';
import { biasPoint } from '../../src/solver/bias-report.ts';
import type { LinearAlgebra } from '../../src/solver/system.ts';
import { circuitOf, celsiusFor } from '../helpers/circuits.ts';
import { lambertW0, lambertW0OfExp, seriesDiodeCurrent } from '../helpers/lambert-w.ts';

// Exact SI 2019 defining constants (BIPM, The International System of Units, 9th ed., 2019).
const BOLTZMANN = 1.380649e-23;
const CHARGE = 1.602176634e-19;

describe('Lambert W reference (test helper)', () => {
  it('W0(1) is the omega constant and W0(e) = 1 (Corless et al., Adv. Comput. Math. 5, 1996)', () => {
    // Ω = 0.5671432904097838… (Corless et al. 1996, from memory), checked below by its defining equation too.
    expect(lambertW0(1)).toBeCloseTo(0.5671432904097838, 15);
    expect(lambertW0(Math.E)).toBeCloseTo(1, 15);
  });

  it('satisfies w + ln w = y from y = −30 to y = 5000 without overflow', () => {
    for (const y of [-30, -5, -1, 0, 0.5, 1, 3, 10, 100, 700, 5000]) {
      const w = lambertW0OfExp(y);
      expect(Number.isFinite(w)).toBe(true);
      expect(Math.abs(w + Math.log(w) - y)).toBeLessThanOrEqual(1e-14 * Math.max(1, Math.abs(y)));
    }
  });
});

/**
 * A source V through R into a diode, against the exact solution of Banwell &
 * Jayakumar, Electronics Letters 36(4), 2000 (see test/helpers/lambert-w.ts).
 * The engine puts a fixed 1e-12 S (JUNCTION_GMIN_SIEMENS) across every
 * junction; it is folded into the reference exactly by Thevenin's theorem
 * (V' = V/(1 + gR), R' = R/(1 + gR) seen by the junction), so the check is of
 * the solver, not of an approximation. Without the fold the reference would
 * differ by g·Vd/I ≈ 1e-8 at 0.5 V, the size of the tolerance.
 */
function reference(volts: number, ohms: number, saturationAmperes: number, emissionVolts: number) {
  const g = JUNCTION_GMIN_SIEMENS;
  const theveninVolts = volts / (1 + g * ohms);
  const theveninOhms = ohms / (1 + g * ohms);
  const junction = seriesDiodeCurrent(theveninVolts, theveninOhms, saturationAmperes, emissionVolts);
  const diodeVolts = junction.diodeVolts;
  return { diodeVolts, amperes: (volts - diodeVolts) / ohms };
}

const KELVIN = 300;
const CELSIUS = celsiusFor(KELVIN);
// VT from the same kelvin value the engine computes from the file's Celsius temperature.
const VT = (BOLTZMANN * (CELSIUS + 273.15)) / CHARGE;

const CASES = [
  { volts: 0.5, ohms: 1e3, saturationAmperes: 1e-12, emission: 1 },
  { volts: 1, ohms: 1e3, saturationAmperes: 1e-12, emission: 1 },
  { volts: 5, ohms: 1e3, saturationAmperes: 1e-12, emission: 1 },
  { volts: 5, ohms: 1e3, saturationAmperes: 2.52e-9, emission: 1.75 },
  { volts: 0.5, ohms: 1e3, saturationAmperes: 2.52e-9, emission: 1.75 },
];

const RELATIVE = 1e-8;

function relativeError(got: number, want: number): number {
  return Math.abs(got - want) / Math.abs(want);
}

describe('diode with series resistor, DC operating point (the `glowtalk bias` code path)', () => {
  for (const linearAlgebra of ['sparse', 'dense'] as LinearAlgebra[]) {
    for (const c of CASES) {
      it(`V = ${c.volts} V, R = 1 kΩ, Is = ${c.saturationAmperes} A, n = ${c.emission}: current and diode voltage within 1e-8 of the Lambert-W solution (${linearAlgebra} LU)`, () => {
        const circuit = circuitOf(
          [
            { ref: 'V1', kind: 'voltage-source', pins: ['supply', 'gnd'], dc: c.volts },
            { ref: 'R1', kind: 'resistor', pins: ['supply', 'anode'], value: c.ohms },
            { ref: 'D1', kind: 'diode', pins: ['anode', 'gnd'], model: 'd' },
          ],
          { temperature: CELSIUS, models: { d: { saturationCurrent: c.saturationAmperes, emissionCoefficient: c.emission } } },
        );
        const want = reference(c.volts, c.ohms, c.saturationAmperes, c.emission * VT);
        const report = biasPoint(circuit, { linearAlgebra });
        const diode = report.parts.D1 as { voltage: number; current: number };
        const resistor = report.parts.R1 as { voltage: number; current: number };
        expect(relativeError(diode.voltage, want.diodeVolts)).toBeLessThan(RELATIVE);
        expect(relativeError(diode.current, want.amperes)).toBeLessThan(RELATIVE);
        expect(relativeError(resistor.current, want.amperes)).toBeLessThan(RELATIVE);
        expect(relativeError(report.nodes.anode, want.diodeVolts)).toBeLessThan(RELATIVE);
      });
    }
  }

  it('a model series resistance (internal node) gives the same exact solution as an external resistor', () => {
    const circuit = circuitOf(
      [
        { ref: 'V1', kind: 'voltage-source', pins: ['supply', 'gnd'], dc: 2 },
        { ref: 'D1', kind: 'diode', pins: ['supply', 'gnd'], model: 'd' },
      ],
      { temperature: CELSIUS, models: { d: { saturationCurrent: 1e-12, seriesResistance: 1000 } } },
    );
    const want = reference(2, 1000, 1e-12, VT);
    const diode = biasPoint(circuit).parts.D1 as { voltage: number; current: number };
    expect(relativeError(diode.current, want.amperes)).toBeLessThan(RELATIVE);
  });
});
