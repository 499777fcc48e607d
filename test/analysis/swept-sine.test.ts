import { describe, expect, it } from 'vitest';
import { sweptSineResponse } from '../../src/analysis/swept-sine.ts';
import { expSweep, type SweepOptions } from '../../src/audio/signals/sweep.ts';

const RATE = 48000;

/** dB values of `response` whose excitation frequency lies in [low, high]. */
function within(response: { hertz: Float64Array; db: Float64Array }, low: number, high: number): { hertz: number; db: number }[] {
  const out: { hertz: number; db: number }[] = [];
  response.hertz.forEach((f, i) => {
    if (f >= low && f <= high) out.push({ hertz: f, db: response.db[i] });
  });
  return out;
}

describe('sweptSineResponse', () => {
  it('recovers a one-pole RC low-pass within 0.1 dB over the band (exact response of the discrete filter)', () => {
    const sweep: SweepOptions = { sampleRateHertz: RATE, startHertz: 20, endHertz: 20000, seconds: 2, peakAmplitude: 0.5, fadeSeconds: 0.01 };
    const x = expSweep(sweep);
    // RC low-pass, fc = 1 kHz, by impulse invariance: y[n] = (1 − p)·x[n] + p·y[n−1], p = e^{−2π fc/fs}.
    // Its exact response is |H(e^{jω})| = (1 − p) / |1 − p·e^{−jω}|.
    const p = Math.exp((-2 * Math.PI * 1000) / RATE);
    const recorded = new Float64Array(x.length + RATE / 10);
    let state = 0;
    for (let n = 0; n < recorded.length; n++) {
      state = (1 - p) * (n < x.length ? x[n] : 0) + p * state;
      recorded[n] = state;
    }
    const result = sweptSineResponse(recorded, sweep);
    const points = within(result.linear, 40, 16000);
    expect(points.length).toBeGreaterThan(100);
    let worst = 0;
    for (const { hertz, db } of points) {
      const w = (2 * Math.PI * hertz) / RATE;
      const exact = 20 * Math.log10((1 - p) / Math.hypot(1 - p * Math.cos(w), p * Math.sin(w)));
      worst = Math.max(worst, Math.abs(db - exact));
    }
    expect(worst).toBeLessThan(0.1);
  });

  it('gives the harmonics of y = x + a2·x² + a3·x³: a2/2, a3/4 and a fundamental 1 + 3a3/4 (power-reduction identities)', () => {
    // sin²θ = (1 − cos 2θ)/2 and sin³θ = (3 sin θ − sin 3θ)/4, so a unit sine gives a 2nd harmonic of
    // amplitude a2/2, a 3rd of a3/4, and a fundamental of 1 + 3a3/4.
    const [a2, a3] = [0.1, 0.04];
    const sweep: SweepOptions = { sampleRateHertz: RATE, startHertz: 50, endHertz: 6000, seconds: 3, peakAmplitude: 1, fadeSeconds: 0.02 };
    const x = expSweep(sweep);
    const recorded = new Float64Array(x.length + 2400);
    for (let n = 0; n < x.length; n++) recorded[n] = x[n] + a2 * x[n] ** 2 + a3 * x[n] ** 3;
    const result = sweptSineResponse(recorded, sweep, { harmonicCount: 3 });
    const check = (points: { db: number }[], expectedDb: number) => {
      expect(points.length).toBeGreaterThan(20);
      for (const { db } of points) expect(Math.abs(db - expectedDb)).toBeLessThan(0.1);
    };
    check(within(result.linear, 100, 5000), 20 * Math.log10(1 + (3 * a3) / 4));
    check(within(result.harmonics[0], 100, 2500), 20 * Math.log10(a2 / 2));
    check(within(result.harmonics[1], 100, 1600), 20 * Math.log10(a3 / 4));
    // dBc: relative to the fundamental.
    const hd2 = result.harmonics[0].dbc[Math.floor(result.harmonics[0].dbc.length / 2)];
    expect(hd2).toBeCloseTo(20 * Math.log10(a2 / 2 / (1 + (3 * a3) / 4)), 1);
  });

  it('rejects a recording shorter than the sweep and a window wider than the harmonic gap', () => {
    const sweep: SweepOptions = { sampleRateHertz: RATE, startHertz: 20, endHertz: 20000, seconds: 1, peakAmplitude: 1 };
    expect(() => sweptSineResponse(new Float64Array(100), sweep)).toThrow(/recorded/);
    const x = expSweep(sweep);
    expect(() => sweptSineResponse(x, sweep, { windowSeconds: 0.5 })).toThrow(/windowSeconds/);
  });
});
