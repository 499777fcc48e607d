/**
 * STOI, the short-time objective intelligibility measure of C. H. Taal,
 * R. C. Hendriks, R. Heusdens and J. Jensen, "An algorithm for
 * intelligibility prediction of time–frequency weighted noisy speech",
 * IEEE Trans. Audio, Speech, Lang. Process. 19(7), 2125–2136, 2011.
 * Written from the paper's description (sec. II) with its parameters:
 * - both signals resampled to 10 kHz (band-limited, audio/resample.ts);
 * - silent frames dropped from both: 256-sample frames, 50 % overlap, Hann
 *   window; frames whose clean energy is more than 40 dB below the loudest
 *   clean frame go, and the rest are overlap-added back together;
 * - STFT: 256-sample Hann frames, 50 % overlap, zero-padded to 512 points;
 * - 15 one-third-octave bands, centres 150·2^(k/3) Hz (k = 0..14, 150 to
 *   3809.76 Hz), edges at the geometric means of neighbouring centres
 *   (133.63 to 4276.31 Hz), each rounded to the nearest DFT bin;
 * - band envelope X_j(m) = √(Σ_{k in band j} |X(k, m)|²);
 * - segments of N = 30 frames (384 ms); per band and segment the degraded
 *   envelope is scaled to the clean one's energy, α = ‖x‖/‖y‖, then clipped
 *   to (1 + 10^(−β/20))·x with β = −15 dB (factor 6.623413);
 * - d = mean over all bands and segments of the correlation coefficient of
 *   the clean and the normalised, clipped degraded envelope.
 * Details the paper leaves open were checked against the authors' reference
 * code (frame starts 0, 128, … while a whole frame plus one sample fits; the
 * Hann window sampled without zero end points, 0.5 − 0.5cos(2πn/257),
 * n = 1..256; band edges to the nearest bin, upper edge exclusive).
 * Where a correlation is undefined (a segment of constant clean envelope, or
 * an all-zero degraded one) this file takes it as 0 instead of NaN.
 */
import { resample } from '../audio/resample.ts';
import { InputError } from '../errors.ts';
import { align, type AlignOptions } from './align.ts';
import { fftPlan } from './fft.ts';
import { checkRate, checkSameLength, checkSamples } from './validate.ts';

export const STOI_PARAMETERS = {
  rateHertz: 10000,
  frameSamples: 256,
  hopSamples: 128,
  fftSize: 512,
  bandCount: 15,
  lowestCentreHertz: 150,
  segmentFrames: 30,
  betaDb: -15,
  dynamicRangeDb: 40,
} as const;

const P = STOI_PARAMETERS;

/** Band centres 150·2^(k/3) Hz and bin ranges [lowBin, highBin) at 10 kHz / 512 points. */
export function stoiBands(): { centresHertz: Float64Array; lowBins: Int32Array; highBins: Int32Array } {
  const binHertz = P.rateHertz / P.fftSize;
  const bins = P.fftSize / 2 + 1;
  const centresHertz = new Float64Array(P.bandCount);
  const lowBins = new Int32Array(P.bandCount);
  const highBins = new Int32Array(P.bandCount);
  const nearest = (hertz: number): number => Math.min(bins - 1, Math.round(hertz / binHertz));
  for (let k = 0; k < P.bandCount; k++) {
    centresHertz[k] = P.lowestCentreHertz * 2 ** (k / 3);
    lowBins[k] = nearest(P.lowestCentreHertz * 2 ** ((2 * k - 1) / 6));
    highBins[k] = nearest(P.lowestCentreHertz * 2 ** ((2 * k + 1) / 6));
  }
  return { centresHertz, lowBins, highBins };
}

/** The clipping factor 1 + 10^(−β/20) for β = −15 dB. */
export const STOI_CLIP_FACTOR = 1 + 10 ** (-P.betaDb / 20);

