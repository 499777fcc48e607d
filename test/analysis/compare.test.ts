import { describe, expect, it } from 'vitest';
import { coherentSnr } from '../../src/analysis/coherent-snr.ts';
import { compareRecordings, COMPARE_DEFAULTS } from '../../src/analysis/compare.ts';
import { realFft, fftPlan } from '../../src/analysis/fft.ts';
import { thirdOctaveBands, thirdOctaveLevelsDb } from '../../src/analysis/third-octave.ts';
import { speechLike } from '../../src/audio/signals/speech-like.ts';
import { SeededRandom } from '../../src/numeric/random.ts';

const RATE = 48000;

function whiteNoise(count: number, seed: number, rms = 0.1): Float64Array {
  const random = new SeededRandom(seed);
  return Float64Array.from({ length: count }, () => rms * random.normal());
}

/** Multiplies the bins with centres in [low, high] Hz by `gain` (zero-phase FFT filtering of the whole record). */
function boostBand(samples: Float64Array, low: number, high: number, gain: number): Float64Array {
  const size = samples.length;
  const plan = fftPlan(size);
  const spectrum = realFft(samples, size);
  plan.completeSpectrum(spectrum);
  for (let k = 0; k < size; k++) {
    const hertz = (Math.min(k, size - k) * RATE) / size;
    if (hertz >= low && hertz <= high) {
      spectrum[2 * k] *= gain;
      spectrum[2 * k + 1] *= gain;
    }
  }
  const out = new Float64Array(2 * size);
  plan.inverseTransform(out, spectrum);
  return Float64Array.from({ length: size }, (_, i) => out[2 * i]);
}

describe('thirdOctaveBands', () => {
  it('uses the IEC 61260-1 base-ten mid-band frequencies 1000·10^(x/10) Hz and contiguous band edges', () => {
    const bands = thirdOctaveBands(25, 20000, RATE / 2);
    expect(bands).toHaveLength(30); // x = −16 (25.12 Hz) … 13 (19.95 kHz)
    expect(bands[0].centreHertz).toBeCloseTo(25.1189, 4);
    expect(bands.find((b) => Math.abs(b.centreHertz - 1000) < 1e-9)).toBeDefined();
    expect(bands[6].centreHertz).toBeCloseTo(100, 9); // x = −10
    for (let i = 1; i < bands.length; i++) expect(bands[i].lowHertz).toBeCloseTo(bands[i - 1].highHertz, 9);
  });

  it('puts all of a 1 kHz sine of amplitude A in the 1 kHz band, at 20·log10(A/√2) dB', () => {
    const bands = thirdOctaveBands(25, 20000, RATE / 2);
    const sine = Float64Array.from({ length: RATE }, (_, n) => 0.5 * Math.sin((2 * Math.PI * 1000 * n) / RATE));
    const levels = thirdOctaveLevelsDb(sine, RATE, bands);
    const k = bands.findIndex((b) => Math.abs(b.centreHertz - 1000) < 1e-9);
    expect(levels[k]).toBeCloseTo(20 * Math.log10(0.5 / Math.SQRT2), 2);
    expect(levels[k - 2]).toBeLessThan(levels[k] - 100);
  });
});

describe('coherentSnr', () => {
  it('reads the SNR of a filtered signal plus independent noise, whatever the filter', () => {
    // Coherent output power (Bendat & Piersol): with y = h∗x + n, γ²·G_yy is the h∗x part, so the SNR is
    // P(h∗x)/P(n) even though y differs from x in level and phase. Here 20 dB by construction.
    const x = whiteNoise(RATE * 2, 1, 1);
    const filtered = Float64Array.from(x, (v, i) => 0.6 * v - 0.3 * (x[i - 1] ?? 0) + 0.1 * (x[i - 5] ?? 0));
    const power = filtered.reduce((a, v) => a + v * v, 0) / filtered.length;
    const noise = whiteNoise(x.length, 2, Math.sqrt(power / 100));
    const y = Float64Array.from(filtered, (v, i) => v + noise[i]);
    const result = coherentSnr(x, y, RATE, { lowHertz: 0, highHertz: RATE / 2 });
    expect(Math.abs(result.snrDb - 20)).toBeLessThan(0.3);
  });
});

describe('compareRecordings', () => {
  const speech = speechLike({ sampleRateHertz: RATE, seconds: 2, rmsAmplitude: 0.1, seed: 3 });

  it('finds the delay and level of a delayed half-level copy, and then no difference at all', () => {
    const delay = 1234;
    const other = Float64Array.from({ length: speech.length + delay }, (_, i) => (i >= delay ? 0.5 * speech[i - delay] : 0));
    const result = compareRecordings({ samples: speech, rateHertz: RATE }, { samples: other, rateHertz: RATE });
    expect(result.lagSeconds).toBe(delay / RATE);
    expect(result.matchGainDb).toBeCloseTo(20 * Math.log10(2), 9); // 6.0206 dB
    // STOI of a signal with itself is 1 (Taal et al. 2011: a correlation of identical envelopes); segmental SNR takes its 35 dB ceiling.
    expect(result.stoi).toBeCloseTo(1, 9);
    expect(result.segmentalSnrDb).toBe(35);
    expect(result.snrDb!).toBeGreaterThan(100); // nothing but the reference itself, up to rounding
    for (const band of result.bands) if (band.referenceDb > -120) expect(Math.abs(band.matchedDifferenceDb)).toBeLessThan(0.01);
  });

  it('shows a 6 dB boost of the 1 kHz third-octave band there, and the level-matching gain elsewhere', () => {
    const x = whiteNoise(1 << 17, 5);
    const centre = 1000;
    const [low, high] = [centre * 10 ** (-1 / 20), centre * 10 ** (1 / 20)];
    const y = boostBand(x, low, high, 2);
    // Least squares gain g = Σxy/Σy²: with y = x + b (b the band part of x, orthogonal to the rest),
    // Σxy = |x|² + |b|² and Σy² = |x|² + 3|b|².
    const rest = boostBand(x, low, high, 0);
    const band = x.map((v, i) => v - rest[i]);
    const b2 = band.reduce((a, v) => a + v * v, 0);
    const x2 = x.reduce((a, v) => a + v * v, 0);
    const gainDb = 20 * Math.log10((x2 + b2) / (x2 + 3 * b2));
    const result = compareRecordings({ samples: x, rateHertz: RATE }, { samples: y, rateHertz: RATE }, COMPARE_DEFAULTS);
    for (const b of result.bands) {
      const expected = Math.abs(b.centreHertz - centre) < 1e-9 ? gainDb + 20 * Math.log10(2) : gainDb;
      expect(Math.abs(b.matchedDifferenceDb - expected)).toBeLessThan(0.1);
    }
  });

  it('resamples an other recording at a different rate and still finds no spectral change', () => {
    const at24 = Float64Array.from({ length: 24000 }, (_, n) => 0.3 * Math.sin((2 * Math.PI * 440 * n) / 24000));
    const at48 = Float64Array.from({ length: 48000 }, (_, n) => 0.3 * Math.sin((2 * Math.PI * 440 * n) / 48000));
    const result = compareRecordings({ samples: at48, rateHertz: 48000 }, { samples: at24, rateHertz: 24000 });
    expect(result.otherResampledFromHertz).toBe(24000);
    const band = result.bands.find((b) => Math.abs(b.centreHertz - 398.107) < 0.01)!; // edges 354.8–446.7 Hz hold 440 Hz
    expect(Math.abs(band.matchedDifferenceDb)).toBeLessThan(0.05);
  });
});
