import FFT from 'fft.js';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.ts';
import { pinkNoise } from '../../src/audio/signals/pink-noise.ts';
import { speechLike } from '../../src/audio/signals/speech-like.ts';
import { expSweep, sweepFrequencyAt, sweepInverseFilter } from '../../src/audio/signals/sweep.ts';
import { tone } from '../../src/audio/signals/tone.ts';
import { TWO_TONE_PRESETS, twoTone } from '../../src/audio/signals/two-tone.ts';

const FS = 48000;

/** Times (s) of rising zero crossings, by linear interpolation between samples. */
function risingCrossings(x: Float64Array, hertz: number, from = 0, to = x.length): number[] {
  const times: number[] = [];
  for (let n = Math.max(1, from); n < to; n++) {
    if (x[n - 1] < 0 && x[n] >= 0) times.push((n - 1 + x[n - 1] / (x[n - 1] - x[n])) / hertz);
  }
  return times;
}

/** Amplitude of the component at `frequencyHertz` by least-squares projection over the whole signal. */
function amplitudeAt(x: Float64Array, hertz: number, frequencyHertz: number): number {
  let c = 0;
  let s = 0;
  for (let n = 0; n < x.length; n++) {
    c += x[n] * Math.cos((2 * Math.PI * frequencyHertz * n) / hertz);
    s += x[n] * Math.sin((2 * Math.PI * frequencyHertz * n) / hertz);
  }
  return (2 / x.length) * Math.hypot(c, s);
}

/** Welch power spectrum (Hann, 50 % overlap), summed power per bin. */
function welch(x: Float64Array, size: number): Float64Array {
  const fft = new FFT(size);
  const out = fft.createComplexArray() as number[];
  const segment = new Float64Array(size);
  const power = new Float64Array(size / 2);
  for (let start = 0; start + size <= x.length; start += size / 2) {
    for (let i = 0; i < size; i++) segment[i] = x[start + i] * (0.5 - 0.5 * Math.cos((2 * Math.PI * i) / size));
    fft.realTransform(out, segment);
    for (let k = 0; k < size / 2; k++) power[k] += out[2 * k] ** 2 + out[2 * k + 1] ** 2;
  }
  return power;
}

function bandDb(power: Float64Array, binHertz: number, lowHertz: number, highHertz: number): number {
  let sum = 0;
  for (let k = 0; k < power.length; k++) if (k * binHertz >= lowHertz && k * binHertz < highHertz) sum += power[k];
  return 10 * Math.log10(sum);
}

function crestDb(x: Float64Array): number {
  let peak = 0;
  let squares = 0;
  for (const v of x) {
    peak = Math.max(peak, Math.abs(v));
    squares += v * v;
  }
  return 20 * Math.log10(peak / Math.sqrt(squares / x.length));
}

describe('tone', () => {
  it('has the requested frequency (zero crossings) and peak amplitude', () => {
    const x = tone({ sampleRateHertz: FS, frequencyHertz: 997, peakAmplitude: 0.5, seconds: 1 });
    expect(x.length).toBe(FS);
    const crossings = risingCrossings(x, FS);
    const measured = (crossings.length - 1) / (crossings[crossings.length - 1] - crossings[0]);
    expect(measured).toBeCloseTo(997, 3);
    expect(Math.max(...x)).toBeCloseTo(0.5, 6);
    expect(amplitudeAt(x, FS, 997)).toBeCloseTo(0.5, 3);
  });

  it('fades in and out with a raised cosine when asked, starting near zero', () => {
    const x = tone({ sampleRateHertz: FS, frequencyHertz: 1000, peakAmplitude: 1, seconds: 0.5, fadeSeconds: 0.01, phaseRadians: Math.PI / 2 });
    expect(Math.abs(x[0])).toBeLessThan(1e-4);
    expect(Math.abs(x[x.length - 1])).toBeLessThan(1e-4);
    expect(Math.max(...x.subarray(0, 240))).toBeLessThan(0.6);
    expect(Math.max(...x.subarray(1000, 2000))).toBeCloseTo(1, 6);
  });

  it('rejects a frequency at or above Nyquist, a bad duration or rate, naming the argument', () => {
    const base = { sampleRateHertz: FS, frequencyHertz: 1000, peakAmplitude: 1, seconds: 1 };
    expect(() => tone({ ...base, frequencyHertz: 24000 })).toThrow(/^frequencyHertz/);
    expect(() => tone({ ...base, frequencyHertz: -1 })).toThrow(InputError);
    expect(() => tone({ ...base, seconds: 0 })).toThrow(/^seconds/);
    expect(() => tone({ ...base, sampleRateHertz: Number.NaN })).toThrow(/^sampleRateHertz/);
    expect(() => tone({ ...base, peakAmplitude: -1 })).toThrow(/^peakAmplitude/);
    expect(() => tone({ ...base, fadeSeconds: -0.1 })).toThrow(/^fadeSeconds/);
  });
});