/** STOI of `degraded` against `clean` (same length, same rate, already aligned). In [−1, 1]; 1 for identical. */
export function stoi(clean: ArrayLike<number>, degraded: ArrayLike<number>, rateHertz: number): number {
  checkRate('rateHertz', rateHertz);
  checkSamples('clean', clean);
  checkSamples('degraded', degraded);
  checkSameLength('clean', clean, 'degraded', degraded);
  let x = atStoiRate(clean, rateHertz, true);
  let y = atStoiRate(degraded, rateHertz, false);
  [x, y] = removeSilentFrames(x, y);
  const clean15 = bandEnvelopes(x);
  const degraded15 = bandEnvelopes(y);
  const frames = clean15.length / P.bandCount;
  if (frames < P.segmentFrames) {
    throw new InputError(
      'clean',
      `at least ${P.segmentFrames} frames of active speech after silence removal (about ${((P.segmentFrames + 1) * P.hopSamples) / P.rateHertz} s)`,
      `got ${frames} frames`,
    );
  }
  const n = P.segmentFrames;
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  let total = 0;
  let count = 0;
  for (let end = n; end <= frames; end++) {
    for (let band = 0; band < P.bandCount; band++) {
      const row = band * frames;
      let energyX = 0;
      let energyY = 0;
      for (let i = 0; i < n; i++) {
        xs[i] = clean15[row + end - n + i];
        ys[i] = degraded15[row + end - n + i];
        energyX += xs[i] * xs[i];
        energyY += ys[i] * ys[i];
      }
      const alpha = energyY > 0 ? Math.sqrt(energyX / energyY) : 0;
      for (let i = 0; i < n; i++) ys[i] = Math.min(alpha * ys[i], STOI_CLIP_FACTOR * xs[i]);
      total += correlation(xs, ys);
      count++;
    }
  }
  return total / count;
}

/**
 * STOI after aligning the degraded signal to the clean one in time and level
 * (align.ts; default ±0.5 s). The lengths may differ. Both are brought to
 * 10 kHz first, so the delay is found to 0.1 ms, STOI's own time resolution.
 */
export function stoiAligned(clean: ArrayLike<number>, degraded: ArrayLike<number>, rateHertz: number, options: AlignOptions = {}): number {
  checkRate('rateHertz', rateHertz);
  checkSamples('clean', clean);
  checkSamples('degraded', degraded);
  const x = atStoiRate(clean, rateHertz, true);
  const y = atStoiRate(degraded, rateHertz, false);
  const { aligned } = align(x, y, P.rateHertz, options);
  return stoi(x, aligned, P.rateHertz);
}

/**
 * The last clean signal brought to 10 kHz, kept for the next call: the page and the sweeps measure
 * one clean source against render after render, and resampling it is about a third of STOI's
 * time. Only for signals up to MAX_KEPT_SAMPLES long, so that a long one is not held on to.
 */
let lastClean: { rateHertz: number; samples: Float64Array; resampled: Float64Array } | null = null;
const MAX_KEPT_SAMPLES = 1 << 22;

/** A fresh copy of `signal` at STOI's rate (10 kHz); `clean` marks the reference, which is kept. */
function atStoiRate(signal: ArrayLike<number>, rateHertz: number, clean: boolean): Float64Array {
  const copy = Float64Array.from(signal);
  if (rateHertz === P.rateHertz) return copy;
  const last = lastClean;
  if (clean && last && last.rateHertz === rateHertz && sameSamples(last.samples, copy)) return last.resampled.slice();
  const resampled = resample(copy, rateHertz, P.rateHertz);
  if (clean && copy.length <= MAX_KEPT_SAMPLES) lastClean = { rateHertz, samples: copy, resampled: resampled.slice() };
  return resampled;
}

