import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { activeSpeechLevel, activeSpeechLevelOf, P56_HANGOVER_SECONDS } from '../../src/audio/speech-level.ts';
import { decodeWav } from '../../src/audio/wav-read.ts';
import { InputError } from '../../src/errors.ts';
import { SeededRandom } from '../../src/numeric/random.ts';

const RATE = 8000;
/** Sine of `peak` at `hertz`, on where `on(seconds)` is true; t = n / rate (no accumulated time). */
function tone(seconds: number, hertz: number, peak: number, on: (t: number) => boolean = () => true): Float64Array {
  const out = new Float64Array(Math.round(seconds * RATE));
  for (let n = 0; n < out.length; n++) {
    const t = n / RATE;
    out[n] = on(t) ? peak * Math.sin(2 * Math.PI * hertz * t) : 0;
  }
  return out;
}
const db = (ratio: number): number => 20 * Math.log10(ratio);

describe('activeSpeechLevel (ITU-T P.56 method B)', () => {
  it('a continuous tone is active throughout and its active level is its rms level', () => {
    // P.56 "routine calibration of method-B meter", continuous tone: the meter reads the
    // tone's rms level (clause title from the Recommendation's contents; tolerance ours).
    // Rms of a sine of peak 0.5 is 0.5/√2 (closed form).
    const level = activeSpeechLevel(tone(5, 1000, 0.5), RATE);
    expect(level.longTermRmsDb).toBeCloseTo(db(0.5 / Math.SQRT2), 3);
    expect(level.activeLevelDb).toBeCloseTo(level.longTermRmsDb, 1);
    expect(Math.abs(level.activeLevelDb - level.longTermRmsDb)).toBeLessThan(0.05);
    // Only the envelope's rise at the start (a few tens of ms) is inactive.
    expect(level.activityFactor).toBeGreaterThan(0.99);
    expect(level.activityFactor).toBeLessThanOrEqual(1);
  });

  it('steady white noise is active throughout and reads its rms level', () => {
    // P.56 routine calibration with white noise (clause title; tolerance ours).
    const rng = new SeededRandom(56);
    const noise = Float64Array.from({ length: 5 * RATE }, () => 0.05 * rng.normal());
    const level = activeSpeechLevel(noise, RATE);
    expect(level.activityFactor).toBeGreaterThan(0.99);
    expect(Math.abs(level.activeLevelDb - level.longTermRmsDb)).toBeLessThan(0.05);
    expect(level.longTermRmsDb).toBeCloseTo(db(0.05), 1);
  });

  it('a tone gated on half the time has activity near 0.5 and an active level within 0.5 dB of the tone while on', () => {
    // 4 s on, 4 s off, twice. Each burst is extended by the envelope decay plus the 0.2 s
    // hangover, so activity is slightly above 0.5: about (4 + 0.2 + ~0.08) / 8 ≈ 0.53.
    const gated = tone(16, 440, 0.3, (t) => t % 8 < 4);
    const level = activeSpeechLevel(gated, RATE);
    expect(level.activityFactor).toBeGreaterThan(0.5);
    expect(level.activityFactor).toBeLessThan(0.55);
    expect(Math.abs(level.activeLevelDb - db(0.3 / Math.SQRT2))).toBeLessThan(0.5);
    expect(level.longTermRmsDb).toBeCloseTo(db(0.3 / Math.SQRT2) + 10 * Math.log10(0.5), 2);
  });

  it('counts the 0.2 s hangover after a burst as active', () => {
    // One 1 s burst in 4 s: active time = burst + decay to the chosen threshold + hangover.
    const burst = tone(4, 300, 0.2, (t) => t >= 1 && t < 2);
    const activeSeconds = activeSpeechLevel(burst, RATE).activityFactor * 4;
    const extra = activeSeconds - 1;
    expect(extra).toBeGreaterThan(P56_HANGOVER_SECONDS);
    expect(extra).toBeLessThan(P56_HANGOVER_SECONDS + 0.15);
  });

  it('scales exactly with gain: the level moves by 20·log10(gain) and activity does not change', () => {
    const rng = new SeededRandom(9);
    const base = tone(6, 250, 0.2, (t) => t % 2 < 1.2).map((x) => x + 0.002 * rng.normal());
    const reference = activeSpeechLevel(base, RATE);
    for (const gain of [0.001, 0.37, 5.3, 1000]) {
      const scaled = activeSpeechLevel(base.map((x) => x * gain), RATE);
      expect(scaled.activeLevelDb - reference.activeLevelDb).toBeCloseTo(db(gain), 9);
      expect(scaled.longTermRmsDb - reference.longTermRmsDb).toBeCloseTo(db(gain), 9);
      expect(scaled.activityFactor).toBeCloseTo(reference.activityFactor, 12);
    }
  });

  it('reads digital silence as −∞ dB with no activity, and rejects empty or non-finite input', () => {
    expect(activeSpeechLevel(new Float64Array(800), RATE)).toEqual({ activeLevelDb: -Infinity, activityFactor: 0, longTermRmsDb: -Infinity });
    expect(() => activeSpeechLevel(new Float64Array(0), RATE)).toThrow(InputError);
    expect(() => activeSpeechLevel(new Float64Array([0, Number.NaN]), RATE)).toThrow('samples[1]');
    expect(() => activeSpeechLevel(new Float64Array(10), 0)).toThrow('sampleRateHertz');
  });

  it('gives a finite level for a single click', () => {
    const click = new Float64Array(8000);
    click[4000] = 0.9;
    const level = activeSpeechLevel(click, RATE);
    expect(Number.isFinite(level.activeLevelDb)).toBe(true);
    expect(level.activityFactor).toBeGreaterThan(0);
    expect(level.activityFactor).toBeLessThanOrEqual(1);
  });
});

