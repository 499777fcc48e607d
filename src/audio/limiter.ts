/**
 * Safe-level peak limiter for what glowtalk plays: pure, deterministic code over a whole
 * buffer (playback prepares the buffer before it starts, so the look-ahead costs no latency).
 *
 * Gain computation, per sample n (L = look-ahead samples):
 *   needed[n] = min(1, ceiling / |x[n]|)                      gain that would just fit x[n]
 *   window[n] = min(needed[n … n+L−1])                         look ahead: see the peak coming
 *   held[n]   = window[n] if it is lower than held[n−1],        instant attack on the target,
 *               else held[n−1] + (window[n] − held[n−1])·(1−e^(−1/(fs·release)))  smooth release
 *   gain[n]   = mean(held[n−L+1 … n])                          turns each step into an L-sample ramp
 * Every held[j] in the mean belongs to a window that contains n, so held[j] ≤ needed[n] and
 * gain[n] ≤ needed[n]: |gain[n]·x[n]| ≤ ceiling holds exactly, not just approximately.
 * A final clamp only absorbs floating-point rounding of the running mean.
 * Samples below the ceiling with no peak within L samples pass bit-identical (gain 1).
 */
import { InputError } from '../errors.ts';

export interface LimiterOptions {
  /** Output never exceeds this peak, dB re full scale 1. Default −6 dB (common practice, no source: leaves room for inter-sample peaks in the playback chain). */
  ceilingDb?: number;
  /** Look-ahead = attack ramp length. Default 0.005 s. */
  lookAheadSeconds?: number;
  /** Release time constant. Default 0.1 s. */
  releaseSeconds?: number;
}

export interface LimiterResult {
  output: Float32Array<ArrayBuffer>;
  /** Largest gain reduction applied, dB (0 when the signal was already below the ceiling). */
  maxReductionDb: number;
  /** Samples whose gain was below 1. */
  reducedSamples: number;
}

export const DEFAULT_CEILING_DB = -6;

/** Largest float32 not above `value`, so that a rounded output cannot cross the ceiling. */
function float32AtMost(value: number): number {
  const rounded = Math.fround(value);
  if (rounded <= value) return rounded;
  const bits = new Float32Array([rounded]);
  new Uint32Array(bits.buffer)[0] -= 1; // positive float: previous representable value
  return bits[0];
}

export function limitPeaks(input: Float32Array, sampleRateHertz: number, options: LimiterOptions = {}): LimiterResult {
  const ceilingDb = options.ceilingDb ?? DEFAULT_CEILING_DB;
  const lookAheadSeconds = options.lookAheadSeconds ?? 0.005;
  const releaseSeconds = options.releaseSeconds ?? 0.1;
  if (!(Number.isFinite(sampleRateHertz) && sampleRateHertz > 0)) {
    throw new InputError('sampleRateHertz', 'a positive number of hertz', `got ${sampleRateHertz}`);
  }
  if (!(Number.isFinite(ceilingDb) && ceilingDb <= 0 && ceilingDb >= -60)) {
    throw new InputError('ceilingDb', 'a ceiling from −60 to 0 dB re full scale', `got ${ceilingDb}`);
  }
  if (!(lookAheadSeconds >= 0 && lookAheadSeconds <= 0.1)) {
    throw new InputError('lookAheadSeconds', 'from 0 to 0.1 s', `got ${lookAheadSeconds}`);
  }
  if (!(releaseSeconds > 0 && releaseSeconds <= 10)) {
    throw new InputError('releaseSeconds', 'above 0 s and at most 10 s', `got ${releaseSeconds}`);
  }
  const n = input.length;
  const ceiling = float32AtMost(10 ** (ceilingDb / 20));
  const span = Math.max(1, Math.round(lookAheadSeconds * sampleRateHertz));
  const releaseStep = 1 - Math.exp(-1 / (sampleRateHertz * releaseSeconds));

  // needed gain per sample
  const needed = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const magnitude = Math.abs(input[i]);
    if (!Number.isFinite(magnitude)) throw new InputError(`samples[${i}]`, 'a finite number', `got ${input[i]}`);
    needed[i] = magnitude > ceiling ? ceiling / magnitude : 1;
  }

  // window[i] = min(needed[i … i+span−1]) by a monotone deque of indices (O(n)).
  const window = new Float64Array(n);
  const deque = new Int32Array(n);
  let head = 0;
  let tail = 0;
  let next = 0; // next index to push
  for (let i = 0; i < n; i++) {
    const last = Math.min(n - 1, i + span - 1);
    for (; next <= last; next++) {
      while (tail > head && needed[deque[tail - 1]] >= needed[next]) tail--;
      deque[tail++] = next;
    }
    while (deque[head] < i) head++;
    window[i] = needed[deque[head]];
  }

  // held: instant attack, exponential release; then the span-long moving mean.
  const output = new Float32Array(n);
  const history = new Float64Array(span).fill(1); // held values before the start count as 1
  let sum = span;
  let held = 1;
  let minimumGain = 1;
  let reducedSamples = 0;
  for (let i = 0; i < n; i++) {
    held = window[i] < held ? window[i] : held + (window[i] - held) * releaseStep;
    if (window[i] - held < 1e-7) held = window[i]; // end the exponential tail (1e-7 ≈ 1e-6 dB)
    const slot = i % span;
    sum += held - history[slot];
    history[slot] = held;
    // Recompute the sum exactly once per span so rounding drift cannot build up.
    if (slot === span - 1) {
      sum = 0;
      for (let k = 0; k < span; k++) sum += history[k];
    }
    let gain = Math.min(1, sum / span);
    if (gain > needed[i]) gain = needed[i]; // rounding guard only
    if (gain < 1) reducedSamples++;
    if (gain < minimumGain) minimumGain = gain;
    const y = input[i] * gain;
    output[i] = y > ceiling ? ceiling : y < -ceiling ? -ceiling : y;
  }
  return { output, maxReductionDb: minimumGain < 1 ? -20 * Math.log10(minimumGain) : 0, reducedSamples };
}