function sameSamples(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** Hann window of the reference code: 0.5 − 0.5·cos(2πn/(N+1)), n = 1..N (no zero end points). */
function referenceHann(length: number): Float64Array {
  const w = new Float64Array(length);
  for (let n = 1; n <= length; n++) w[n - 1] = 0.5 - 0.5 * Math.cos((2 * Math.PI * n) / (length + 1));
  return w;
}

/** Number of frames: starts 0, hop, 2·hop, … while start < length − frame. */
function frameCount(length: number): number {
  return length > P.frameSamples ? Math.floor((length - P.frameSamples - 1) / P.hopSamples) + 1 : 0;
}

function removeSilentFrames(x: Float64Array, y: Float64Array): [Float64Array, Float64Array] {
  const w = referenceHann(P.frameSamples);
  const frames = frameCount(x.length);
  const energyDb = new Float64Array(frames);
  let loudestDb = -Infinity;
  for (let f = 0; f < frames; f++) {
    let sum = 0;
    for (let i = 0; i < P.frameSamples; i++) {
      const v = x[f * P.hopSamples + i] * w[i];
      sum += v * v;
    }
    energyDb[f] = 20 * Math.log10(Math.sqrt(sum) / Math.sqrt(P.frameSamples));
    loudestDb = Math.max(loudestDb, energyDb[f]);
  }
  if (!Number.isFinite(loudestDb)) {
    throw new InputError('clean', `a non-silent signal at least ${(P.frameSamples + 1) / P.rateHertz} s long (at 10 kHz)`, 'it is silent or too short');
  }
  let kept = 0;
  for (let f = 0; f < frames; f++) if (energyDb[f] - loudestDb + P.dynamicRangeDb > 0) kept++;
  const length = (kept - 1) * P.hopSamples + P.frameSamples;
  const xOut = new Float64Array(length);
  const yOut = new Float64Array(length);
  let slot = 0;
  for (let f = 0; f < frames; f++) {
    if (!(energyDb[f] - loudestDb + P.dynamicRangeDb > 0)) continue;
    const from = f * P.hopSamples;
    const to = slot * P.hopSamples;
    for (let i = 0; i < P.frameSamples; i++) {
      xOut[to + i] += x[from + i] * w[i];
      yOut[to + i] += y[from + i] * w[i];
    }
    slot++;
  }
  return [xOut, yOut];
}

/** One-third-octave band envelopes, band-major: out[band·frames + frame]. */
function bandEnvelopes(signal: Float64Array): Float64Array {
  const { lowBins, highBins } = stoiBands();
  const w = referenceHann(P.frameSamples);
  const frames = frameCount(signal.length);
  const plan = fftPlan(P.fftSize);
  const input = new Float64Array(P.fftSize);
  const spectrum = new Float64Array(2 * P.fftSize);
  const out = new Float64Array(P.bandCount * frames);
  for (let f = 0; f < frames; f++) {
    for (let i = 0; i < P.frameSamples; i++) input[i] = signal[f * P.hopSamples + i] * w[i];
    plan.realTransform(spectrum, input);
    for (let band = 0; band < P.bandCount; band++) {
      let sum = 0;
      for (let k = lowBins[band]; k < highBins[band]; k++) sum += spectrum[2 * k] ** 2 + spectrum[2 * k + 1] ** 2;
      out[band * frames + f] = Math.sqrt(sum);
    }
  }
  return out;
}

/** Sample correlation coefficient; 0 where a vector is constant (undefined). */
function correlation(a: Float64Array, b: Float64Array): number {
  const n = a.length;
  let meanA = 0;
  let meanB = 0;
  for (let i = 0; i < n; i++) {
    meanA += a[i];
    meanB += b[i];
  }
  meanA /= n;
  meanB /= n;
  let ab = 0;
  let aa = 0;
  let bb = 0;
  for (let i = 0; i < n; i++) {
    const da = a[i] - meanA;
    const db = b[i] - meanB;
    ab += da * db;
    aa += da * da;
    bb += db * db;
  }
  return aa > 0 && bb > 0 ? ab / Math.sqrt(aa * bb) : 0;
}
