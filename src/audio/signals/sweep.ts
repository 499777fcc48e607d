/**
 * Exponential (logarithmic) sine sweep and its inverse filter (A. Farina, "Simultaneous measurement
 * of impulse response and distortion with a swept-sine technique", AES 108th Convention, Paris 2000,
 * preprint 5093):
 *   x(t) = A·sin(2π f1 T / ln(f2/f1) · (e^{t ln(f2/f1) / T} − 1)),  f_inst(t) = f1·e^{t ln(f2/f1)/T}.
 * The inverse filter is the sweep reversed in time with an envelope proportional to the instantaneous
 * frequency (falling 6 dB per octave as the reversed sweep descends), so that sweep ⊛ inverse has a
 * flat spectrum: a band-limited impulse at sample N − 1, with the harmonic responses before it.
 */
import { InputError } from '../../errors.ts';
import { applyFades, requireAudibleAt, requireNonNegative, sampleCount } from './arguments.ts';

export interface SweepOptions {
  sampleRateHertz: number;
  startHertz: number;
  endHertz: number;
  seconds: number;
  /** Peak amplitude A. */
  peakAmplitude: number;
  /** Raised-cosine fade at both ends; default 0. */
  fadeSeconds?: number;
}

function checked(options: SweepOptions): { count: number; rate: number } {
  const count = sampleCount(options.seconds, options.sampleRateHertz);
  requireAudibleAt('startHertz', options.startHertz, options.sampleRateHertz);
  requireAudibleAt('endHertz', options.endHertz, options.sampleRateHertz);
  if (options.endHertz <= options.startHertz) {
    throw new InputError('endHertz', `a frequency above startHertz (${options.startHertz} Hz)`, `got ${options.endHertz} Hz`);
  }
  requireNonNegative('peakAmplitude', options.peakAmplitude);
  return { count, rate: Math.log(options.endHertz / options.startHertz) / options.seconds };
}

/** Instantaneous frequency of the sweep `seconds` after its start. */
export function sweepFrequencyAt(options: SweepOptions, seconds: number): number {
  const { rate } = checked(options);
  return options.startHertz * Math.exp(rate * seconds);
}

export function expSweep(options: SweepOptions): Float64Array {
  const { count, rate } = checked(options);
  const { sampleRateHertz, startHertz, peakAmplitude } = options;
  const samples = new Float64Array(count);
  const scale = (2 * Math.PI * startHertz) / rate;
  for (let n = 0; n < count; n++) {
    const t = n / sampleRateHertz;
    samples[n] = peakAmplitude * Math.sin(scale * Math.expm1(rate * t));
  }
  applyFades(samples, options.fadeSeconds ?? 0, sampleRateHertz);
  return samples;
}

/**
 * Inverse filter for expSweep(options), same length. Scaled so that the spectrum of
 * sweep ⊛ inverse is 1 (0 dB) inside the swept band: by stationary phase, the sweep's spectrum
 * is |X(f)| = fs·(A/2)·√(T/(f·ln(f2/f1))), so the envelope K·f_inst with
 * K = 4 ln(f2/f1) / (fs² A² T) makes the product 1. A deconvolved response is then in the units
 * of the system's gain.
 */
export function sweepInverseFilter(options: SweepOptions): Float64Array {
  const { count, rate } = checked(options);
  if (options.peakAmplitude === 0) throw new InputError('peakAmplitude', 'a number above 0 for an inverse filter', 'got 0');
  const sweep = expSweep(options);
  const { sampleRateHertz, startHertz, peakAmplitude } = options;
  const k = (4 * rate) / (sampleRateHertz * sampleRateHertz * peakAmplitude * peakAmplitude); // ln(f2/f1)/T = rate
  const inverse = new Float64Array(count);
  for (let n = 0; n < count; n++) {
    const sweepIndex = count - 1 - n;
    const frequency = startHertz * Math.exp((rate * sweepIndex) / sampleRateHertz);
    inverse[n] = sweep[sweepIndex] * k * frequency;
  }
  return inverse;
}
