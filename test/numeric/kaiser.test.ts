import { describe, expect, it } from 'vitest';
import { besselI0, kaiserBeta, kaiserOrder, kaiserWindow } from '../../src/numeric/kaiser.ts';
import { designHalfBand, designLowpass } from '../../src/numeric/fir-design.ts';

function gainAt(taps: Float64Array, cyclesPerSample: number): number {
  let c = 0;
  let s = 0;
  for (let n = 0; n < taps.length; n++) {
    c += taps[n] * Math.cos(2 * Math.PI * cyclesPerSample * n);
    s += taps[n] * Math.sin(2 * Math.PI * cyclesPerSample * n);
  }
  return Math.hypot(c, s);
}

describe('Kaiser window', () => {
  it('I0 matches Abramowitz & Stegun Table 9.8 (e^-x I0(x) at x = 1, 5, 10) to 9 digits', () => {
    // A&S Table 9.8: e^-x I0(x) = 0.4657596077, 0.1835408126, 0.1278333372 (10 digits).
    expect(Math.exp(-1) * besselI0(1)).toBeCloseTo(0.4657596077, 9);
    expect(Math.exp(-5) * besselI0(5)).toBeCloseTo(0.1835408126, 9);
    expect(Math.exp(-10) * besselI0(10)).toBeCloseTo(0.1278333372, 9);
    expect(besselI0(0)).toBe(1);
  });

  it("reproduces the textbook lowpass example: A = 60 dB, Δω = 0.2π gives β = 5.653 and M = 37", () => {
    // Oppenheim & Schafer, Discrete-Time Signal Processing, 3rd ed., §7.6 Kaiser-window lowpass example (from memory).
    expect(kaiserBeta(60)).toBeCloseTo(5.653, 3);
    expect(kaiserOrder(60, 0.2 * Math.PI)).toBe(37);
    expect(kaiserBeta(21)).toBe(0);
    expect(kaiserBeta(30)).toBeCloseTo(0.5842 * 9 ** 0.4 + 0.07886 * 9, 12);
  });

  it('is symmetric, 1 at the centre and I0(0)/I0(β) at the ends', () => {
    const w = kaiserWindow(21, 8);
    expect(w[10]).toBe(1);
    for (let n = 0; n < 21; n++) expect(w[n]).toBeCloseTo(w[20 - n], 14);
    expect(w[0]).toBeCloseTo(1 / besselI0(8), 15);
  });

  it('designs a lowpass meeting its own specification (60 dB, edges 0.2 and 0.3)', () => {
    const taps = designLowpass({ passbandEdge: 0.2, stopbandEdge: 0.3, attenuationDb: 60 });
    expect(taps.length % 2).toBe(1);
    for (let f = 0; f <= 0.2; f += 0.005) expect(Math.abs(20 * Math.log10(gainAt(taps, f)))).toBeLessThan(0.0174); // 20·log10(1.002)
    for (let f = 0.3; f <= 0.5; f += 0.005) expect(20 * Math.log10(gainAt(taps, f))).toBeLessThan(-59); // Kaiser's formulas are empirical: the achieved attenuation can miss A by a fraction of a dB
  });

  it('designs a half-band filter with exact zeros, a centre of exactly 1/2 and the requested centre congruence', () => {
    const taps = designHalfBand({ transitionWidth: 0.1, attenuationDb: 100, centreModulus: 4, centreRemainder: 3 });
    const centre = (taps.length - 1) / 2;
    expect(centre % 4).toBe(3);
    expect(taps[centre]).toBe(0.5);
    for (let n = 0; n < taps.length; n++) if (n !== centre && (n - centre) % 2 === 0) expect(taps[n]).toBe(0);
    for (let f = 0.3; f <= 0.5; f += 0.002) expect(20 * Math.log10(gainAt(taps, f))).toBeLessThan(-99);
  });
});
