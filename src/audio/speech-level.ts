/**
 * Active speech level after ITU-T Recommendation P.56, method B (written from the
 * Recommendation's description of the method; parameter values as in its clause
 * "values of the parameters"):
 *
 * 1. Long-term: s = Σ x², n = number of samples.
 * 2. Envelope: two cascaded first-order smoothers of |x| with time constant T = 0.03 s,
 *    g = exp(−1 / (fs·T)):  q(i) = g·q(i−1) + (1−g)·|x(i)|,  p(i) = g·p(i−1) + (1−g)·q(i).
 * 3. For each threshold c_j of a ladder: a sample is active while p(i) ≥ c_j, and for a
 *    hangover of I = round(H·fs) samples (H = 0.2 s) after p last reached c_j;
 *    a_j counts the active samples.
 * 4. A_j = 10·log10(s / a_j) is the level the signal would have if only the a_j active
 *    samples carried its energy; C_j = 20·log10(c_j). The active level is the value of A
 *    where A − C equals the margin M = 15.9 dB, found by linear interpolation (in dB)
 *    between the two neighbouring thresholds whose differences straddle M.
 * 5. Activity factor = (s/n) / 10^(active/10).
 *
 * Where this differs from a fixed-point meter: the Recommendation's thresholds are fixed
 * steps below the converter's full scale. Here the ladder is anchored to the signal's own
 * peak |x| (c_j = peak·2^−j, j = 0…LADDER_STEPS−1, i.e. 6.02 dB apart, covering 150 dB), so
 * that the result is exactly gain-invariant for floating-point data, which has no fixed
 * full scale. The interpolation makes the result insensitive to where the rungs sit.
 *
 * Levels are in dB re an rms of 1 (a full-scale sine of peak 1 reads −3.01 dB).
 *
 * The ladder needs the peak first, so the measurement is two passes over the signal
 * (energy and peak, then the envelope's counts). activeSpeechLevelOf takes the passes
 * chunk by chunk, for a recording too long to hold; activeSpeechLevel is the same on
 * an array in memory (one chunk), with the same arithmetic in the same order.
 */
import { InputError } from '../errors.ts';

export const P56_ENVELOPE_SECONDS = 0.03;
export const P56_HANGOVER_SECONDS = 0.2;
export const P56_MARGIN_DB = 15.9;
const LADDER_STEPS = 25;

export interface SpeechLevel {
  /** 10·log10 of the mean square over active samples; −Infinity for digital silence. */
  activeLevelDb: number;
  /** Fraction of the samples judged active, 0…1. */
  activityFactor: number;
  /** 10·log10 of the mean square over all samples; −Infinity for digital silence. */
  longTermRmsDb: number;
}

export function activeSpeechLevel(samples: Float64Array | Float32Array, sampleRateHertz: number): SpeechLevel {
  return activeSpeechLevelOf(sampleRateHertz, (take) => take(samples));
}

/** One pass over the signal: calls `take` with its chunks in order. */
export type SignalPass = (take: (chunk: Float64Array | Float32Array) => void) => void;

/** The active speech level of a signal read in two passes (`pass` is called twice). */
export function activeSpeechLevelOf(sampleRateHertz: number, pass: SignalPass): SpeechLevel {
  if (!(Number.isFinite(sampleRateHertz) && sampleRateHertz > 0)) {
    throw new InputError('sampleRateHertz', 'a positive number of hertz', `got ${sampleRateHertz}`);
  }
  const energy = new SpeechEnergy();
  pass((chunk) => energy.push(chunk));
  if (energy.count === 0) throw new InputError('samples', 'at least one sample', 'got none');
  if (energy.sumSquares === 0) return { activeLevelDb: -Infinity, activityFactor: 0, longTermRmsDb: -Infinity };
  const activity = new SpeechActivity(energy.peak, sampleRateHertz);
  pass((chunk) => activity.push(chunk));
  return activity.level(energy);
}

/** First pass: sum of squares and peak |x|. */
export class SpeechEnergy {
  count = 0;
  sumSquares = 0;
  peak = 0;

  push(samples: Float64Array | Float32Array): void {
    const first = this.count;
    this.count += samples.length;
    let sumSquares = this.sumSquares;
    let peak = this.peak;
    for (let i = 0; i < samples.length; i++) {
      const x = samples[i];
      if (!Number.isFinite(x)) throw new InputError(`samples[${first + i}]`, 'a finite number', `got ${x}`);
      sumSquares += x * x;
      const magnitude = Math.abs(x);
      peak = magnitude > peak ? magnitude : peak;
      // Stored every sample (see SpeechActivity.push).
      this.sumSquares = sumSquares;
      this.peak = peak;
    }
  }
}