describe('bundled recordings (samples/speech, made by scripts/make-speech-samples.sh)', () => {
  for (const name of ['bay-talkback.wav', 'bay-talkback-2.wav']) {
    it(`${name} is 48 kHz mono 16-bit, about 10 s, silent 0.3 s at each end and speech in between`, () => {
      const wav = decodeWav(readFileSync(new URL(`../../samples/speech/${name}`, import.meta.url)), name);
      expect(wav.sampleRateHertz).toBe(48000);
      expect(wav.format).toEqual({ encoding: 'pcm', bitsPerSample: 16, channelCount: 1 });
      const seconds = wav.mono.length / 48000;
      expect(seconds).toBeGreaterThan(9);
      expect(seconds).toBeLessThan(12);
      const peak = (x: Float64Array): number => x.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
      const edge = 0.29 * 48000;
      expect(peak(wav.mono.subarray(0, edge))).toBeLessThanOrEqual(2 / 32768); // silence up to dither
      expect(peak(wav.mono.subarray(wav.mono.length - edge))).toBeLessThanOrEqual(2 / 32768);
      expect(db(peak(wav.mono))).toBeCloseTo(-6, 1); // sox norm -6
      const level = activeSpeechLevel(wav.mono, 48000);
      expect(level.activityFactor).toBeGreaterThan(0.6);
      expect(level.activityFactor).toBeLessThan(0.98);
      expect(level.activeLevelDb).toBeGreaterThan(-30);
      expect(level.activeLevelDb).toBeLessThan(-15);
    });
  }
});

describe('activeSpeechLevelOf (the same measurement in two passes over chunks)', () => {
  /** Runs the passes over `signal` cut into chunks of random length. */
  const chunked = (signal: Float64Array, seed: number, maxChunk: number) => {
    const rng = new SeededRandom(seed);
    return (take: (chunk: Float64Array) => void): void => {
      for (let at = 0; at < signal.length; ) {
        const n = Math.min(signal.length - at, 1 + Math.floor(rng.uniform() * maxChunk));
        take(signal.subarray(at, at + n));
        at += n;
      }
    };
  };

  it('gives exactly activeSpeechLevel on the bundled speech, chunk sizes whatever', () => {
    for (const name of ['bay-talkback.wav', 'bay-talkback-2.wav']) {
      const wav = decodeWav(readFileSync(new URL(`../../samples/speech/${name}`, import.meta.url)), name);
      const whole = activeSpeechLevel(wav.mono, 48000);
      expect(activeSpeechLevelOf(48000, chunked(wav.mono, 1, 3000))).toEqual(whole);
      expect(activeSpeechLevelOf(48000, chunked(wav.mono, 2, 50))).toEqual(whole);
    }
  });

  it('gives exactly activeSpeechLevel on gated tones, noise, a click and silence', () => {
    const rng = new SeededRandom(5);
    const signals = [
      tone(3, 440, 0.3, (t) => t % 1 < 0.4),
      Float64Array.from({ length: 16000 }, () => rng.normal() * 0.01),
      Float64Array.from({ length: 8000 }, (_, i) => (i === 4000 ? 1 : 0)),
      new Float64Array(100),
    ];
    for (const [i, signal] of signals.entries()) {
      expect(activeSpeechLevelOf(RATE, chunked(signal, i, 700))).toEqual(activeSpeechLevel(signal, RATE));
    }
  });

  it('rejects an empty signal and names a non-finite sample by its index in the whole signal', () => {
    expect(() => activeSpeechLevelOf(RATE, () => {})).toThrow(InputError);
    const signal = new Float64Array(100);
    signal[77] = Number.NaN;
    expect(() => activeSpeechLevelOf(RATE, chunked(signal, 3, 10))).toThrow(/^samples\[77\]/);
  });
});