describe('two-tone', () => {
  it('SMPTE/DIN preset: 60 Hz and 7 kHz at 4:1, peak of the sum as requested', () => {
    const x = twoTone({ sampleRateHertz: FS, seconds: 1, peakAmplitude: 1, tones: 'smpte' });
    expect(TWO_TONE_PRESETS.smpte).toEqual({ lowHertz: 60, highHertz: 7000, lowToHighAmplitude: 4 });
    expect(amplitudeAt(x, FS, 60)).toBeCloseTo(0.8, 4);
    expect(amplitudeAt(x, FS, 7000)).toBeCloseTo(0.2, 4);
    expect(Math.max(...x.map(Math.abs))).toBeLessThanOrEqual(1);
    expect(Math.max(...x.map(Math.abs))).toBeGreaterThan(0.99);
  });

  it('CCIF preset: 19 kHz and 20 kHz at equal amplitude', () => {
    const x = twoTone({ sampleRateHertz: FS, seconds: 1, peakAmplitude: 0.5, tones: 'ccif' });
    expect(amplitudeAt(x, FS, 19000)).toBeCloseTo(0.25, 4);
    expect(amplitudeAt(x, FS, 20000)).toBeCloseTo(0.25, 4);
    expect(amplitudeAt(x, FS, 1000)).toBeLessThan(1e-6); // no difference tone in the source itself
  });

  it('accepts custom frequencies and rejects an unknown preset or a tone above Nyquist', () => {
    const x = twoTone({ sampleRateHertz: FS, seconds: 1, peakAmplitude: 1, tones: { lowHertz: 250, highHertz: 8000, lowToHighAmplitude: 1 } });
    expect(amplitudeAt(x, FS, 250)).toBeCloseTo(0.5, 4);
    expect(() => twoTone({ sampleRateHertz: FS, seconds: 1, peakAmplitude: 1, tones: 'imd' as never })).toThrow(/^tones/);
    expect(() => twoTone({ sampleRateHertz: 32000, seconds: 1, peakAmplitude: 1, tones: 'ccif' })).toThrow(/^tones\.lowHertz/);
  });
});

