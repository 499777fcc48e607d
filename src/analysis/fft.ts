/**
 * Cached fft.js plans (radix-4, power-of-two sizes only). fft.js computes
 * X_k = Σ_n x_n e^{−i2πkn/N}; `inverseTransform` includes the 1/N.
 */
import FFT from 'fft.js';
import { InputError } from '../errors.ts';

const plans = new Map<number, FFT>();

/** A reusable plan for `size` points; `size` must be a power of two ≥ 2. */
export function fftPlan(size: number): FFT {
  let plan = plans.get(size);
  if (!plan) {
    if (!isPowerOfTwo(size) || size < 2) {
      throw new InputError('FFT size', 'a power of two of at least 2', `got ${size}`);
    }
    plan = new FFT(size);
    plans.set(size, plan);
  }
  return plan;
}

export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n > 0 && (n & (n - 1)) === 0;
}

/** Smallest power of two ≥ n (n ≥ 1). */
export function nextPowerOfTwo(n: number): number {
  let size = 1;
  while (size < n) size *= 2;
  return size;
}

/**
 * Real-input transform of `samples` (zero-padded to `size`) into a complex
 * array of `2·size` numbers, interleaved re/im; bins 0..size/2 are filled.
 */
export function realFft(samples: ArrayLike<number>, size: number, out?: Float64Array): Float64Array {
  const plan = fftPlan(size);
  const input = new Float64Array(size);
  const count = Math.min(size, samples.length);
  for (let i = 0; i < count; i++) input[i] = samples[i];
  const spectrum = out ?? new Float64Array(2 * size);
  plan.realTransform(spectrum, input);
  return spectrum;
}

/**
 * Linear convolution of a and b by FFT (zero-padded to a power of two ≥
 * a.length + b.length − 1); returns a.length + b.length − 1 samples.
 */
export function fftConvolve(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const outLength = a.length + b.length - 1;
  const size = Math.max(2, nextPowerOfTwo(outLength));
  const plan = fftPlan(size);
  const spectrumA = realFft(a, size);
  const spectrumB = realFft(b, size);
  plan.completeSpectrum(spectrumA);
  plan.completeSpectrum(spectrumB);
  for (let k = 0; k < size; k++) {
    const re = spectrumA[2 * k] * spectrumB[2 * k] - spectrumA[2 * k + 1] * spectrumB[2 * k + 1];
    const im = spectrumA[2 * k] * spectrumB[2 * k + 1] + spectrumA[2 * k + 1] * spectrumB[2 * k];
    spectrumA[2 * k] = re;
    spectrumA[2 * k + 1] = im;
  }
  const product = new Float64Array(2 * size);
  plan.inverseTransform(product, spectrumA);
  const result = new Float64Array(outLength);
  for (let i = 0; i < outLength; i++) result[i] = product[2 * i];
  return result;
}
