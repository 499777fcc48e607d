/**
 * Band-limited sample-rate conversion for any ratio (rational or not), for whole signals.
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
import { besselI0, kaiserBeta, kaiserOrder } from '../numeric/kaiser.ts';
import { sinc } from '../numeric/fir-design.ts';

/** Passband edge, stopband edge and attenuation, all relative to the lower of the two rates. */
export const RESAMPLE_PASSBAND_OF_LOWER_RATE = 0.45;
export const RESAMPLE_STOPBAND_OF_LOWER_RATE = 0.5;
export const RESAMPLE_ATTENUATION_DB = 100;

const TABLE_POINTS_PER_SAMPLE = 4096;

interface KernelTable {
  /** Half-width of the kernel in samples of the lower rate. */
  halfWidth: number;
  /** values[i] = kernel(i / TABLE_POINTS_PER_SAMPLE), plus one guard point past the end. */
  values: Float64Array;
}

let cachedKernel: KernelTable | null = null;

function kernelTable(): KernelTable {
  if (cachedKernel) return cachedKernel;
  const transitionRadians = 2 * Math.PI * (RESAMPLE_STOPBAND_OF_LOWER_RATE - RESAMPLE_PASSBAND_OF_LOWER_RATE);
  const halfWidth = Math.ceil(kaiserOrder(RESAMPLE_ATTENUATION_DB, transitionRadians) / 2);
  const beta = kaiserBeta(RESAMPLE_ATTENUATION_DB);
  const i0OfBeta = besselI0(beta);
  const cutoff = (RESAMPLE_PASSBAND_OF_LOWER_RATE + RESAMPLE_STOPBAND_OF_LOWER_RATE) / 2;
  const points = halfWidth * TABLE_POINTS_PER_SAMPLE;
  const values = new Float64Array(points + 2);
  for (let i = 0; i <= points; i++) {
    const u = i / TABLE_POINTS_PER_SAMPLE;
    const x = u / halfWidth;
    const window = besselI0(beta * Math.sqrt(Math.max(0, 1 - x * x))) / i0OfBeta;
    values[i] = 2 * cutoff * sinc(2 * cutoff * u) * window;
  }
  cachedKernel = { halfWidth, values };
  return cachedKernel;
}

function checkRate(name: string, hertz: number): void {
  if (typeof hertz !== 'number' || !Number.isFinite(hertz) || hertz <= 0) {
    throw new InputError(name, 'a finite sample rate above 0 Hz', `got ${String(hertz)}`);
  }
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
  const outputLength = Math.round((inputLength * toHertz) / fromHertz);
  if (fromHertz === toHertz) return Float64Array.from(samples);
  const output = new Float64Array(outputLength);
  if (inputLength === 0) return output;

  const { halfWidth, values } = kernelTable();
  const lowerHertz = Math.min(fromHertz, toHertz);
  // u (kernel argument, lower-rate samples) = (input position − n) × lowerPerInput
  const lowerPerInput = lowerHertz / fromHertz;
  const tablePerInput = lowerPerInput * TABLE_POINTS_PER_SAMPLE;
  const reachInput = halfWidth / lowerPerInput;
  const tableEnd = halfWidth * TABLE_POINTS_PER_SAMPLE;
  const last = inputLength - 1;

  const weightAt = (distanceInput: number): number => {
    const tableIndex = distanceInput * tablePerInput;
    if (tableIndex >= tableEnd) return 0;
    const i = tableIndex | 0;
    return (values[i] + (tableIndex - i) * (values[i + 1] - values[i])) * lowerPerInput;
  };

  const bank = rationalBank(fromHertz, toHertz, reachInput, weightAt);
  if (bank) {
    // Integer rates: output k sits at input position k·p/q; only q distinct fractional phases occur.
    const { step, phases, reach, taps, weights } = bank;
    for (let k = 0; k < outputLength; k++) {
      const whole = Math.floor((k * step) / phases);
      const phase = k * step - whole * phases;
      const row = phase * taps - (whole - reach);
      const first = Math.max(0, whole - reach);
      const final = Math.min(last, whole + reach);
      let sum = 0;
      for (let n = first; n <= final; n++) sum += samples[n] * weights[row + n];
      output[k] = sum;
    }
    return output;
  }

  for (let k = 0; k < outputLength; k++) {
    const position = (k * fromHertz) / toHertz; // exact time k/to in input samples, no accumulation
    const first = Math.max(0, Math.ceil(position - reachInput));
    const final = Math.min(last, Math.floor(position + reachInput));
    let sum = 0;
    for (let n = first; n <= final; n++) sum += samples[n] * weightAt(Math.abs(position - n));
    output[k] = sum;
  }
  return output;
}

interface RationalBank {
  /** Input samples advanced per `phases` outputs (from/gcd) and the number of phases (to/gcd). */
  step: number;
  phases: number;
  /** Taps reach this many input samples either side of the integer part of the position. */
  reach: number;
  taps: number;
  weights: Float64Array;
}

const MAX_BANK_WEIGHTS = 1 << 21;

function greatestCommonDivisor(a: number, b: number): number {
  while (b !== 0) [a, b] = [b, a % b];
  return a;
}

/** Precomputed weights per phase when both rates are integers with a small enough reduced ratio. */
function rationalBank(
  fromHertz: number,
  toHertz: number,
  reachInput: number,
  weightAt: (distanceInput: number) => number,
): RationalBank | null {
  if (!Number.isSafeInteger(fromHertz) || !Number.isSafeInteger(toHertz)) return null;
  const divisor = greatestCommonDivisor(fromHertz, toHertz);
  const step = fromHertz / divisor;
  const phases = toHertz / divisor;
  const reach = Math.floor(reachInput) + 1;
  const taps = 2 * reach + 1;
  if (phases * taps > MAX_BANK_WEIGHTS) return null;
  const weights = new Float64Array(phases * taps);
  for (let phase = 0; phase < phases; phase++) {
    const fraction = phase / phases;
    for (let j = -reach; j <= reach; j++) weights[phase * taps + j + reach] = weightAt(Math.abs(fraction - j));
  }
  return { step, phases, reach, taps, weights };
}