describe('exponential sweep (Farina, AES 108th Convention, 2000)', () => {
  const options = { sampleRateHertz: FS, startHertz: 20, endHertz: 20000, seconds: 2, peakAmplitude: 0.5 };

  it('has the instantaneous frequency f1·e^{t ln(f2/f1)/T} at its start and end (zero crossings, within 0.5 %)', () => {
    // Ending at 5 kHz keeps ~10 samples per period, so interpolated zero crossings stay accurate.
    const slow = { ...options, endHertz: 5000 };
    const x = expSweep(slow);
    expect(x.length).toBe(2 * FS);
    const crossings = risingCrossings(x, FS);
    for (const [a, b] of [
      [1, 2],
      [2, 3],
      [crossings.length - 3, crossings.length - 2],
      [crossings.length - 2, crossings.length - 1],
    ]) {
      const period = crossings[b] - crossings[a];
      // The period between crossings is 1/f at its midpoint to first order (f changes slowly within one period at the start).
      const expected = sweepFrequencyAt(slow, (crossings[a] + crossings[b]) / 2);
      expect(Math.abs(1 / period / expected - 1)).toBeLessThan(0.005);
    }
    expect(sweepFrequencyAt(options, 0)).toBeCloseTo(20, 10);
    expect(sweepFrequencyAt(options, 2)).toBeCloseTo(20000, 8);
  });

  it('convolved with its inverse filter gives a band-limited impulse at N − 1 with a flat 0 dB spectrum and low sidelobes', () => {
    const x = expSweep(options);
    const inverse = sweepInverseFilter(options);
    const n = x.length;
    const size = 1 << 18;
    const fft = new FFT(size);
    const a = new Float64Array(size);
    const b = new Float64Array(size);
    a.set(x);
    b.set(inverse);
    const fa = fft.createComplexArray() as number[];
    const fb = fft.createComplexArray() as number[];
    fft.realTransform(fa, a);
    fft.completeSpectrum(fa);
    fft.realTransform(fb, b);
    fft.completeSpectrum(fb);
    const product = fft.createComplexArray() as number[];
    for (let k = 0; k < size; k++) {
      product[2 * k] = fa[2 * k] * fb[2 * k] - fa[2 * k + 1] * fb[2 * k + 1];
      product[2 * k + 1] = fa[2 * k] * fb[2 * k + 1] + fa[2 * k + 1] * fb[2 * k];
    }
    // Spectrum of the deconvolved response inside the band, averaged over third-octaves to smooth
    // the ripple from the sweep's abrupt ends: 0 dB (stationary-phase scaling).
    for (const hertz of [100, 1000, 5000, 15000]) {
      let sum = 0;
      let bins = 0;
      for (let k = Math.round((hertz * 2 ** (-1 / 6) * size) / FS); k <= (hertz * 2 ** (1 / 6) * size) / FS; k++) {
        sum += product[2 * k] ** 2 + product[2 * k + 1] ** 2;
        bins++;
      }
      expect(Math.abs(10 * Math.log10(sum / bins))).toBeLessThan(0.05);
    }
    const result = fft.createComplexArray() as number[];
    fft.inverseTransform(result, product);
    const h = new Float64Array(size);
    for (let i = 0; i < size; i++) h[i] = result[2 * i];
    let peakIndex = 0;
    for (let i = 1; i < size; i++) if (Math.abs(h[i]) > Math.abs(h[peakIndex])) peakIndex = i;
    expect(peakIndex).toBe(n - 1);
    // Peak height of a 20 Hz–20 kHz band-limited impulse is about 2·(f2 − f1)/fs.
    expect(h[peakIndex]).toBeCloseTo((2 * (20000 - 20)) / FS, 1);
    // Sidelobes more than 5 ms from the peak stay 50 dB below it.
    let sidelobe = 0;
    for (let i = 0; i < 2 * n - 1; i++) if (Math.abs(i - peakIndex) > 0.005 * FS) sidelobe = Math.max(sidelobe, Math.abs(h[i]));
    expect(20 * Math.log10(sidelobe / h[peakIndex])).toBeLessThan(-50);
  });

  it('rejects an end frequency not above the start, naming endHertz', () => {
    expect(() => expSweep({ ...options, endHertz: 20 })).toThrow(/^endHertz/);
    expect(() => expSweep({ ...options, startHertz: 0 })).toThrow(/^startHertz/);
    expect(() => sweepInverseFilter({ ...options, peakAmplitude: 0 })).toThrow(/^peakAmplitude/);
  });
});

describe('pink noise', () => {
  it('falls 3 dB per octave within 0.5 dB: equal power in every octave band from 31.5 Hz to 16 kHz', () => {
    const x = pinkNoise({ sampleRateHertz: FS, seconds: 30, rmsAmplitude: 0.1, seed: 11 });
    // Long segments (0.73 Hz bins) so window leakage does not bias the steep low-frequency bands.
    const size = 65536;
    const power = welch(x, size);
    const levels = [31.5, 63, 125, 250, 500, 1000, 2000, 4000, 8000, 16000].map((centre) =>
      bandDb(power, FS / size, centre / Math.SQRT2, Math.min(20000, centre * Math.SQRT2)),
    );
    // The 16 kHz band is cut at 20 kHz; a 1/f density gives its power a known deficit of log2(20000/11314)/1 octave.
    levels[9] -= 10 * Math.log10(Math.log2(20000 / (16000 / Math.SQRT2)));
    const mean = levels.reduce((sum, v) => sum + v, 0) / levels.length;
    for (const level of levels) expect(Math.abs(level - mean)).toBeLessThan(0.5);
  });

  it('has exactly the requested rms and repeats bit-identically for a seed', () => {
    const a = pinkNoise({ sampleRateHertz: 44100, seconds: 1, rmsAmplitude: 0.25, seed: 3 });
    const b = pinkNoise({ sampleRateHertz: 44100, seconds: 1, rmsAmplitude: 0.25, seed: 3 });
    const c = pinkNoise({ sampleRateHertz: 44100, seconds: 1, rmsAmplitude: 0.25, seed: 4 });
    expect(a).toEqual(b);
    expect(a).not.toEqual(c);
    expect(Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length)).toBeCloseTo(0.25, 12);
  });

  it('rejects a non-integer seed and a negative rms, naming them', () => {
    expect(() => pinkNoise({ sampleRateHertz: FS, seconds: 1, rmsAmplitude: 0.1, seed: 1.5 })).toThrow(/^seed/);
    expect(() => pinkNoise({ sampleRateHertz: FS, seconds: 1, rmsAmplitude: -1, seed: 1 })).toThrow(/^rmsAmplitude/);
  });
});

