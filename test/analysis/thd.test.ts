import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.ts';
import { thd } from '../../src/analysis/thd.ts';
import { fourierFacts } from './fourier-reference.ts';

const RATE = 48000;
const LENGTH = 1 << 18;

/** Samples of g(θ) at θ = 2π·f·n/rate. */
function sampled(g: (theta: number) => number, hertz: number, length = LENGTH, rate = RATE): Float64Array {
  const x = new Float64Array(length);
  for (let n = 0; n < length; n++) x[n] = g((2 * Math.PI * hertz * n) / rate);
  return x;
}

/**
 * Unit sine hard-clipped at ±L. Our own derivation, θ0 = arcsin L, quarter-wave symmetry:
 * b_n = (4/π)[∫_0^θ0 sin θ sin nθ dθ + L∫_θ0^{π/2} sin nθ dθ], giving for odd n
 * b1 = (2/π)(θ0 + sinθ0·cosθ0) and mean square (2/π)[θ0/2 − sin2θ0/4 + L²(π/2 − θ0)];
 * both are checked below against direct numerical integration as well.
 */
function clipClosedForm(level: number): { b1: number; thd: number } {
  const t0 = Math.asin(level);
  const b1 = (2 / Math.PI) * (t0 + Math.sin(t0) * Math.cos(t0));
  const meanSquare = (2 / Math.PI) * (t0 / 2 - Math.sin(2 * t0) / 4 + level * level * (Math.PI / 2 - t0));
  return { b1, thd: Math.sqrt(meanSquare - (b1 * b1) / 2) / (b1 / Math.SQRT2) };
}