/**
 * Second pass: the envelope against the threshold ladder under the peak. The rungs are nested
 * (c_j halves with j), so at each sample the envelope is at or above every rung from some j₀ on
 * and below the rest: the pass follows j₀, which moves a rung or so per sample, instead of
 * testing all LADDER_STEPS rungs. A rung's active count is then its samples at or above it plus,
 * for each stretch below it after it was reached, the stretch's length up to the hangover: the
 * same counts as a counter per rung and sample (see the tests), in a fraction of the time.
 */
export class SpeechActivity {
  private readonly thresholds = new Float64Array(LADDER_STEPS);
  /** Samples whose lowest rung reached is j (index LADDER_STEPS: none reached). */
  private readonly lowestReached = new Float64Array(LADDER_STEPS + 1);
  /** Hangover samples counted for each rung, from stretches below it that have ended. */
  private readonly hangoverCounts = new Float64Array(LADDER_STEPS);
  /** Where the stretch below each rung began (the sample after it was last reached); −1: none open. */
  private readonly belowSince = new Float64Array(LADDER_STEPS).fill(-1);
  private readonly hangoverSamples: number;
  private readonly g: number;
  private q = 0;
  private p = 0;
  /** The lowest rung index the envelope is at or above (LADDER_STEPS: none). */
  private reached = LADDER_STEPS;
  private samples = 0;

  constructor(peak: number, sampleRateHertz: number) {
    for (let j = 0; j < LADDER_STEPS; j++) this.thresholds[j] = peak * 2 ** -j;
    this.hangoverSamples = Math.round(P56_HANGOVER_SECONDS * sampleRateHertz);
    this.g = Math.exp(-1 / (sampleRateHertz * P56_ENVELOPE_SECONDS));
  }

  /**
   * The engine compiles this long loop while it runs; stores after the loop, not yet run then,
   * would send the compiled loop back to the interpreter in every render: so the state is stored
   * every sample.
   */
  push(samples: Float64Array | Float32Array): void {
    const { g, thresholds, lowestReached, hangoverCounts, belowSince, hangoverSamples } = this;
    let q = this.q;
    let p = this.p;
    let reached = this.reached;
    const first = this.samples;
    this.samples += samples.length;
    for (let i = 0; i < samples.length; i++) {
      q = g * q + (1 - g) * Math.abs(samples[i]);
      p = g * p + (1 - g) * q;
      const at = first + i;
      // Rungs the envelope has come up to: a stretch below them ends here.
      while (reached > 0 && p >= thresholds[reached - 1]) {
        reached--;
        const since = belowSince[reached];
        if (since >= 0) hangoverCounts[reached] += Math.min(at - since, hangoverSamples);
        belowSince[reached] = -1;
      }
      // Rungs it has fallen below: a stretch below them begins here.
      while (reached < LADDER_STEPS && p < thresholds[reached]) {
        belowSince[reached] = at;
        reached++;
      }
      lowestReached[reached]++;
      this.q = q;
      this.p = p;
      this.reached = reached;
    }
  }

  /** Active samples per rung: at or above it, or within the hangover after it. */
  private activeCounts(): Float64Array {
    const counts = new Float64Array(LADDER_STEPS);
    let atOrAbove = 0;
    for (let j = 0; j < LADDER_STEPS; j++) {
      atOrAbove += this.lowestReached[j];
      const since = this.belowSince[j];
      const open = since >= 0 ? Math.min(this.samples - since, this.hangoverSamples) : 0;
      counts[j] = atOrAbove + this.hangoverCounts[j] + open;
    }
    return counts;
  }

  /** The level from the counts and the first pass's energy. */
  level(energy: SpeechEnergy): SpeechLevel {
    const thresholds = this.thresholds;
    const activeCounts = this.activeCounts();
    const { sumSquares, count: n } = energy;
    const longTermRmsDb = 10 * Math.log10(sumSquares / n);
    // Walk from the lowest threshold (largest count, A − C large) upwards until A − C ≤ M.
    let previousA = NaN;
    let previousDelta = NaN;
    let activeLevelDb = NaN;
    for (let j = LADDER_STEPS - 1; j >= 0; j--) {
      if (activeCounts[j] === 0) break;
      const a = 10 * Math.log10(sumSquares / activeCounts[j]);
      const delta = a - 20 * Math.log10(thresholds[j]);
      if (delta <= P56_MARGIN_DB) {
        if (Number.isNaN(previousDelta)) activeLevelDb = a; // even the lowest rung is within the margin
        else {
          const fraction = (previousDelta - P56_MARGIN_DB) / (previousDelta - delta);
          activeLevelDb = previousA + fraction * (a - previousA);
        }
        break;
      }
      previousA = a;
      previousDelta = delta;
    }
    // No rung came within the margin (an isolated click): the highest active rung is the best estimate.
    if (Number.isNaN(activeLevelDb)) activeLevelDb = Number.isNaN(previousA) ? longTermRmsDb : previousA;

    const activityFactor = Math.min(1, (sumSquares / n) / 10 ** (activeLevelDb / 10));
    return { activeLevelDb, activityFactor, longTermRmsDb };
  }
}
