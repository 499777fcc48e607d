/**
 * A speech-like test signal of OUR OWN DESIGN (not a standard signal; no standard's weighting or
 * statistics are claimed). It is meant to load a link the way talk does: bursts at a syllabic rate,
 * silences between words, a voiced spectrum that falls above a few hundred hertz, high peaks.
 *
 * - Words of 1–3 syllables separated by pauses of 0.12–0.40 s.
 * - Each syllable lasts 0.16–0.32 s (about 4 per second while talking) with a raised-cosine (sin²)
 *   envelope and a random stress gain; it carries one vowel-like formant set, so the formants move
 *   every 150–300 ms, glided by a 25 ms one-pole smoother.
 * - Voicing: a Rosenberg glottal flow pulse (A. E. Rosenberg, JASA 49(2B):583–590, 1971; opening
 *   40 %, closing 28 % of the period), differentiated for lip radiation, with a pitch that falls
 *   through each word from 150–210 Hz to 100–140 Hz (kept inside 100–220 Hz).
 * - Vocal tract: cascade of resonators y = A·x + B·y₁ + C·y₂ with B = 2e^{−πbT}cos(2πFT),
 *   C = −e^{−2πbT}, A = 1 − B − C (D. H. Klatt, JASA 67(3):971–995, 1980), formants F1–F3 from the
 *   vowel table below plus a fixed 3.5 kHz F4.
 * - Some syllables start (35 %) or end (20 %) with a fricative: seeded Gaussian noise through a wide
 *   resonator at 2.5, 4.5 or 6 kHz (capped at 0.4 × the sample rate).
 * The whole signal is scaled to the requested rms. Measured on 20 s at 48 kHz (see the tests):
 * crest factor 12–20 dB, envelope modulation peak near 4 Hz, level falling above 500 Hz.
 */
import { InputError } from '../../errors.ts';
import { SeededRandom } from '../../numeric/random.ts';
import { requireNonNegative, requireSeed, sampleCount } from './arguments.ts';

export interface SpeechLikeOptions {
  sampleRateHertz: number;
  seconds: number;
  /** RMS amplitude of the whole signal, pauses included (it is scaled to exactly this). */
  rmsAmplitude: number;
  seed: number;
}

/** Vowel-like formant sets F1, F2, F3 in Hz (adult male averages, Peterson & Barney, JASA 24, 1952; from memory). */
const VOWEL_FORMANTS_HERTZ: readonly (readonly [number, number, number])[] = [
  [270, 2290, 3010], // as in "heed"
  [390, 1990, 2550], // "hid"
  [530, 1840, 2480], // "head"
  [660, 1720, 2410], // "had"
  [730, 1090, 2440], // "hod"
  [570, 840, 2410], // "hawed"
  [440, 1020, 2240], // "hood"
  [300, 870, 2240], // "who'd"
  [640, 1190, 2390], // "hud"
  [490, 1350, 1690], // "heard"
];
const FORMANT_BANDWIDTHS_HERTZ = [80, 110, 160, 250] as const;
const FOURTH_FORMANT_HERTZ = 3500;
const FRICATIVE_CENTRES_HERTZ = [2500, 4500, 6000] as const;
const FORMANT_GLIDE_SECONDS = 0.025;

interface Resonator {
  a: number;
  b: number;
  c: number;
  y1: number;
  y2: number;
}

function tune(r: Resonator, hertz: number, bandwidthHertz: number, sampleRateHertz: number): void {
  const t = 1 / sampleRateHertz;
  r.c = -Math.exp(-2 * Math.PI * bandwidthHertz * t);
  r.b = 2 * Math.exp(-Math.PI * bandwidthHertz * t) * Math.cos(2 * Math.PI * hertz * t);
  r.a = 1 - r.b - r.c;
}

function step(r: Resonator, x: number): number {
  const y = r.a * x + r.b * r.y1 + r.c * r.y2;
  r.y2 = r.y1;
  r.y1 = y;
  return y;
}

/** Rosenberg glottal flow at phase 0 ≤ φ < 1 of the period: rise 0.4, fall 0.16, closed after. */
function glottalFlow(phase: number): number {
  const opening = 0.4;
  const closing = 0.28;
  if (phase < opening) return 0.5 * (1 - Math.cos((Math.PI * phase) / opening));
  if (phase < opening + closing) return Math.cos((Math.PI * (phase - opening)) / (2 * closing));
  return 0;
}

const between = (random: SeededRandom, low: number, high: number): number => low + (high - low) * random.uniform();

