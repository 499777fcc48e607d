import { describe, expect, it } from 'vitest';
import { LedOptics, checkLedOpticsSettings, ledWattsPerAmpere } from '../../src/link/led-optics.ts';
import { photonEnergyVolts } from '../../src/units/constants.ts';

describe('LED optics', () => {
  // E = h·c/(λ·q) with the exact SI 2019 constants (BIPM SI Brochure, 9th ed.), evaluated by hand:
  // 6.62607015e-34 · 299792458 / (630e-9 · 1.602176634e-19) = 1.9680031 eV.
  it('gives a 630 nm photon 1.968003 eV', () => {
    expect(photonEnergyVolts(630e-9)).toBeCloseTo(1.968003, 6);
  });

  // P = η·(hc/λq)·I: 0.1 × 1.968003 V × 1 mA = 0.1968003 mW.
  it('emits 0.196800 mW per mA at η = 0.1 and 630 nm', () => {
    const led = new LedOptics({ externalQuantumEfficiency: 0.1, wavelengthMetres: 630e-9 });
    const watts = new Float64Array(3);
    led.process(Float64Array.from([1e-3, 20e-3, 0.5e-3]), watts);
    expect(watts[0] / 1e-3).toBeCloseTo(0.1968003, 7);
    expect(Math.abs(watts[1] / (20 * 0.19680031497e-3) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(watts[2] / (0.5 * 0.19680031497e-3) - 1)).toBeLessThan(1e-9);
    expect(ledWattsPerAmpere({ externalQuantumEfficiency: 0.1, wavelengthMetres: 630e-9 })).toBeCloseTo(0.19680031497, 10);
  });

  // An LED below zero current is reverse biased and does not emit (the one-sided cutoff of the link).
  it('emits nothing for zero or reverse current', () => {
    const led = new LedOptics({ externalQuantumEfficiency: 0.2, wavelengthMetres: 460e-9 });
    const watts = new Float64Array(2).fill(Number.NaN);
    led.process(Float64Array.from([0, -1e-6]), watts);
    expect(Array.from(watts)).toEqual([0, 0]);
  });

  it('refuses a wavelength given in nanometres and an efficiency above 1, naming the field', () => {
    expect(() => checkLedOpticsSettings({ externalQuantumEfficiency: 0.1, wavelengthMetres: 630 })).toThrow(
      /led\.wavelengthMetres: got 630; expected a wavelength from 1e-7 to 1e-5 metres/,
    );
    expect(() => checkLedOpticsSettings({ externalQuantumEfficiency: 1.2, wavelengthMetres: 630e-9 })).toThrow(
      /led\.externalQuantumEfficiency: got 1.2/,
    );
  });
});