describe('speech-like signal (our own design)', () => {
  const signal = speechLike({ sampleRateHertz: FS, seconds: 20, rmsAmplitude: 0.1, seed: 7 });

  it('has the requested rms and a crest factor between 12 and 20 dB for several seeds', () => {
    expect(Math.sqrt(signal.reduce((s, v) => s + v * v, 0) / signal.length)).toBeCloseTo(0.1, 12);
    // Target range is our design choice, near the ~12 dB (1 % exceedance) to ≥ 20 dB (instantaneous) of real speech (from memory).
    for (const seed of [1, 2, 3]) {
      const crest = crestDb(speechLike({ sampleRateHertz: FS, seconds: 8, rmsAmplitude: 0.1, seed }));
      expect(crest).toBeGreaterThan(12);
      expect(crest).toBeLessThan(20);
    }
    expect(crestDb(signal)).toBeGreaterThan(12);
    expect(crestDb(signal)).toBeLessThan(20);
  });

  it('has its strongest intensity-envelope modulation in the 4 Hz octave band (syllable rate)', () => {
    // Intensity envelope at 100 Hz, then power per octave band of modulation frequency
    // (octave bands 0.5–16 Hz as in the modulation transfer analysis of IEC 60268-16; from memory).
    const step = FS / 100;
    const envelope = new Float64Array(2048);
    let mean = 0;
    for (let i = 0; i < 2000; i++) {
      let sum = 0;
      for (let j = 0; j < step; j++) sum += signal[i * step + j] ** 2;
      envelope[i] = sum / step;
      mean += envelope[i] / 2000;
    }
    for (let i = 0; i < 2000; i++) envelope[i] -= mean;
    const fft = new FFT(2048);
    const out = fft.createComplexArray() as number[];
    fft.realTransform(out, envelope);
    const power = new Float64Array(1024);
    for (let k = 0; k < 1024; k++) power[k] = out[2 * k] ** 2 + out[2 * k + 1] ** 2;
    const bands = [0.5, 1, 2, 4, 8, 16].map((c) => bandDb(power, 100 / 2048, c / Math.SQRT2, c * Math.SQRT2));
    expect(bands.indexOf(Math.max(...bands))).toBe(3);
  });

  it('has a long-term spectrum that falls above 500 Hz', () => {
    const size = 8192;
    const power = welch(signal, size);
    const octave = (c: number): number => bandDb(power, FS / size, c / Math.SQRT2, c * Math.SQRT2);
    // Long-term speech spectra peak near 500 Hz and fall above it (Byrne et al., JASA 96(4), 1994; from memory).
    expect(octave(500)).toBeGreaterThan(octave(250));
    expect(octave(500)).toBeGreaterThan(octave(1000) + 3);
    expect(octave(1000)).toBeGreaterThan(octave(2000) + 3);
    expect(octave(2000)).toBeGreaterThan(octave(8000));
  });

  it('contains pauses: at least 15 % of 10 ms frames are 40 dB below the loudest', () => {
    const step = FS / 100;
    const levels: number[] = [];
    for (let i = 0; i + step <= signal.length; i += step) {
      let sum = 0;
      for (let j = 0; j < step; j++) sum += signal[i + j] ** 2;
      levels.push(sum);
    }
    const loudest = Math.max(...levels);
    expect(levels.filter((l) => l < loudest * 1e-4).length / levels.length).toBeGreaterThan(0.15);
  });

  it('repeats bit-identically for a seed and differs for another', () => {
    const a = speechLike({ sampleRateHertz: 16000, seconds: 2, rmsAmplitude: 0.1, seed: 5 });
    const b = speechLike({ sampleRateHertz: 16000, seconds: 2, rmsAmplitude: 0.1, seed: 5 });
    expect(a).toEqual(b);
    expect(a).not.toEqual(speechLike({ sampleRateHertz: 16000, seconds: 2, rmsAmplitude: 0.1, seed: 6 }));
  });

  it('rejects a low sample rate and a bad seed, naming them', () => {
    expect(() => speechLike({ sampleRateHertz: 4000, seconds: 1, rmsAmplitude: 0.1, seed: 1 })).toThrow(/^sampleRateHertz/);
    expect(() => speechLike({ sampleRateHertz: FS, seconds: 1, rmsAmplitude: 0.1, seed: Number.NaN })).toThrow(/^seed/);
    expect(() => speechLike({ sampleRateHertz: FS, seconds: -1, rmsAmplitude: 0.1, seed: 1 })).toThrow(/^seconds/);
  });
});
