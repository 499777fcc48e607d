import { describe, expect, it } from 'vitest';
import { celsiusToKelvin, thermalVoltage } from '../../src/units/constants.ts';
import { circuitOf, transientTrace, type PartEntry } from '../helpers/circuits.ts';
import { besselI } from '../helpers/bessel.ts';
import { harmonicAmplitudes } from '../helpers/dft.ts';

/*
 * Large-signal distortion of the exponential transistor law, through the
 * whole engine (parser, transient, probes). The circuits have no reactive
 * parts, so every step is an exact DC solution at its sample time and one
 * coherent period of samples gives the Fourier coefficients to rounding
 * (harmonics above N/2 alias, but I_n(x) for n ≈ 30 is below 1e-40 here).
 */

const CELSIUS = 27;
const VT = thermalVoltage(celsiusToKelvin(CELSIUS));
const HERTZ = 1000;
const SAMPLES = 64;

/** No Early effect, no capacitances: ic = Is·e^(vbe/VT) + constants when vbc ≪ 0. */
const MODELS = { ideal: { kind: 'npn', saturationCurrent: 1e-14, forwardBeta: 100 } };

function collectorHarmonics(parts: PartEntry[], probe: string): Float64Array {
  const circuit = circuitOf(parts, { temperature: CELSIUS, models: MODELS });
  const trace = transientTrace(circuit, { stopSeconds: 1 / HERTZ, stepSeconds: 1 / HERTZ / SAMPLES, mode: 'fixed' }, [probe]);
  // Samples 1..N span exactly one period after the start.
  return harmonicAmplitudes(trace.values[probe].slice(1), 4);
}

describe('modified Bessel reference (test helper)', () => {
  it('sums to e^(x cos θ) by the generating function (Abramowitz & Stegun 9.6.34) and gives I0(1) = 1.266065878 (A&S table 9.8, from memory)', () => {
    for (const x of [0.1, 0.7, 2]) {
      for (const theta of [0, 0.3, 1.1, 2.5, Math.PI]) {
        let sum = besselI(0, x);
        for (let n = 1; n < 40; n++) sum += 2 * besselI(n, x) * Math.cos(n * theta);
        expect(sum).toBeCloseTo(Math.exp(x * Math.cos(theta)), 13);
      }
    }
    expect(besselI(0, 1)).toBeCloseTo(1.266065878, 9);
  });
});

describe('single-ended transistor driven on vbe by a sine of amplitude v', () => {
  /*
   * ic = Is·exp(VBE/VT)·exp(x·sin θ), x = v/VT, and from the generating
   * function e^(x cos θ) = I0(x) + 2·Σ In(x)·cos nθ (Abramowitz & Stegun
   * 9.6.34) the n-th harmonic over the fundamental is exactly In(x)/I1(x);
   * its leading terms are HD2 ≈ x/4 and HD3 ≈ x²/24 (Gray, Hurst, Lewis &
   * Meyer, Analysis and Design of Analog Integrated Circuits, ch. 5).
   */
  const drives = [
    { label: 'x = 0.1', volts: 0.1 * VT },
    { label: 'x = 0.2', volts: 0.2 * VT },
    { label: 'v = 10 mV', volts: 0.01 },
  ];
  for (const { label, volts } of drives) {
    it(`${label}: HD2 = I2(x)/I1(x) and HD3 = I3(x)/I1(x) within 1e-4 relative`, () => {
      const amplitudes = collectorHarmonics(
        [
          { ref: 'VC', kind: 'voltage-source', pins: ['c', 'gnd'], dc: 5 },
          { ref: 'VB', kind: 'voltage-source', pins: ['b', 'gnd'], dc: 0.65, wave: { shape: 'sine', amplitude: volts, frequency: HERTZ } },
          { ref: 'Q1', kind: 'npn', pins: ['c', 'b', 'gnd'], model: 'ideal' },
        ],
        'Q1.collector',
      );
      const x = volts / VT;
      const hd2 = amplitudes[2] / amplitudes[1];
      const hd3 = amplitudes[3] / amplitudes[1];
      const want2 = besselI(2, x) / besselI(1, x);
      const want3 = besselI(3, x) / besselI(1, x);
      // Measured errors ≈ 3e-11 (Newton tolerance and rounding only).
      expect(Math.abs(hd2 / want2 - 1)).toBeLessThan(1e-4);
      expect(Math.abs(hd3 / want3 - 1)).toBeLessThan(1e-4);
      // The textbook leading terms agree to O(x²) relative.
      expect(Math.abs(hd2 / (x / 4) - 1)).toBeLessThan(x * x);
      expect(Math.abs(hd3 / ((x * x) / 24) - 1)).toBeLessThan(x * x);
    });
  }
});

/** Fourier cosine coefficient n of tanh(x·cos θ / 2), by the trapezoidal rule (spectrally accurate for a smooth periodic function). */
function tanhCoefficient(n: number, x: number): number {
  const points = 1024;
  let sum = 0;
  for (let i = 0; i < points; i++) {
    const theta = (2 * Math.PI * i) / points;
    sum += Math.tanh((x * Math.cos(theta)) / 2) * Math.cos(n * theta);
  }
  return (2 * sum) / points;
}

describe('differential pair with a tail current source, driven ±v/2', () => {
  /*
   * Equal transistors, no Early effect: ic1 = α·I_EE/(1 + e^(−vid/VT)) =
   * (α·I_EE/2)·(1 + tanh(vid/(2VT))), so HD3 = b3/b1 of tanh(x·cos θ/2),
   * x = v/VT (v the peak differential drive); leading term x²/48 and no even
   * harmonics (Gray, Hurst, Lewis & Meyer, ch. 5).
   */
  for (const millivolts of [10, 20]) {
    it(`v = ${millivolts} mV: HD3 equals the tanh transfer's within 1e-4 relative, and HD2 vanishes`, () => {
      const volts = millivolts / 1000;
      const amplitudes = collectorHarmonics(
        [
          { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 5 },
          { ref: 'V1', kind: 'voltage-source', pins: ['b1', 'gnd'], wave: { shape: 'sine', amplitude: volts / 2, frequency: HERTZ } },
          { ref: 'V2', kind: 'voltage-source', pins: ['b2', 'gnd'], wave: { shape: 'sine', amplitude: volts / 2, frequency: HERTZ, phase: 180 } },
          { ref: 'Q1', kind: 'npn', pins: ['vcc', 'b1', 'tail'], model: 'ideal' },
          { ref: 'Q2', kind: 'npn', pins: ['vcc', 'b2', 'tail'], model: 'ideal' },
          { ref: 'IEE', kind: 'current-source', pins: ['tail', 'gnd'], dc: 1e-3 },
        ],
        'Q1.collector',
      );
      const x = volts / VT;
      const hd3 = amplitudes[3] / amplitudes[1];
      const want = Math.abs(tanhCoefficient(3, x) / tanhCoefficient(1, x));
      expect(Math.abs(hd3 / want - 1)).toBeLessThan(1e-4);
      expect(amplitudes[2] / amplitudes[1]).toBeLessThan(1e-9);
      // Leading term x²/48 (Gray et al.), good to about x²/8 relative.
      expect(Math.abs(hd3 / ((x * x) / 48) - 1)).toBeLessThan((x * x) / 8);
      // The fundamental is α·I_EE/2·(2·b1): α = βF/(βF + 1).
      expect(amplitudes[1]).toBeCloseTo((100 / 101) * 0.5e-3 * tanhCoefficient(1, x), 12);
    });
  }
});
