/**
 * Peak, rms and crest factor of a record.
 * Crest factor = peak / rms, in dB 20·log10(peak/rms); a sine's is √2 = 3.0103 dB
 * and a square wave's 0 dB (closed forms: the rms of A·sin is A/√2).
 * Sums of squares are compensated (Neumaier) so long records lose no precision.
 */
import { amplitudeDb } from './decibels.ts';
import { checkSamples } from './validate.ts';

export interface LevelOptions {
  /** Measure about the mean (AC levels; for a biased LED current). Default false. */
  removeMean?: boolean;
}

export interface Levels {
  /** Largest |x| (about the mean when removeMean). */
  readonly peak: number;
  readonly rms: number;
  readonly mean: number;
  /** 20·log10(peak / rms); null for a silent record, where it is undefined. */
  readonly crestFactorDb: number | null;
  /** 20·log10 of peak and rms re 1 signal unit (e.g. dBV for volts, dBFS for full-scale samples). */
  readonly peakDb: number;
  readonly rmsDb: number;
}

export function levels(samples: ArrayLike<number>, options: LevelOptions = {}): Levels {
  checkSamples('samples', samples, 1);
  const length = samples.length;
  const mean = compensatedSum(samples, (x) => x) / length;
  const offset = options.removeMean ? mean : 0;
  let peak = 0;
  for (let i = 0; i < length; i++) peak = Math.max(peak, Math.abs(samples[i] - offset));
  const rms = Math.sqrt(compensatedSum(samples, (x) => (x - offset) * (x - offset)) / length);
  return {
    peak,
    rms,
    mean,
    crestFactorDb: rms > 0 ? 20 * Math.log10(peak / rms) : null,
    peakDb: amplitudeDb(peak),
    rmsDb: amplitudeDb(rms),
  };
}

/** Root mean square (about zero). */
export function rms(samples: ArrayLike<number>): number {
  return levels(samples).rms;
}

/** Neumaier's compensated sum of f(x_i). */
function compensatedSum(samples: ArrayLike<number>, f: (x: number) => number): number {
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < samples.length; i++) {
    const term = f(samples[i]);
    const next = sum + term;
    compensation += Math.abs(sum) >= Math.abs(term) ? sum - next + term : term - next + sum;
    sum = next;
  }
  return sum + compensation;
}
