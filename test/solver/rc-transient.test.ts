import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../src/circuit/index.ts';
import type { Circuit } from '../../src/circuit/types.ts';
import { circuitOf, transientTrace } from '../helpers/circuits.ts';
import { harmonicPhasor } from '../helpers/dft.ts';

/*
 * First-order RC circuits against their analytic responses (any circuits
 * textbook; e.g. Nilsson & Riedel, "Electric Circuits", the first-order RC
 * step and sinusoidal responses), and the integration rules against their
 * textbook properties (Lambert, "Numerical Methods for Ordinary Differential
 * Systems", Wiley 1991: order of accuracy and one-step amplification factors).
 * After the DC point and after every drive corner the engine takes one
 * backward-Euler step before switching to TR or BDF2; one BE step has local
 * error O(h²), so the global error stays second order.
 */

const R = 1000;
const C = 1e-6;
const TAU = R * C;

/** Unit step at t = 0+: a points drive from 0 V to 1 V within 1e-15 s (a corner the solver lands on). */
function rcStep(from: number, to: number): Circuit {
  return circuitOf([
    { ref: 'V1', kind: 'voltage-source', pins: ['in', 'gnd'], wave: { shape: 'points', points: [[0, from], [1e-15, to]] } },
    { ref: 'R1', kind: 'resistor', pins: ['in', 'out'], value: R },
    { ref: 'C1', kind: 'capacitor', pins: ['out', 'gnd'], value: C },
  ]);
}

/** Error at t = τ of the RC charging curve v = 1 − e^(−t/τ). */
function stepErrorAtTau(method: 'tr' | 'bdf2', stepsPerTau: number): number {
  const trace = transientTrace(rcStep(0, 1), { stopSeconds: TAU, stepSeconds: TAU / stepsPerTau, mode: 'fixed' }, ['out'], { method });
  const v = trace.values.out;
  expect(trace.seconds.at(-1)).toBeCloseTo(TAU, 15);
  return v.at(-1)! - (1 - Math.exp(-1));
}

describe('RC step response (analytic v = 1 − e^(−t/τ); Nilsson & Riedel, first-order RC response)', () => {
  for (const method of ['tr', 'bdf2'] as const) {
    it(`${method}: halving the fixed step divides the error at t = τ by 4 within 10 % (second order)`, () => {
      const errors = [10, 20, 40].map((k) => stepErrorAtTau(method, k));
      // Measured: TR −1.45e-3, −3.72e-4, −9.44e-5; BDF2 −1.67e-3, −3.97e-4, −9.74e-5.
      expect(Math.abs(errors[0])).toBeLessThan(3e-3);
      for (let i = 1; i < errors.length; i++) {
        const ratio = errors[i - 1] / errors[i];
        expect(ratio).toBeGreaterThan(3.6);
        expect(ratio).toBeLessThan(4.4);
      }
    });

    it(`${method}: adaptive steps follow the analytic curve within 1e-4 at truncationRelative = 1e-6 and within 1e-3 by default`, () => {
      for (const [relative, bound] of [
        [undefined, 1e-3],
        [1e-6, 1e-4],
      ] as const) {
        const trace = transientTrace(
          rcStep(0, 1),
          { stopSeconds: 2 * TAU, stepSeconds: TAU / 10, mode: 'adaptive', truncationRelative: relative },
          ['out'],
          { method },
        );
        expect(trace.seconds.length).toBe(21);
        let worst = 0;
        trace.seconds.forEach((t, i) => (worst = Math.max(worst, Math.abs(trace.values.out[i] - (1 - Math.exp(-t / TAU))))));
        // Measured worst: TR 1.8e-4 / 2.6e-5, BDF2 4.0e-4 / 5.3e-5.
        expect(worst).toBeLessThan(bound);
      }
    });
  }
});

describe('one-step amplification factors on y′ = λy, λ = −1/τ, h = τ/10 (Lambert 1991, ch. 3)', () => {
  // Discharging RC after a step from 1 V to 0 V: y = v_C obeys y′ = −y/τ exactly.
  const h = TAU / 10;
  const hl = -h / TAU;

  it('the first step is backward Euler, 1/(1 − hλ); every later TR step is (1 + hλ/2)/(1 − hλ/2)', () => {
    const trace = transientTrace(rcStep(1, 0), { stopSeconds: TAU, stepSeconds: h, mode: 'fixed' }, ['out'], { method: 'tr' });
    const y = trace.values.out;
    expect(y[0]).toBe(1);
    expect(y[1] / y[0]).toBeCloseTo(1 / (1 - hl), 12);
    for (let n = 2; n < y.length; n++) expect(y[n] / y[n - 1]).toBeCloseTo((1 + hl / 2) / (1 - hl / 2), 12);
  });

  it('after the BE start, BDF2 satisfies its recurrence 3y₊ − 4y + y₋ = 2hλ·y₊ at every step', () => {
    const trace = transientTrace(rcStep(1, 0), { stopSeconds: TAU, stepSeconds: h, mode: 'fixed' }, ['out'], { method: 'bdf2' });
    const y = trace.values.out;
    expect(y[1] / y[0]).toBeCloseTo(1 / (1 - hl), 12);
    for (let n = 2; n < y.length; n++) expect(3 * y[n] - 4 * y[n - 1] + y[n - 2] - 2 * hl * y[n]).toBeCloseTo(0, 12);
  });
});

