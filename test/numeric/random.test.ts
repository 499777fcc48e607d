import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../src/numeric/random.ts';

/**
 * xoshiro128** as listed by its authors (Blackman & Vigna, ACM TOMS 47(4), 2021, and their
 * reference C code), written with unsigned 32-bit arithmetic and no engine tricks, seeded by
 * splitmix32 the way SeededRandom documents it.
 */
function referenceStream(seed: number, count: number): number[] {
  let x = seed >>> 0;
  const splitmix32 = (): number => {
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  const s = [splitmix32(), splitmix32(), splitmix32(), splitmix32()];
  const rotl = (v: number, k: number): number => ((v << k) | (v >>> (32 - k))) >>> 0;
  const out: number[] = [];
  for (let i = 0; i < count; i++) {
    out.push(Math.imul(rotl(Math.imul(s[1], 5) >>> 0, 7), 9) >>> 0);
    const t = (s[1] << 9) >>> 0;
    s[2] = (s[2] ^ s[0]) >>> 0;
    s[3] = (s[3] ^ s[1]) >>> 0;
    s[1] = (s[1] ^ s[2]) >>> 0;
    s[0] = (s[0] ^ s[3]) >>> 0;
    s[2] = (s[2] ^ t) >>> 0;
    s[3] = rotl(s[3], 11);
  }
  return out;
}

describe('SeededRandom', () => {
  it('gives the reference xoshiro128** stream, unsigned, for seeds across the 32-bit range', () => {
    for (const seed of [0, 1, 3, 0x7fffffff, 0xffffffff]) {
      const random = new SeededRandom(seed);
      const ours = Array.from({ length: 10_000 }, () => random.nextUint32());
      expect(ours).toEqual(referenceStream(seed, 10_000));
      expect(Math.min(...ours)).toBeGreaterThanOrEqual(0);
    }
  });

  it('gives standard normals: mean, variance and the shares within 1, 2 and 3 sigma of the normal table', () => {
    // Shares within ±1, ±2, ±3 standard deviations: 0.682689, 0.954500, 0.997300
    // (Abramowitz & Stegun, Table 26.1, 2·P(x) − 1). Bounds: 5 binomial standard errors.
    const n = 400_000;
    const random = new SeededRandom(11);
    let sum = 0;
    let squares = 0;
    const within = [0, 0, 0];
    for (let i = 0; i < n; i++) {
      const z = random.normal();
      sum += z;
      squares += z * z;
      for (let k = 0; k < 3; k++) if (Math.abs(z) < k + 1) within[k]++;
    }
    const mean = sum / n;
    expect(Math.abs(mean)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(squares / n - mean * mean - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    [0.682689, 0.9545, 0.9973].forEach((p, k) => {
      expect(Math.abs(within[k] / n - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
    });
  });

  it('repeats exactly for the same seed', () => {
    const a = new SeededRandom(42);
    const b = new SeededRandom(42);
    for (let i = 0; i < 1000; i++) expect(a.normal()).toBe(b.normal());
  });
});
