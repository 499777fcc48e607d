import { describe, expect, it } from 'vitest';
import { aWeightedNoiseBandwidthHertz, aWeightingDb } from '../../../src/link/acoustics/a-weighting.ts';

describe('A frequency weighting', () => {
  // IEC 61672-1 A-weighting table (values rounded to 0.1 dB); the table is computed at the
  // exact base-10 frequencies 1000·10^(n/10) Hz, nominally labelled 20, 31.5, … Hz.
  it.each([
    [20, -17, -50.5],
    [31.5, -15, -39.4],
    [100, -10, -19.1],
    [1000, 0, 0],
    [4000, 6, 1.0],
    [10000, 10, -2.5],
    [20000, 13, -9.3],
  ])('at nominal %d Hz is the tabulated IEC 61672-1 value', (_nominal, n, db) => {
    const exactHertz = 1000 * 10 ** (n / 10);
    expect(Math.abs(aWeightingDb(exactHertz) - db)).toBeLessThanOrEqual(0.051);
  });

  it('is exactly 0 dB at 1 kHz', () => {
    expect(aWeightingDb(1000)).toBe(0);
  });

  // ∫|A(f)|² df over 20 Hz–20 kHz from the IEC 61672-1 closed form, evaluated here with
  // scipy.integrate.quad (adaptive quadrature): 12467.1837 Hz.
  it('has a noise bandwidth of 12467.18 Hz over 20 Hz–20 kHz', () => {
    expect(aWeightedNoiseBandwidthHertz(20, 20000)).toBeCloseTo(12467.1837, 3);
  });
});
