import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { crossCorrelation } from '../../src/analysis/cross-correlation.ts';

/** The definition, r(l) = Σ_n a[n]·b[n + l], summed directly. */
function direct(a: ArrayLike<number>, b: ArrayLike<number>, lowest: number, highest: number): Float64Array {
  const r = new Float64Array(highest - lowest + 1);
  for (let l = lowest; l <= highest; l++) {
    let s = 0;
    for (let n = 0; n < a.length; n++) if (n + l >= 0 && n + l < b.length) s += a[n] * b[n + l];
    r[l - lowest] = s;
  }
  return r;
}

/** Samples of a recording's kind: within ±1, on a 24-bit grid. */
const sample = fc.integer({ min: -(2 ** 23), max: 2 ** 23 }).map((v) => v / 2 ** 23);

describe('cross-correlation over a range of lags', () => {
  it('equals the directly summed definition for any signals and lag range (blocks, edges, lags past either end)', () => {
    fc.assert(
      fc.property(
        fc.array(sample, { minLength: 1, maxLength: 3000 }),
        fc.array(sample, { minLength: 1, maxLength: 3000 }),
        fc.integer({ min: -700, max: 700 }),
        fc.integer({ min: 0, max: 900 }),
        (a, b, lowest, width) => {
          const got = crossCorrelation(a, b, lowest, lowest + width);
          const want = direct(a, b, lowest, lowest + width);
          const scale = Math.sqrt(a.reduce((s, v) => s + v * v, 0) * b.reduce((s, v) => s + v * v, 0)) + 1e-300;
          return got.every((v, i) => Math.abs(v - want[i]) <= 1e-12 * scale);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('sums many blocks: a long signal against its own copy delayed by 37 samples peaks at lag 37', () => {
    const a = Float64Array.from({ length: 20_000 }, (_, i) => Math.sin(0.013 * i * i) + 0.3 * Math.sin(0.7 * i));
    const b = new Float64Array(a.length);
    for (let i = 37; i < b.length; i++) b[i] = a[i - 37];
    const r = crossCorrelation(a, b, -100, 100);
    const want = direct(a, b, -100, 100);
    let peak = 0;
    for (let k = 0; k < r.length; k++) if (r[k] > r[peak]) peak = k;
    expect(peak - 100).toBe(37);
    for (let k = 0; k < r.length; k++) expect(Math.abs(r[k] - want[k])).toBeLessThan(1e-9);
  });

  it('refuses a range that runs backwards', () => {
    expect(() => crossCorrelation([1], [1], 3, 2)).toThrow(RangeError);
  });
});