describe('thd', () => {
  for (const level of [0.9, 0.5, 0.1]) {
    it(`of a sine hard-clipped at ±${level} equals its Fourier-series THD_F (coherent, 4096 samples a cycle)`, () => {
      const clip = (t: number) => Math.max(-level, Math.min(level, Math.sin(t)));
      const t0 = Math.asin(level);
      // Reference 1: Fourier series by numerical integration split at the clip points (our derivation).
      const facts = fourierFacts(clip, [t0, Math.PI - t0, Math.PI + t0, 2 * Math.PI - t0], 5);
      // Reference 2: the closed form derived above; the two must agree.
      const closed = clipClosedForm(level);
      expect(facts.amplitudes[1]).toBeCloseTo(closed.b1, 10);
      expect(facts.thdFundamental).toBeCloseTo(closed.thd, 9);
      const hertz = (RATE * 64) / LENGTH; // exactly 64 cycles
      const result = thd(sampled(clip, hertz), RATE, { coherent: true, fundamentalHertz: hertz, bandUpperHertz: RATE / 2 });
      // Sampling aliases the (1/n²-decaying) harmonics back onto the harmonic bins: up to 8e−7 at
      // 4096 samples a cycle (L = 0.1), so the tolerance is 1e−6 (the tabulated precision).
      expect(Math.abs(result.thdFundamental - closed.thd)).toBeLessThan(1e-6);
      expect(result.fundamentalAmplitude).toBeCloseTo(closed.b1, 6);
      expect(result.harmonics[1].amplitude / result.fundamentalAmplitude).toBeCloseTo(facts.amplitudes[3] / facts.amplitudes[1], 6);
      expect(result.harmonics[0].amplitude).toBeLessThan(1e-9); // symmetric clip: no even harmonics
    });
  }

  it('of a clip at ±0.5 matches the tabulated 0.232938 (value computed from the closed form above; rounded to 6 places)', () => {
    expect(clipClosedForm(0.5).thd).toBeCloseTo(0.232938, 6);
  });

  it('reads the half-wave rectified sine: DC 1/π, fundamental 1/2, even harmonics 2/(π(n²−1)), odd ones 0 (standard Fourier series, e.g. Oppenheim & Willsky, Signals and Systems)', () => {
    const hertz = 12.345; // not coherent: the Blackman–Harris window and power summation
    const x = sampled((t) => Math.max(0, Math.sin(t)), hertz);
    // DC over whole cycles (64 cycles of 4096 samples; the trapezoid rule errs by O(h²) ≈ 1e−7).
    const whole = sampled((t) => Math.max(0, Math.sin(t)), (RATE * 64) / LENGTH);
    let mean = 0;
    for (const v of whole) mean += v;
    expect(mean / whole.length).toBeCloseTo(1 / Math.PI, 6);
    const result = thd(x, RATE, { harmonicCount: 10 });
    expect(result.fundamentalHertz).toBeCloseTo(hertz, 6); // within 3e−6 of a bin
    expect(result.fundamentalAmplitude).toBeCloseTo(0.5, 7);
    for (const h of result.harmonics) {
      const expected = h.order % 2 === 0 ? 2 / (Math.PI * (h.order * h.order - 1)) : 0;
      // Off the bin grid, aliases of the high harmonics land near the odd orders: a few 1e−7.
      expect(h.amplitude).toBeCloseTo(expected, 6);
    }
    // THD_F from the closed form, summing the even harmonics to order 10: 0.43503…
    let squares = 0;
    for (let n = 2; n <= 10; n += 2) squares += (2 / (Math.PI * (n * n - 1))) ** 2;
    expect(result.thdFundamental).toBeCloseTo(Math.sqrt(squares) / 0.5, 6);
  });

  it('of 1·sin + 0.01·sin 2θ + 0.003·sin 3θ is −39.63 dB within 0.01 dB, off the bin grid (definition)', () => {
    const hertz = 1000.3;
    const x = sampled((t) => Math.sin(t) + 0.01 * Math.sin(2 * t + 0.3) + 0.003 * Math.sin(3 * t + 1.1), hertz, 48000);
    const result = thd(x, RATE);
    const expectedDb = 20 * Math.log10(Math.hypot(0.01, 0.003));
    expect(Math.abs(result.thdFundamentalDb - expectedDb)).toBeLessThan(0.01);
    expect(Math.abs(result.thdFundamentalDb - expectedDb)).toBeLessThan(1e-5); // what power summation achieves
    expect(result.harmonics[0].dbc).toBeCloseTo(-40, 5);
    expect(result.highestOrder).toBe(19); // 19·1000.3 Hz is the last harmonic under 20 kHz
    expect(result.thdTotal).toBeCloseTo(Math.hypot(0.01, 0.003) / Math.sqrt(1 + 0.01 ** 2 + 0.003 ** 2), 8);
  });

  it('of an LED current cut off at zero, i = I0·max(0, 1 + 1.2 sin ωt), is 0.057477 (numerical integration here)', () => {
    const m = 1.2;
    const led = (t: number) => Math.max(0, 1 + m * Math.sin(t));
    const cutoff = Math.asin(1 / m);
    const facts = fourierFacts(led, [Math.PI + cutoff, 2 * Math.PI - cutoff], 3);
    expect(facts.thdFundamental).toBeCloseTo(0.057477, 6); // the value to verify, recomputed by integration above
    expect(facts.mean).toBeCloseTo(1.024713, 6);
    const result = thd(sampled(led, 20.02), RATE); // DC-biased, not coherent, fundamental estimated
    expect(result.thdFundamental).toBeCloseTo(facts.thdFundamental, 6);
    expect(result.harmonics[0].amplitude / result.fundamentalAmplitude).toBeCloseTo(facts.amplitudes[2] / facts.amplitudes[1], 6);
    expect(result.harmonics[1].amplitude / result.fundamentalAmplitude).toBeCloseTo(facts.amplitudes[3] / facts.amplitudes[1], 6);
  });

  it('states the harmonics it had to leave out above the band', () => {
    const x = sampled((t) => Math.sin(t), 3000, 48000);
    const result = thd(x, RATE, { harmonicCount: 10 });
    expect(result.highestOrder).toBe(6);
    expect(result.excluded).toMatchObject({ fromOrder: 7, toOrder: 10 });
    expect(result.excluded?.reason).toContain('20000 Hz');
    const nyquistLimited = thd(x, RATE, { harmonicCount: 10, bandUpperHertz: 30000 });
    expect(nyquistLimited.highestOrder).toBe(7);
    expect(nyquistLimited.excluded?.reason).toContain('Nyquist');
    const noneInBand = thd(sampled((t) => Math.sin(t), 12000, 48000), RATE);
    expect(noneInBand.harmonics).toHaveLength(0);
    expect(noneInBand.thdFundamental).toBe(0);
    expect(noneInBand.excluded).toMatchObject({ fromOrder: 2 });
  });

  it('rejects a record too short to separate the harmonics, and non-whole cycles when coherent', () => {
    const x = sampled((t) => Math.sin(t), 100, 4096);
    expect(() => thd(x, RATE, { fundamentalHertz: 100 })).toThrow(InputError);
    expect(() => thd(x, RATE, { fundamentalHertz: 1000.5, coherent: true })).toThrow(/whole number of cycles/);
    expect(() => thd(new Float64Array(4096), RATE)).toThrow(/silence/);
    expect(() => thd(Float64Array.from([1, Number.NaN, 2]), RATE)).toThrow(/samples\[1\]/);
  });
});