export function speechLike(options: SpeechLikeOptions): Float64Array {
  const { sampleRateHertz, seconds, rmsAmplitude, seed } = options;
  const count = sampleCount(seconds, sampleRateHertz);
  if (sampleRateHertz < 8000) throw new InputError('sampleRateHertz', 'at least 8000 Hz for the speech-like signal', `got ${sampleRateHertz}`);
  requireNonNegative('rmsAmplitude', rmsAmplitude);
  requireSeed('seed', seed);
  const random = new SeededRandom(seed);

  // 1. Plan per sample: voiced envelope, fricative envelope and centre, pitch, formant targets.
  const voicedEnvelope = new Float64Array(count);
  const noiseEnvelope = new Float64Array(count);
  const noiseCentre = new Float64Array(count);
  const pitchHertz = new Float64Array(count).fill(120);
  const formantTargets = [new Float64Array(count), new Float64Array(count), new Float64Array(count)];
  const at = (s: number): number => Math.min(count, Math.round(s * sampleRateHertz));
  const ramp = (envelope: Float64Array, start: number, end: number, gain: number, centre: number): void => {
    for (let n = start; n < end; n++) {
      envelope[n] = gain * Math.sin((Math.PI * (n - start + 0.5)) / (end - start)) ** 2;
      if (centre > 0) noiseCentre[n] = centre;
    }
  };
  const noiseCap = 0.4 * sampleRateHertz;
  let vowel = VOWEL_FORMANTS_HERTZ[0];
  let cursor = between(random, 0.05, 0.2);
  while (cursor < seconds) {
    const syllables = 1 + Math.floor(random.uniform() * 3);
    const wordStart = cursor;
    const wordSeconds = syllables * 0.24;
    const pitchStart = between(random, 150, 210);
    const pitchEnd = between(random, 100, 140);
    for (let s = 0; s < syllables && cursor < seconds; s++) {
      const length = between(random, 0.16, 0.32);
      vowel = VOWEL_FORMANTS_HERTZ[Math.floor(random.uniform() * VOWEL_FORMANTS_HERTZ.length)];
      const stress = between(random, 0.6, 1);
      let voicedStart = cursor;
      let voicedEnd = cursor + length;
      if (random.uniform() < 0.35) {
        const fricative = between(random, 0.06, 0.12);
        const centre = Math.min(noiseCap, FRICATIVE_CENTRES_HERTZ[Math.floor(random.uniform() * 3)]);
        ramp(noiseEnvelope, at(cursor), at(cursor + fricative), between(random, 0.2, 0.5), centre);
        voicedStart += fricative * 0.7;
      }
      if (random.uniform() < 0.2) {
        const fricative = between(random, 0.05, 0.1);
        const centre = Math.min(noiseCap, FRICATIVE_CENTRES_HERTZ[Math.floor(random.uniform() * 3)]);
        ramp(noiseEnvelope, at(voicedEnd - fricative), at(voicedEnd), between(random, 0.15, 0.4), centre);
        voicedEnd -= fricative * 0.7;
      }
      ramp(voicedEnvelope, at(voicedStart), at(voicedEnd), stress, 0);
      for (let n = at(cursor); n < at(cursor + length); n++) {
        const progress = Math.min(1, (n / sampleRateHertz - wordStart) / wordSeconds);
        pitchHertz[n] = pitchStart + (pitchEnd - pitchStart) * progress + 10 * stress;
        for (let f = 0; f < 3; f++) formantTargets[f][n] = vowel[f];
      }
      cursor += length;
    }
    const pauseStart = at(cursor);
    cursor += between(random, 0.12, 0.4);
    for (let n = pauseStart; n < at(cursor); n++) for (let f = 0; f < 3; f++) formantTargets[f][n] = vowel[f];
  }

  // 2. Render: glottal source → formant cascade, plus fricative noise.
  const formants: Resonator[] = FORMANT_BANDWIDTHS_HERTZ.map(() => ({ a: 0, b: 0, c: 0, y1: 0, y2: 0 }));
  tune(formants[3], Math.min(FOURTH_FORMANT_HERTZ, noiseCap), FORMANT_BANDWIDTHS_HERTZ[3], sampleRateHertz);
  const fricativeFilter: Resonator = { a: 0, b: 0, c: 0, y1: 0, y2: 0 };
  const glide = 1 - Math.exp(-1 / (FORMANT_GLIDE_SECONDS * sampleRateHertz));
  const smoothed = [formantTargets[0][0], formantTargets[1][0], formantTargets[2][0]];
  const samples = new Float64Array(count);
  let phase = 0;
  let previousFlow = 0;
  let tunedCentre = 0;
  let sumSquares = 0;
  for (let n = 0; n < count; n++) {
    // Phase is the running integral of a varying pitch, so it is accumulated (wrapped each period).
    phase += pitchHertz[n] / sampleRateHertz;
    if (phase >= 1) phase -= 1;
    const flow = glottalFlow(phase);
    let voiced = (flow - previousFlow) * voicedEnvelope[n];
    previousFlow = flow;
    if ((n & 15) === 0) {
      for (let f = 0; f < 3; f++) {
        smoothed[f] += 16 * glide * (formantTargets[f][n] - smoothed[f]);
        tune(formants[f], smoothed[f], FORMANT_BANDWIDTHS_HERTZ[f], sampleRateHertz);
      }
    }
    for (let f = 0; f < 4; f++) voiced = step(formants[f], voiced);
    let noise = 0;
    if (noiseEnvelope[n] > 0) {
      if (noiseCentre[n] !== tunedCentre) {
        tunedCentre = noiseCentre[n];
        tune(fricativeFilter, tunedCentre, 0.5 * tunedCentre, sampleRateHertz);
      }
      noise = (noiseEnvelope[n] * step(fricativeFilter, random.normal())) / 60;
    } else {
      random.normal(); // keep the random stream aligned whatever the envelope
    }
    const y = voiced + noise;
    samples[n] = y;
    sumSquares += y * y;
  }
  const scale = sumSquares > 0 ? rmsAmplitude / Math.sqrt(sumSquares / count) : 0;
  for (let n = 0; n < count; n++) samples[n] *= scale;
  return samples;
}
