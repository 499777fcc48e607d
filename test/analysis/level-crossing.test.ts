import { describe, expect, it } from 'vitest';
import { findCrossing } from '../../src/analysis/level-crossing.ts';
import { InputError } from '../../src/errors.ts';

// Bracketing then bisection: after k halvings a bracket of width w is w/2^k wide, and the root lies
// inside it (R. L. Burden & J. D. Faires, Numerical Analysis, sec. 2.1, the bisection method; from memory).
const above = (threshold: number) => async (level: number) => level >= threshold;

describe('findCrossing', () => {
  it('finds a step at any place within ±tolerance, with false at belowDb and true at aboveDb', async () => {
    for (const threshold of [20.001, 37.3, 80, 99.99, 149.9]) {
      for (const start of [20, 60, 140]) {
        const result = await findCrossing(above(threshold), { startDb: start, stepDb: 1, minDb: 20, maxDb: 150, toleranceDb: 0.25 });
        if (!result.found) throw new Error(`no crossing for ${threshold} from ${start}`);
        expect(Math.abs(result.levelDb - threshold)).toBeLessThanOrEqual(0.25);
        expect(result.belowDb).toBeLessThan(threshold);
        expect(result.aboveDb).toBeGreaterThanOrEqual(threshold);
        expect(result.aboveDb - result.belowDb).toBeLessThanOrEqual(0.5);
      }
    }
  });

  it('needs about log2(bracket / 2·tolerance) halvings once bracketed', async () => {
    let calls = 0;
    const result = await findCrossing(
      async (level) => {
        calls++;
        return level >= 73.4;
      },
      { startDb: 73, stepDb: 1, minDb: 0, maxDb: 150, toleranceDb: 0.01 },
    );
    // One evaluation at the start, one step to 74, then ceil(log2(1 / 0.02)) = 6 halvings.
    expect(calls).toBe(8);
    expect(result.evaluations).toBe(8);
  });

  it('says "never" when the criterion does not hold even at the top of the range, and "always" when it holds at the bottom', async () => {
    expect(await findCrossing(above(200), { startDb: 50, stepDb: 3, minDb: 0, maxDb: 150, toleranceDb: 0.25 })).toMatchObject({ found: false, reason: 'never' });
    expect(await findCrossing(above(-5), { startDb: 50, stepDb: 3, minDb: 0, maxDb: 150, toleranceDb: 0.25 })).toMatchObject({ found: false, reason: 'always' });
  });

  it('refuses a tolerance of zero and an empty range, naming them', async () => {
    await expect(findCrossing(above(1), { startDb: 0, stepDb: 1, minDb: 0, maxDb: 10, toleranceDb: 0 })).rejects.toThrow(InputError);
    await expect(findCrossing(above(1), { startDb: 0, stepDb: 1, minDb: 10, maxDb: 10, toleranceDb: 0.1 })).rejects.toThrow(/level range/);
  });
});