describe('RC low-pass sample driven by a 1 kHz sine (samples/circuits/rc-low-pass.json)', () => {
  const circuit = parseCircuitText(readFileSync(new URL('../../samples/circuits/rc-low-pass.json', import.meta.url), 'utf8'));
  const ohms = 3300;
  const farads = 47e-9;
  const tau = ohms * farads;
  const hertz = 1000;
  const omega = 2 * Math.PI * hertz;

  /** Full response from v(0) = 0 to 1·sin ωt: steady state plus the decaying start (Nilsson & Riedel). */
  const exact = (t: number) =>
    (Math.sin(omega * t) - omega * tau * Math.cos(omega * t) + omega * tau * Math.exp(-t / tau)) / (1 + (omega * tau) ** 2);

  /** Amplitude and phase lag of the third period (a coherent one-period DFT; the start has decayed by e^(−13)). */
  function thirdPeriod(method: 'tr' | 'bdf2', samplesPerPeriod: number) {
    const trace = transientTrace(circuit, { stopSeconds: 3 / hertz, stepSeconds: 1 / hertz / samplesPerPeriod, mode: 'fixed' }, ['out'], { method });
    const out = trace.values.out;
    let worst = 0;
    trace.seconds.forEach((t, i) => (worst = Math.max(worst, Math.abs(out[i] - exact(t)))));
    const p = harmonicPhasor(out.slice(2 * samplesPerPeriod, 3 * samplesPerPeriod), 1);
    // One-period DFT of sin(θ − φ) is −i·e^(−iφ), so φ = −π/2 − arg.
    return { amplitude: Math.hypot(p.re, p.im), lag: -Math.PI / 2 - Math.atan2(p.im, p.re), worst };
  }

  it('follows the analytic response within 2e-3 V at 100 fixed steps per period (TR)', () => {
    // Measured 1.8e-3 (TR); includes the BE start.
    expect(thirdPeriod('tr', 100).worst).toBeLessThan(2e-3);
  });

  for (const method of ['tr', 'bdf2'] as const) {
    it(`${method}: steady-state amplitude and phase errors fall by 4 (±10 %) when the step halves`, () => {
      const wantAmplitude = 1 / Math.sqrt(1 + (omega * tau) ** 2);
      const wantLag = Math.atan(omega * tau);
      const runs = [50, 100, 200].map((n) => thirdPeriod(method, n));
      const amplitudeErrors = runs.map((r) => r.amplitude - wantAmplitude);
      const lagErrors = runs.map((r) => r.lag - wantLag);
      // Measured relative amplitude errors at 50/100/200 steps: TR −6.42e-4, −1.60e-4, −4.01e-5; BDF2 −2.79e-3, −6.71e-4, −1.64e-4.
      for (let i = 1; i < runs.length; i++) {
        for (const errors of [amplitudeErrors, lagErrors]) {
          const ratio = errors[i - 1] / errors[i];
          expect(ratio).toBeGreaterThan(3.6);
          expect(ratio).toBeLessThan(4.4);
        }
      }
    });
  }

  it('TR in steady state equals the bilinear-transform response 1/(1 + iτ·(2/h)·tan(ωh/2)) (Oppenheim & Schafer, Discrete-Time Signal Processing, bilinear transformation)', () => {
    const n = 50;
    const h = 1 / hertz / n;
    const warped = (2 / h) * Math.tan((omega * h) / 2);
    const run = thirdPeriod('tr', n);
    expect(run.amplitude).toBeCloseTo(1 / Math.sqrt(1 + (warped * tau) ** 2), 5);
    expect(run.lag).toBeCloseTo(Math.atan(warped * tau), 5);
  });

  it('adaptive mode matches the analytic response within 1e-4 V at truncationRelative = 1e-6 (TR and BDF2)', () => {
    for (const method of ['tr', 'bdf2'] as const) {
      const trace = transientTrace(
        circuit,
        { stopSeconds: 3 / hertz, stepSeconds: 1 / hertz / 50, mode: 'adaptive', truncationRelative: 1e-6 },
        ['out'],
        { method },
      );
      let worst = 0;
      trace.seconds.forEach((t, i) => (worst = Math.max(worst, Math.abs(trace.values.out[i] - exact(t)))));
      // Measured 3.0e-5 (TR), 6.3e-5 (BDF2).
      expect(worst).toBeLessThan(1e-4);
    }
  });
});