/**
 * The method as P.56 writes it, with a hangover counter per threshold stepped at every sample
 * (the straightforward form of step 3 in speech-level.ts); the same ladder and interpolation.
 */
function ladderPerSample(x: Float64Array, rate: number): { activeLevelDb: number; activityFactor: number } {
  let sumSquares = 0;
  let peak = 0;
  for (const v of x) {
    sumSquares += v * v;
    peak = Math.max(peak, Math.abs(v));
  }
  const steps = 25;
  const thresholds = Array.from({ length: steps }, (_, j) => peak * 2 ** -j);
  const hangover = Math.round(P56_HANGOVER_SECONDS * rate);
  const counts = new Array<number>(steps).fill(0);
  const hang = new Array<number>(steps).fill(hangover);
  const g = Math.exp(-1 / (rate * 0.03));
  let q = 0;
  let p = 0;
  for (const v of x) {
    q = g * q + (1 - g) * Math.abs(v);
    p = g * p + (1 - g) * q;
    for (let j = 0; j < steps; j++) {
      if (p >= thresholds[j]) {
        counts[j]++;
        hang[j] = 0;
      } else if (hang[j] < hangover) {
        counts[j]++;
        hang[j]++;
      }
    }
  }
  let previousA = NaN;
  let previousDelta = NaN;
  let activeLevelDb = NaN;
  for (let j = steps - 1; j >= 0; j--) {
    if (counts[j] === 0) break;
    const a = 10 * Math.log10(sumSquares / counts[j]);
    const delta = a - 20 * Math.log10(thresholds[j]);
    if (delta <= 15.9) {
      activeLevelDb = Number.isNaN(previousDelta) ? a : previousA + ((previousDelta - 15.9) / (previousDelta - delta)) * (a - previousA);
      break;
    }
    previousA = a;
    previousDelta = delta;
  }
  if (Number.isNaN(activeLevelDb)) activeLevelDb = Number.isNaN(previousA) ? 10 * Math.log10(sumSquares / x.length) : previousA;
  return { activeLevelDb, activityFactor: Math.min(1, sumSquares / x.length / 10 ** (activeLevelDb / 10)) };
}

describe('the rung-following pass', () => {
  it('counts exactly as a hangover counter per rung and sample would, on bursts, fades and clicks, in chunks or whole', () => {
    const rng = new SeededRandom(77);
    for (let trial = 0; trial < 12; trial++) {
      // Bursts of noise of random length and level with silences between, some with slow fades.
      const x = new Float64Array(3 * RATE);
      let n = 0;
      while (n < x.length) {
        const burst = Math.floor(rng.uniform() * 0.4 * RATE);
        const level = 10 ** (-3 * rng.uniform());
        const fade = rng.uniform() < 0.3;
        for (let k = 0; k < burst && n < x.length; k++, n++) x[n] = level * (fade ? 1 - k / burst : 1) * rng.normal();
        n += Math.floor(rng.uniform() * 0.35 * RATE);
      }
      if (trial === 0) x.fill(0).fill(0.9, 100, 101); // a single click
      const expected = ladderPerSample(x, RATE);
      const whole = activeSpeechLevel(x, RATE);
      expect(whole.activeLevelDb).toBe(expected.activeLevelDb);
      expect(whole.activityFactor).toBe(expected.activityFactor);
      const chunk = 1 + Math.floor(rng.uniform() * 700);
      const chunked = activeSpeechLevelOf(RATE, (take) => {
        for (let i = 0; i < x.length; i += chunk) take(x.subarray(i, Math.min(x.length, i + chunk)));
      });
      expect(chunked.activeLevelDb).toBe(expected.activeLevelDb);
    }
  });
});
