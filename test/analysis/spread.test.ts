import { describe, expect, it } from 'vitest';
import { quantileSorted, spreadOf } from '../../src/analysis/spread.ts';

describe('spreadOf', () => {
  it('interpolates percentiles as Hyndman & Fan definition 7 (h = (n − 1)p between order statistics)', () => {
    // R. J. Hyndman & Y. Fan, The American Statistician 50(4), 1996: Q7(p) = x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]),
    // h = (n − 1)p on 0-based order statistics. For 1, 2, 3, 4: p = 0.25 gives h = 0.75, so 1.75.
    expect(quantileSorted([1, 2, 3, 4], 0.25)).toBe(1.75);
    // For 1..10: p = 0.1 gives h = 0.9, so 1.9; p = 0.5 gives 5.5; p = 0.95 gives h = 8.55, so 9.55.
    const tenth = Array.from({ length: 10 }, (_, i) => i + 1);
    expect(quantileSorted(tenth, 0.1)).toBeCloseTo(1.9, 12);
    expect(quantileSorted(tenth, 0.5)).toBe(5.5);
    expect(quantileSorted(tenth, 0.95)).toBeCloseTo(9.55, 12);
  });

  it('gives min, max, mean and the sample standard deviation, skipping runs without a value', () => {
    // 2, 4, 4, 4, 5, 5, 7, 9: mean 5, sum of squared deviations 32, sample variance 32/7.
    const s = spreadOf([5, null, 2, 4, 4, 9, 4, 5, null, 7])!;
    expect(s.count).toBe(8);
    expect(s.min).toBe(2);
    expect(s.max).toBe(9);
    expect(s.mean).toBeCloseTo(5, 12);
    expect(s.standardDeviation).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(s.median).toBe(4.5);
  });

  it('is null when no run has a value', () => {
    expect(spreadOf([null, null])).toBeNull();
  });
});
