/**
 * Finds the level at which a yes/no criterion first holds (the LED cuts off,
 * THD reaches 3 %, …): bracket, then bisect.
 *
 * Bracket: from the start level, step up (criterion false) or down (true),
 * doubling the step each time, until the answer changes or a range limit is
 * reached. Bisect: halve [below, above] until it is at most 2·tolerance wide;
 * the answer is its midpoint, so the crossing lies within ±tolerance of it,
 * the criterion is false at every level tried below and true at `aboveDb`.
 * This assumes the criterion is monotone in level near the crossing; where it
 * is not, the crossing found is the one nearest the start.
 */
import { InputError } from '../errors.ts';

export interface CrossingOptions {
  startDb: number;
  /** First bracketing step; doubled after each step that does not cross. */
  stepDb: number;
  minDb: number;
  maxDb: number;
  toleranceDb: number;
}

export type CrossingResult =
  | {
      found: true;
      /** Midpoint of the final bracket: the crossing is within ±toleranceDb of it. */
      levelDb: number;
      /** Highest level tried where the criterion was false, lowest where it was true. */
      belowDb: number;
      aboveDb: number;
      evaluations: number;
    }
  | { found: false; reason: 'never' | 'always'; evaluations: number };

export function checkCrossingOptions(options: CrossingOptions): void {
  const { startDb, stepDb, minDb, maxDb, toleranceDb } = options;
  if (!(Number.isFinite(toleranceDb) && toleranceDb > 0)) throw new InputError('tolerance', 'a level tolerance above 0 dB', `got ${toleranceDb}`);
  if (!(Number.isFinite(stepDb) && stepDb > 0)) throw new InputError('step', 'a step above 0 dB', `got ${stepDb}`);
  if (!(Number.isFinite(minDb) && Number.isFinite(maxDb) && maxDb > minDb)) {
    throw new InputError('level range', 'a lowest level below the highest', `got ${minDb} to ${maxDb} dB`);
  }
  if (!Number.isFinite(startDb)) throw new InputError('start level', 'a finite level in dB', `got ${startDb}`);
}

/** Searches for the crossing of `holds(levelDb)`. Evaluations run one after another. */
export async function findCrossing(holds: (levelDb: number) => Promise<boolean>, options: CrossingOptions): Promise<CrossingResult> {
  checkCrossingOptions(options);
  const { stepDb, minDb, maxDb, toleranceDb } = options;
  let evaluations = 0;
  const test = async (levelDb: number): Promise<boolean> => {
    evaluations++;
    return holds(levelDb);
  };
  const start = Math.min(maxDb, Math.max(minDb, options.startDb));
  let below: number;
  let above: number;
  let step = stepDb;
  if (!(await test(start))) {
    below = start;
    for (;;) {
      if (below >= maxDb) return { found: false, reason: 'never', evaluations };
      const next = Math.min(maxDb, below + step);
      if (await test(next)) {
        above = next;
        break;
      }
      below = next;
      step *= 2;
    }
  } else {
    above = start;
    for (;;) {
      if (above <= minDb) return { found: false, reason: 'always', evaluations };
      const next = Math.max(minDb, above - step);
      if (!(await test(next))) {
        below = next;
        break;
      }
      above = next;
      step *= 2;
    }
  }
  while (above - below > 2 * toleranceDb) {
    const middle = (below + above) / 2;
    if (await test(middle)) above = middle;
    else below = middle;
  }
  return { found: true, levelDb: (below + above) / 2, belowDb: below, aboveDb: above, evaluations };
}
