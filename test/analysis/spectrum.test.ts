import { describe, expect, it } from 'vitest';
import { fftConvolve } from '../../src/analysis/fft.ts';
import { bandPower, powerSpectrum, strongestToneHertz, toneAmplitude } from '../../src/analysis/spectrum.ts';
import { SeededRandom } from '../../src/numeric/random.ts';

const RATE = 48000;

function tone(amplitude: number, hertz: number, length: number, phase = 0.4): Float64Array {
  const x = new Float64Array(length);
  for (let n = 0; n < length; n++) x[n] = amplitude * Math.cos((2 * Math.PI * hertz * n) / RATE + phase);
  return x;
}

describe('spectrum', () => {
  it('power summation reads a tone anywhere between bins to 1e−8 (Parseval; Heinzel et al. 2002 sec. 10)', () => {
    for (const offsetBins of [0, 0.25, 0.5, 0.77]) {
      const hertz = (300 + offsetBins) * (RATE / 30000);
      const spectrum = powerSpectrum(tone(0.7, hertz, 30000), RATE); // zero-padded to 32768
      expect(toneAmplitude(spectrum, hertz) / 0.7).toBeCloseTo(1, 8);
    }
  });

  it('coherent analysis reads the single exact bin', () => {
    const hertz = (RATE * 100) / 4096;
    const spectrum = powerSpectrum(tone(0.25, hertz, 4096), RATE, { coherent: true });
    expect(spectrum.toneHalfWidthBins).toBe(0);
    expect(toneAmplitude(spectrum, hertz)).toBeCloseTo(0.25, 13);
    expect(strongestToneHertz(spectrum, 10, 20000)).toBe(hertz);
  });

  it('white noise of variance σ² sums to σ²·(band / Nyquist) over a band (Parseval; statistical tolerance)', () => {
    const random = new SeededRandom(11);
    const x = new Float64Array(1 << 17);
    for (let i = 0; i < x.length; i++) x[i] = 0.1 * random.normal();
    const spectrum = powerSpectrum(x, RATE);
    const expected = 0.01 * (8000 / 24000);
    // ~21800 bins, ENBW 2 bins: ~11000 independent estimates, relative sd ≈ 1 %; allow 4 %.
    expect(bandPower(spectrum, 2000, 10000) / expected).toBeGreaterThan(0.96);
    expect(bandPower(spectrum, 2000, 10000) / expected).toBeLessThan(1.04);
  });

  it('FFT convolution equals direct convolution', () => {
    const a = Float64Array.from([1, 2, 3, -1]);
    const b = Float64Array.from([0.5, -2, 4]);
    const direct = [0.5, -1, 1.5, 1.5, 14, -4];
    const result = fftConvolve(a, b);
    expect(result.length).toBe(6);
    direct.forEach((v, i) => expect(result[i]).toBeCloseTo(v, 12));
  });

  it('rejects a non-power-of-two record for coherent analysis, and bad rates', () => {
    expect(() => powerSpectrum(new Float64Array(1000), RATE, { coherent: true })).toThrow(/samples.length.*power of two/);
    expect(() => powerSpectrum(new Float64Array(16), 0)).toThrow(/rateHertz/);
  });
});
