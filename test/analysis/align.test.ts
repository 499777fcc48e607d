import { describe, expect, it } from 'vitest';
import { align } from '../../src/analysis/align.ts';
import { speechLike, withNoise } from './speech-like.ts';

const RATE = 8000;

function delayed(x: Float64Array, samples: number, gain: number): Float64Array {
  const y = new Float64Array(x.length);
  for (let n = 0; n < x.length; n++) {
    const source = n - samples;
    y[n] = source >= 0 && source < x.length ? gain * x[source] : 0;
  }
  return y;
}

describe('align', () => {
  it('finds a delay and undoes a gain exactly for a clean copy', () => {
    const x = speechLike(RATE, 2);
    const result = align(x, delayed(x, 321, 0.25), RATE);
    expect(result.lagSamples).toBe(321);
    expect(result.lagSeconds).toBeCloseTo(321 / RATE, 12);
    expect(result.gain).toBeCloseTo(4, 12);
    for (let n = 0; n < x.length - 321; n++) expect(result.aligned[n]).toBeCloseTo(x[n], 12);
  });

  it('finds a lead (negative lag) and a polarity inversion (negative gain) through noise', () => {
    const x = speechLike(RATE, 2);
    const y = withNoise(delayed(x, -57, -2), 0, 4);
    const result = align(x, y, RATE);
    expect(result.lagSamples).toBe(-57);
    // Least squares with noise in the degraded signal: g = Σxy/Σy² ≈ −½·S/(S+N) = −¼ at 0 dB.
    expect(result.gain).toBeLessThan(0);
    expect(result.gain).toBeCloseTo(-0.25, 1);
  });

  it('searches only within ±maxLagSeconds', () => {
    const x = speechLike(RATE, 2);
    const result = align(x, delayed(x, 800, 1), RATE, { maxLagSeconds: 0.05 });
    expect(Math.abs(result.lagSamples)).toBeLessThanOrEqual(400);
  });

  it('rejects a silent degraded signal and a negative search range', () => {
    const x = speechLike(RATE, 1);
    expect(() => align(x, new Float64Array(x.length), RATE)).toThrow(/degraded/);
    expect(() => align(x, x, RATE, { maxLagSeconds: -1 })).toThrow(/maxLagSeconds/);
  });
});
