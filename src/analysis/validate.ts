/**
 * Argument checks shared by the metrics: every public metric rejects bad
 * input with an InputError naming the argument, so no NaN leaks into a result.
 */
import { InputError } from '../errors.ts';

/** Throws unless every sample is finite and there are at least `minimumLength`. */
export function checkSamples(name: string, samples: ArrayLike<number>, minimumLength = 1): void {
  if (samples.length < minimumLength) {
    throw new InputError(name, `at least ${minimumLength} samples`, `got ${samples.length}`);
  }
  for (let i = 0; i < samples.length; i++) {
    if (!Number.isFinite(samples[i])) {
      throw new InputError(`${name}[${i}]`, 'a finite number', `got ${samples[i]}`);
    }
  }
}

/** Throws unless `rateHertz` is a finite positive sample rate. */
export function checkRate(name: string, rateHertz: number): void {
  if (!Number.isFinite(rateHertz) || rateHertz <= 0) {
    throw new InputError(name, 'a positive sample rate in hertz', `got ${rateHertz}`);
  }
}

/** Throws unless `value` is finite and inside [low, high] (either bound may be open by passing ±Infinity). */
export function checkRange(name: string, value: number, low: number, high: number, what: string): void {
  if (!Number.isFinite(value) || value < low || value > high) {
    throw new InputError(name, what, `got ${value}`);
  }
}

/** Throws unless the two arrays have the same length. */
export function checkSameLength(nameA: string, a: ArrayLike<number>, nameB: string, b: ArrayLike<number>): void {
  if (a.length !== b.length) {
    throw new InputError(nameB, `the same length as ${nameA} (${a.length} samples)`, `got ${b.length}`);
  }
}
