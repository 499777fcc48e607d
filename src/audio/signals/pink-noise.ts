/**
 * Seeded pink (1/f power) noise. White Gaussian noise passes through first-order pole–zero pairs
 * spaced two per decade from 2 Hz up past the sample rate, each zero half a step (√(10^½)) above
 * its pole, which averages −10 dB per decade (−3.01 dB per octave); poles and zeros map to the
 * z-plane as e^{−2πf/fs}. Near Nyquist that mapping lifts the response, so one extra zero at
 * z = −a, with a chosen here by a small search, bends it back. Design error found by that search:
 * within ±0.25 dB of 1/f from 20 Hz to min(20 kHz, 0.45·fs) for rates of 8 kHz and up (our own
 * design; the pole–zero idea is common practice, no source).
 */
import { SeededRandom } from '../../numeric/random.ts';
import { InputError } from '../../errors.ts';
import { requireNonNegative, requireSeed, sampleCount } from './arguments.ts';

export interface PinkNoiseOptions {
  sampleRateHertz: number;
  seconds: number;
  /** RMS amplitude of the result (it is scaled to exactly this). */
  rmsAmplitude: number;
  seed: number;
}

const LOWEST_POLE_HERTZ = 2;
const POLES_PER_DECADE = 2;
const WARM_UP_SECONDS = 0.5; // several time constants of the 2 Hz pole, so the output starts settled

export interface PinkFilter {
  poles: Float64Array;
  zeros: Float64Array;
  /** Coefficient a of the extra factor (1 + a·z⁻¹). */
  nyquistZero: number;
}

/** |H(e^{jω})|² of the filter at `hertz`. */
export function pinkPowerGain(filter: PinkFilter, hertz: number, sampleRateHertz: number): number {
  const cosine = Math.cos((2 * Math.PI * hertz) / sampleRateHertz);
  let gain = 1 + 2 * filter.nyquistZero * cosine + filter.nyquistZero ** 2;
  for (let i = 0; i < filter.poles.length; i++) {
    const z = filter.zeros[i];
    const p = filter.poles[i];
    gain *= (1 - 2 * z * cosine + z * z) / (1 - 2 * p * cosine + p * p);
  }
  return gain;
}

/** Worst deviation in dB of f·|H|² from flat over 20 Hz to min(20 kHz, 0.45·fs). */
export function pinkDesignErrorDb(filter: PinkFilter, sampleRateHertz: number): number {
  const top = Math.min(20000, 0.45 * sampleRateHertz);
  let low = Infinity;
  let high = -Infinity;
  for (let i = 0; ; i++) {
    const hertz = 20 * 1.02 ** i; // grid from an integer index, not accumulated
    if (hertz > top) break;
    const level = 10 * Math.log10(pinkPowerGain(filter, hertz, sampleRateHertz) * hertz);
    low = Math.min(low, level);
    high = Math.max(high, level);
  }
  return (high - low) / 2;
}

export function designPinkFilter(sampleRateHertz: number): PinkFilter {
  const step = 10 ** (1 / POLES_PER_DECADE);
  const poles: number[] = [];
  const zeros: number[] = [];
  for (let i = 0; LOWEST_POLE_HERTZ * step ** i < 2 * sampleRateHertz; i++) {
    const poleHertz = LOWEST_POLE_HERTZ * step ** i;
    poles.push(Math.exp((-2 * Math.PI * poleHertz) / sampleRateHertz));
    zeros.push(Math.exp((-2 * Math.PI * poleHertz * Math.sqrt(step)) / sampleRateHertz));
  }
  const filter: PinkFilter = { poles: Float64Array.from(poles), zeros: Float64Array.from(zeros), nyquistZero: 0 };
  let best = 0;
  let bestError = Infinity;
  for (let i = 0; i <= 300; i++) {
    filter.nyquistZero = i / 1000;
    const error = pinkDesignErrorDb(filter, sampleRateHertz);
    if (error < bestError) {
      bestError = error;
      best = filter.nyquistZero;
    }
  }
  filter.nyquistZero = best;
  return filter;
}

export function pinkNoise(options: PinkNoiseOptions): Float64Array {
  const { sampleRateHertz, seconds, rmsAmplitude, seed } = options;
  const count = sampleCount(seconds, sampleRateHertz);
  if (sampleRateHertz < 8000) throw new InputError('sampleRateHertz', 'at least 8000 Hz for pink noise', `got ${sampleRateHertz}`);
  requireNonNegative('rmsAmplitude', rmsAmplitude);
  requireSeed('seed', seed);
  const filter = designPinkFilter(sampleRateHertz);
  const sections = filter.poles.length;
  const previousIn = new Float64Array(sections + 1);
  const previousOut = new Float64Array(sections);
  const random = new SeededRandom(seed);
  const warmUp = Math.round(WARM_UP_SECONDS * sampleRateHertz);
  const samples = new Float64Array(count);
  let sumSquares = 0;
  for (let n = -warmUp; n < count; n++) {
    let x = random.normal();
    for (let s = 0; s < sections; s++) {
      const y = x - filter.zeros[s] * previousIn[s] + filter.poles[s] * previousOut[s];
      previousIn[s] = x;
      previousOut[s] = y;
      x = y;
    }
    const y = x + filter.nyquistZero * previousIn[sections];
    previousIn[sections] = x;
    if (n >= 0) {
      samples[n] = y;
      sumSquares += y * y;
    }
  }
  const scale = sumSquares > 0 ? rmsAmplitude / Math.sqrt(sumSquares / count) : 0;
  for (let n = 0; n < count; n++) samples[n] *= scale;
  return samples;
}
