import { describe, expect, it } from 'vitest';
import { levels } from '../../src/analysis/levels.ts';

describe('levels', () => {
  it('a sine of amplitude A has rms A/√2 and crest factor 20·log10 √2 = 3.0103 dB (closed form)', () => {
    const x = new Float64Array(4800);
    for (let n = 0; n < x.length; n++) x[n] = 2 * Math.sin((2 * Math.PI * 100 * n) / 48000 + Math.PI / 2);
    const result = levels(x);
    expect(result.peak).toBe(2);
    expect(result.rms).toBeCloseTo(Math.SQRT2, 12);
    expect(result.crestFactorDb).toBeCloseTo(10 * Math.log10(2), 10);
    expect(result.rmsDb).toBeCloseTo(20 * Math.log10(Math.SQRT2), 10);
  });

  it('a square wave has crest factor 0 dB; a DC-biased one measured about its mean too', () => {
    const x = Float64Array.from({ length: 1000 }, (_, n) => (n % 10 < 5 ? 3 : 1));
    const ac = levels(x, { removeMean: true });
    expect(ac.mean).toBe(2);
    expect(ac.peak).toBe(1);
    expect(ac.rms).toBeCloseTo(1, 14);
    expect(ac.crestFactorDb).toBeCloseTo(0, 12);
  });

  it('silence has no crest factor (null, not NaN) and a floored dB level', () => {
    const result = levels(new Float64Array(10));
    expect(result.crestFactorDb).toBeNull();
    expect(result.rmsDb).toBe(-300);
  });

  it('rejects an empty record and non-finite samples by index', () => {
    expect(() => levels(new Float64Array(0))).toThrow(/samples: .*at least 1/);
    expect(() => levels([0, Infinity])).toThrow(/samples\[1\]/);
  });
});
