/** Argument checks shared by the signal generators; each names the argument and what was expected. */
import { InputError } from '../../errors.ts';

export function requireFinite(name: string, value: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(name, 'a finite number', `got ${String(value)}`);
  }
  return value;
}

export function requirePositive(name: string, value: number): number {
  requireFinite(name, value);
  if (value <= 0) throw new InputError(name, 'a number above 0', `got ${value}`);
  return value;
}

export function requireNonNegative(name: string, value: number): number {
  requireFinite(name, value);
  if (value < 0) throw new InputError(name, 'a number of at least 0', `got ${value}`);
  return value;
}

/** A frequency strictly between 0 and the Nyquist frequency of `sampleRateHertz`. */
export function requireAudibleAt(name: string, hertz: number, sampleRateHertz: number): number {
  requirePositive(name, hertz);
  if (hertz >= sampleRateHertz / 2) {
    throw new InputError(name, `a frequency below half the sample rate (${sampleRateHertz / 2} Hz)`, `got ${hertz} Hz`);
  }
  return hertz;
}

export function requireSeed(name: string, value: number): number {
  if (!Number.isSafeInteger(value)) throw new InputError(name, 'an integer seed', `got ${String(value)}`);
  return value;
}

/** Number of samples for `seconds` at `sampleRateHertz`, checked. */
export function sampleCount(seconds: number, sampleRateHertz: number): number {
  requirePositive('sampleRateHertz', sampleRateHertz);
  requirePositive('seconds', seconds);
  const count = Math.round(seconds * sampleRateHertz);
  if (count > 2 ** 30) throw new InputError('seconds', 'a duration under 2^30 samples', `got ${count} samples`);
  return count;
}

/**
 * Raised-cosine (Hann) fade over `fadeSeconds` at both ends, in place, so a tone starts and stops
 * without a click.
 */
export function applyFades(samples: Float64Array, fadeSeconds: number, sampleRateHertz: number): void {
  requireNonNegative('fadeSeconds', fadeSeconds);
  const fadeSamples = Math.min(Math.floor(samples.length / 2), Math.round(fadeSeconds * sampleRateHertz));
  for (let n = 0; n < fadeSamples; n++) {
    const gain = 0.5 - 0.5 * Math.cos((Math.PI * (n + 0.5)) / fadeSamples);
    samples[n] *= gain;
    samples[samples.length - 1 - n] *= gain;
  }
}
