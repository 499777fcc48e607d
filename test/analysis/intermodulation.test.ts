import { describe, expect, it } from 'vitest';
import { differenceFrequencyImd, modulationImd } from '../../src/analysis/intermodulation.ts';

/**
 * Closed forms for y = x + a2·x² + a3·x³ with x = A1 cos ω1t + A2 cos ω2t
 * (product-to-sum identities, cos a·cos b = ½[cos(a−b) + cos(a+b)]):
 *   x²  → a2·A1·A2 at ω2 ± ω1;
 *   x³  → (3/4)·a3·A1²·A2 at ω2 ± 2ω1 and (3/4)·a3·A1·A2² at 2ω2 ± ω1;
 *   ω2 amplitude: A2 + a3·(3A2³/4 + 3A1²A2/2). Nothing lands at ω2 ± 3ω1.
 */
const A2_COEFF = 0.05;
const A3_COEFF = 0.02;

function twoTone(rate: number, seconds: number, f1: number, amp1: number, f2: number, amp2: number): Float64Array {
  const length = Math.round(rate * seconds);
  const y = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    const x = amp1 * Math.cos((2 * Math.PI * f1 * n) / rate + 0.3) + amp2 * Math.cos((2 * Math.PI * f2 * n) / rate + 1.1);
    y[n] = x + A2_COEFF * x * x + A3_COEFF * x * x * x;
  }
  return y;
}

describe('intermodulation', () => {
  it('modulation method (60 Hz + 7 kHz, 4:1) matches the polynomial closed form', () => {
    const [A1, A2] = [0.8, 0.2];
    const y = twoTone(48000, 1, 60, A1, 7000, A2);
    const result = modulationImd(y, 48000, { lowToneHertz: 60, highToneHertz: 7000 });
    const carrier = A2 + A3_COEFF * ((3 * A2 ** 3) / 4 + (3 * A1 ** 2 * A2) / 2);
    const first = A2_COEFF * A1 * A2;
    const second = 0.75 * A3_COEFF * A1 ** 2 * A2;
    expect(result.highToneAmplitude).toBeCloseTo(carrier, 9);
    expect(result.total).toBeCloseTo(Math.sqrt(2 * first ** 2 + 2 * second ** 2) / carrier, 8);
    expect(result.perOrder[0]).toBeCloseTo((2 * first) / carrier, 8);
    expect(result.perOrder[1]).toBeCloseTo((2 * second) / carrier, 8);
    // Nothing at f2 ± 3f1: only the Blackman–Harris far sidelobes of the carrier (about 1e−6 of it).
    expect(result.perOrder[2]).toBeLessThan(1e-5);
  });

  it('difference-frequency method (19 + 20 kHz, equal) matches the closed form, referred to 2·A(f2)', () => {
    const A = 0.5;
    const y = twoTone(96000, 0.5, 19000, A, 20000, A);
    const result = differenceFrequencyImd(y, 96000, { lowToneHertz: 19000, highToneHertz: 20000 });
    const carrier = A + A3_COEFF * ((3 * A ** 3) / 4 + (3 * A ** 3) / 2);
    expect(result.secondOrder).toBeCloseTo((A2_COEFF * A * A) / (2 * carrier), 9);
    expect(result.thirdOrder).toBeCloseTo((2 * 0.75 * A3_COEFF * A ** 3) / (2 * carrier), 9);
  });

  it('rejects tones the record cannot resolve and sidebands below 0 Hz', () => {
    const y = twoTone(48000, 0.05, 60, 0.8, 7000, 0.2);
    expect(() => modulationImd(y, 48000, { lowToneHertz: 60, highToneHertz: 7000 })).toThrow(/samples.length/);
    const long = twoTone(48000, 1, 60, 0.8, 150, 0.2);
    expect(() => modulationImd(long, 48000, { lowToneHertz: 60, highToneHertz: 150, orders: 3 })).toThrow(/orders/);
  });
});
