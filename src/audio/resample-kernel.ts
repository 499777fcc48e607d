/**
 * The band-limited interpolation kernel of resample.ts and the loop that applies it,
 * shared by the whole-signal resampler and the streaming one (resample-stream.ts) so
 * the two compute every output sample with the same weights in the same order.
 * Design figures are in resample.ts.
 */
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

interface RationalBank {
  /** Input samples advanced per `phases` outputs (from/gcd) and the number of phases (to/gcd). */
  step: number;
  phases: number;
  /** Taps reach this many input samples either side of the integer part of the position. */
  reach: number;
  taps: number;
  weights: Float64Array;
}

/** The kernel for one pair of rates. */
export interface ResampleKernel {
  fromHertz: number;
  toHertz: number;
  /** How far the kernel reaches either side of an output's position, in input samples. */
  reachInput: number;
  /** Kernel weight at a distance in input samples. */
  weightAt: (distanceInput: number) => number;
  /** Per-phase weights when both rates are integers with a small enough reduced ratio. */
  bank: RationalBank | null;
}

export function resampleKernel(fromHertz: number, toHertz: number): ResampleKernel {
  const { halfWidth, values } = kernelTable();
  const lowerHertz = Math.min(fromHertz, toHertz);
  // u (kernel argument, lower-rate samples) = (input position − n) × lowerPerInput
  const lowerPerInput = lowerHertz / fromHertz;
  const tablePerInput = lowerPerInput * TABLE_POINTS_PER_SAMPLE;
  const reachInput = halfWidth / lowerPerInput;
  const tableEnd = halfWidth * TABLE_POINTS_PER_SAMPLE;
  const weightAt = (distanceInput: number): number => {
    const tableIndex = distanceInput * tablePerInput;
    if (tableIndex >= tableEnd) return 0;
    const i = tableIndex | 0;
    return (values[i] + (tableIndex - i) * (values[i + 1] - values[i])) * lowerPerInput;
  };
  return { fromHertz, toHertz, reachInput, weightAt, bank: rationalBank(fromHertz, toHertz, reachInput, weightAt) };
}

/** The last input index output k reads (before clipping to the signal's end). */
export function lastInputOf(kernel: ResampleKernel, k: number): number {
  const bank = kernel.bank;
  if (bank) return Math.floor((k * bank.step) / bank.phases) + bank.reach;
  return Math.floor((k * kernel.fromHertz) / kernel.toHertz + kernel.reachInput);
}

/** The first input index output k reads. */
export function firstInputOf(kernel: ResampleKernel, k: number): number {
  const bank = kernel.bank;
  if (bank) return Math.max(0, Math.floor((k * bank.step) / bank.phases) - bank.reach);
  return Math.max(0, Math.ceil((k * kernel.fromHertz) / kernel.toHertz - kernel.reachInput));
}

/**
 * Output samples k = kStart…kEnd−1 into output[outAt…]. `samples[j]` holds input
 * sample `offset + j`; `last` is the index of the signal's last input sample (the
 * signal is zero past it); every input from firstInputOf(kStart) to
 * min(last, lastInputOf(kEnd − 1)) must be present.
 */
export function resampleSpan(
  kernel: ResampleKernel,
  samples: Float64Array,
  offset: number,
  last: number,
  kStart: number,
  kEnd: number,
  output: Float64Array,
  outAt: number,
): void {
  const bank = kernel.bank;
  if (bank) {
    // Integer rates: output k sits at input position k·p/q; only q distinct fractional phases occur.
    const { step, phases, reach, taps, weights } = bank;
    for (let k = kStart; k < kEnd; k++) {
      const whole = Math.floor((k * step) / phases);
      const phase = k * step - whole * phases;
      const row = phase * taps - (whole - reach) + offset;
      const first = Math.max(0, whole - reach) - offset;
      const final = Math.min(last, whole + reach) - offset;
      // Four running sums, not one: each sum waits on the one before it, and a single chain of
      // additions leaves the processor idle between them. Taps are dealt to the sums by their
      // place from `first`, so a chunked (streamed) run adds the same products in the same order.
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      let j = first;
      for (; j + 3 <= final; j += 4) {
        s0 += samples[j] * weights[row + j];
        s1 += samples[j + 1] * weights[row + j + 1];
        s2 += samples[j + 2] * weights[row + j + 2];
        s3 += samples[j + 3] * weights[row + j + 3];
      }
      for (; j <= final; j++) s0 += samples[j] * weights[row + j];
      output[outAt + k - kStart] = s0 + s1 + (s2 + s3);
    }
    return;
  }
  const { fromHertz, toHertz, reachInput, weightAt } = kernel;
  for (let k = kStart; k < kEnd; k++) {
    const position = (k * fromHertz) / toHertz; // exact time k/to in input samples, no accumulation
    const first = Math.max(0, Math.ceil(position - reachInput));
    const final = Math.min(last, Math.floor(position + reachInput));
    let sum = 0;
    for (let n = first; n <= final; n++) sum += samples[n - offset] * weightAt(Math.abs(position - n));
    output[outAt + k - kStart] = sum;
  }
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
