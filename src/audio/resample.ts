/**
 * Band-limited sample-rate conversion for any ratio (rational or not), for whole signals
 * (resample-stream.ts gives the same output chunk by chunk).
 *
 * Output sample k is the band-limited input evaluated at exactly t = k / toHertz (the position in
 * input samples, k·from/to, is computed afresh for every k, so nothing drifts). The kernel is a
 * Kaiser-windowed sinc scaled to the lower of the two rates: flat to 0.45 × the lower rate, stopband
 * from 0.5 × the lower rate (its Nyquist frequency), design attenuation 100 dB (Kaiser's formulas,
 * see numeric/kaiser.ts), so the passband ripple is about ±0.0001 dB. The signal is taken as zero
 * outside its span, so the first and last ~65 samples of the lower rate carry the kernel's edge.
 * The kernel is read from a table (4096 points per sample of the lower rate, linear interpolation,
 * error below −120 dB) so the cost is about 130 × max(1, from/to) multiplies per output sample.
 */
import { InputError } from '../errors.ts';
import { resampleKernel, resampleSpan } from './resample-kernel.ts';

export { RESAMPLE_ATTENUATION_DB, RESAMPLE_PASSBAND_OF_LOWER_RATE, RESAMPLE_STOPBAND_OF_LOWER_RATE } from './resample-kernel.ts';

export function checkRate(name: string, hertz: number): void {
  if (typeof hertz !== 'number' || !Number.isFinite(hertz) || hertz <= 0) {
    throw new InputError(name, 'a finite sample rate above 0 Hz', `got ${String(hertz)}`);
  }
}

/** Samples a signal of `inputLength` samples has after resampling: round(n·to/from). */
export function resampledLength(inputLength: number, fromHertz: number, toHertz: number): number {
  return Math.round((inputLength * toHertz) / fromHertz);
}

/** Resamples `samples` from `fromHertz` to `toHertz`; the result has round(n·to/from) samples. */
export function resample(samples: Float64Array, fromHertz: number, toHertz: number): Float64Array {
  if (!(samples instanceof Float64Array)) throw new InputError('samples', 'a Float64Array');
  checkRate('fromHertz', fromHertz);
  checkRate('toHertz', toHertz);
  const inputLength = samples.length;
  for (let i = 0; i < inputLength; i++) {
    if (!Number.isFinite(samples[i])) {
      throw new InputError(`samples[${i}]`, 'a finite sample value', `got ${samples[i]}`);
    }
  }
  const outputLength = resampledLength(inputLength, fromHertz, toHertz);
  if (fromHertz === toHertz) return Float64Array.from(samples);
  const output = new Float64Array(outputLength);
  if (inputLength === 0) return output;
  resampleSpan(resampleKernel(fromHertz, toHertz), samples, 0, inputLength - 1, 0, outputLength, output, 0);
  return output;
}
