/**
 * Range checks for block settings. Each throws an InputError that names the
 * field (a JSON-style path such as `lightPath.distanceMetres`), what was
 * expected and what arrived, so a user can fix a scenario file from the message.
 */
import { InputError } from '../errors.ts';

/** Shows a bad value the way the user typed it (numbers plainly, anything else as JSON). */
export function describeValue(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (value === undefined) return 'nothing';
  try {
    return JSON.stringify(value) ?? String(value);
  } catch {
    return String(value);
  }
}

/** A plain object, so that fields can be read from it. */
export function requireObject(where: string, value: unknown): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new InputError(where, 'an object of settings', `got ${describeValue(value)}`);
  }
  return value as Record<string, unknown>;
}

/** A finite number within [min, max] (either end may be open or absent). */
export function requireNumber(
  where: string,
  value: unknown,
  expected: string,
  range: { min?: number; max?: number; minExclusive?: boolean; maxExclusive?: boolean } = {},
): number {
  const ok =
    typeof value === 'number' &&
    Number.isFinite(value) &&
    (range.min === undefined || (range.minExclusive ? value > range.min : value >= range.min)) &&
    (range.max === undefined || (range.maxExclusive ? value < range.max : value <= range.max));
  if (!ok) throw new InputError(where, expected, `got ${describeValue(value)}`);
  return value as number;
}

export function requirePositive(where: string, value: unknown, expected: string): number {
  return requireNumber(where, value, expected, { min: 0, minExclusive: true });
}

export function requireNonNegative(where: string, value: unknown, expected: string): number {
  return requireNumber(where, value, expected, { min: 0 });
}

/** A seed for SeededRandom: a whole number 0 … 2³² − 1. */
export function requireSeed(where: string, value: unknown): number {
  const ok = typeof value === 'number' && Number.isInteger(value) && value >= 0 && value <= 0xffffffff;
  if (!ok) throw new InputError(where, 'a whole number from 0 to 4294967295', `got ${describeValue(value)}`);
  return value as number;
}

/** The output chunk must be at least as long as the input chunk (a caller's bug, not the user's). */
export function requireChunkFits(where: string, input: Float64Array, output: Float64Array): void {
  if (output.length < input.length) {
    throw new RangeError(`${where}: output chunk has ${output.length} samples, input has ${input.length}`);
  }
}
