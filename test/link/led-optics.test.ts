import { describe, expect, it } from 'vitest';
import { parseCircuit } from '../../src/circuit/index.ts';
import { Diode } from '../../src/devices/diode.ts';
import { Simulator } from '../../src/solver/simulator.ts';
import { photonEnergyVolts } from '../../src/units/constants.ts';

/** An LED of η = 0.1 at 630 nm driven by a current source (the transmitter's LED model). */
function led(amperes: number): { device: Diode; x: Float64Array } {
  const simulator = new Simulator(
    parseCircuit({
      format: 'glowtalk.circuit/1',
      models: { red: { kind: 'led', saturationCurrent: 1e-18, emissionCoefficient: 2, wavelength: '630n', quantumEfficiency: 0.1 } },
      parts: [
        { ref: 'I1', kind: 'current-source', pins: ['gnd', 'a'], dc: amperes },
        { ref: 'D1', kind: 'led', pins: ['a', 'gnd'], model: 'red' },
      ],
    }),
  );
  simulator.operatingPoint();
  return { device: simulator.system.devicesByRef.get('D1') as Diode, x: simulator.x };
}

describe('the LED as a light source', () => {
  // E = h·c/(λ·q) with the exact SI 2019 constants (BIPM SI Brochure, 9th ed.), evaluated by hand:
  // 6.62607015e-34 · 299792458 / (630e-9 · 1.602176634e-19) = 1.9680031 eV.
  it('gives a 630 nm photon 1.968003 eV', () => {
    expect(photonEnergyVolts(630e-9)).toBeCloseTo(1.968003, 6);
  });

  // P = η·(hc/λq)·I: 0.1 × 1.968003 V × 1 mA = 0.1968003 mW.
  it('emits 0.196800 mW per mA of junction current at η = 0.1 and 630 nm', () => {
    for (const amperes of [0.5e-3, 1e-3, 20e-3]) {
      const { device, x } = led(amperes);
      expect(device.wattsPerAmpere).toBeCloseTo(0.19680031497, 10);
      expect(Math.abs(device.opticalWatts(x) / (device.junctionCurrent(x) * 0.19680031497) - 1)).toBeLessThan(1e-9);
      expect(Math.abs(device.junctionCurrent(x) / amperes - 1)).toBeLessThan(1e-6);
      // Read in place from a row of a block of solutions, as the transmitter stage does.
      const block = new Float64Array(3 * x.length).fill(7);
      block.set(x, x.length);
      expect(device.junctionCurrent(block, x.length)).toBe(device.junctionCurrent(x));
    }
  });

  // An LED below zero current is reverse biased and does not emit (the one-sided cutoff of the link).
  it('emits nothing for a reverse current', () => {
    const { device, x } = led(-1e-6);
    expect(device.junctionCurrent(x)).toBeLessThan(0);
    expect(device.opticalWatts(x)).toBe(0);
  });
});
