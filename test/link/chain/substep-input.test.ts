import { describe, expect, it } from 'vitest';
import { SubstepInput, substepHoldback } from '../../../src/link/chain/substep-input.ts';

/** Feeds `signal` in chunks of the given sizes; returns every input value handed on, in order. */
function feed(input: SubstepInput, signal: Float64Array, chunks: number[]): number[] {
  const out: number[] = [];
  const block = new Float64Array(4096 * input.substeps);
  let at = 0;
  for (let c = 0; at < signal.length; c++) {
    const m = Math.min(chunks[c % chunks.length], signal.length - at);
    const handed = input.process(signal.subarray(at, at + m), m, block);
    for (let i = 0; i < handed * input.substeps; i++) out.push(block[i]);
    at += m;
  }
  return out;
}

describe('inputs between internal samples (8-point Lagrange, Abramowitz & Stegun 25.2.2)', () => {
  it('passes samples straight through with one step per sample, without holding any back', () => {
    const input = new SubstepInput(1, 4, 0, 4096);
    const signal = Float64Array.from({ length: 100 }, (_, i) => Math.sin(i));
    expect(input.holdbackSamples).toBe(0);
    expect(feed(input, signal, [7, 30])).toEqual([...signal]);
  });

  it('reproduces a polynomial of degree 7 between its samples exactly (to rounding), the samples themselves bit for bit', () => {
    // Lagrange interpolation through 8 points is exact for polynomials up to degree 7 (A&S 25.2.2).
    const p = (t: number): number => 0.3 - 0.2 * t + 0.05 * t ** 2 + 1e-3 * t ** 3 - 2e-4 * t ** 4 + 1e-5 * t ** 5 - 3e-7 * t ** 6 + 4e-9 * t ** 7;
    const substeps = 4;
    const length = 60;
    const signal = Float64Array.from({ length }, (_, i) => p(i));
    const input = new SubstepInput(substeps, 4, 0, 4096);
    const out = feed(input, signal, [length]);
    // Sample e is handed on once e + 4 has arrived; from sample 4 on every point it uses is real.
    for (let e = 4; e < length - 4; e++) {
      for (let j = 1; j <= substeps; j++) {
        const t = e - 1 + j / substeps;
        expect(Math.abs(out[e * substeps + j - 1] - p(t))).toBeLessThan(1e-12 * Math.max(1, Math.abs(p(t))));
      }
      expect(out[e * substeps + substeps - 1]).toBe(signal[e]);
    }
  });

  it('interpolates a band-limited tone at 4× oversampling (its highest audio frequency, 0.45 × 48 kHz at 192 kHz) within 1e-4 of its amplitude', () => {
    const rate = 192_000;
    const hertz = 0.45 * 48_000;
    const tone = (t: number): number => Math.sin((2 * Math.PI * hertz * t) / rate + 0.4);
    const substeps = 8;
    const signal = Float64Array.from({ length: 400 }, (_, i) => tone(i));
    const out = feed(new SubstepInput(substeps, 4, tone(-1), 4096), signal, [64]);
    let worst = 0;
    for (let e = 8; e < 380; e++) for (let j = 1; j < substeps; j++) worst = Math.max(worst, Math.abs(out[e * substeps + j - 1] - tone(e - 1 + j / substeps)));
    expect(worst).toBeLessThan(1e-4);
  });

  it('hands on the same values whatever the chunk sizes, and holds back exactly its look-ahead', () => {
    const signal = Float64Array.from({ length: 1000 }, (_, i) => Math.sin(0.05 * i) + 0.3 * Math.cos(0.31 * i));
    const holdback = substepHoldback(4);
    const whole = feed(new SubstepInput(3, holdback, 0.2, 4096), signal, [1000]);
    const pieces = feed(new SubstepInput(3, holdback, 0.2, 4096), signal, [1, 7, 64, 3, 500]);
    expect(pieces).toEqual(whole);
    expect(whole.length).toBe((signal.length - holdback) * 3);
  });

  it('starts from the resting value the circuit was solved at', () => {
    const out = feed(new SubstepInput(2, 4, 1.5, 4096), new Float64Array(20).fill(1.5), [20]);
    for (const v of out) expect(v).toBeCloseTo(1.5, 14);
  });

  it('keeps whole audio samples of look-ahead: 4 internal samples at 2× and 4×, 8 at 8×', () => {
    expect([2, 4, 8].map(substepHoldback)).toEqual([4, 4, 8]);
  });
});
