/**
 * Test helper: mean-square power of a record inside a frequency band, from one
 * periodogram (Parseval: mean square = Σₖ |Xₖ|²/N², one-sided bins doubled).
 */
import FFT from 'fft.js';

/** Mean-square power of `samples` (length a power of two) in [lowHertz, highHertz], optionally weighted by |W(f)|². */
export function bandPower(
  samples: Float64Array,
  sampleRateHertz: number,
  lowHertz: number,
  highHertz: number,
  weight: (hertz: number) => number = () => 1,
): number {
  const n = samples.length;
  const fft = new FFT(n);
  const spectrum = fft.createComplexArray() as number[];
  fft.realTransform(spectrum, Array.from(samples));
  let sum = 0;
  for (let k = 1; k < n / 2; k++) {
    const hertz = (k * sampleRateHertz) / n;
    if (hertz < lowHertz || hertz > highHertz) continue;
    const re = spectrum[2 * k];
    const im = spectrum[2 * k + 1];
    const w = weight(hertz);
    sum += (2 * (re * re + im * im) * w * w) / (n * n);
  }
  return sum;
}

export function variance(samples: Float64Array, mean = 0): number {
  let sum = 0;
  for (let i = 0; i < samples.length; i++) sum += (samples[i] - mean) ** 2;
  return sum / samples.length;
}

export function rms(samples: Float64Array): number {
  return Math.sqrt(variance(samples, 0));
}
