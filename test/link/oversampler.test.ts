import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.ts';
import { Decimator, Upsampler } from '../../src/link/oversampler.ts';

// Measurement targets are our own specification (docs/time-base.md): passband 0–0.45 × the audio
// rate with ripple ≤ 0.01 dB, rejection ≥ 100 dB of everything that would land in that band.
const FACTORS = [2, 4, 8] as const;
const WINDOW = 8192;

/** Amplitude of the component at `cyclesPerSample` (an exact bin of the window) by projection. */
function toneAmplitude(x: Float64Array, start: number, length: number, cyclesPerSample: number): number {
  let c = 0;
  let s = 0;
  for (let n = 0; n < length; n++) {
    const phase = 2 * Math.PI * cyclesPerSample * n;
    c += x[start + n] * Math.cos(phase);
    s += x[start + n] * Math.sin(phase);
  }
  return (2 / length) * Math.hypot(c, s);
}

function sine(length: number, cyclesPerSample: number, amplitude = 1): Float64Array {
  const x = new Float64Array(length);
  for (let n = 0; n < length; n++) x[n] = amplitude * Math.sin(2 * Math.PI * cyclesPerSample * n);
  return x;
}

function rms(x: Float64Array, start: number, length: number): number {
  let sum = 0;
  for (let n = start; n < start + length; n++) sum += x[n] * x[n];
  return Math.sqrt(sum / length);
}

const db = (ratio: number): number => 20 * Math.log10(ratio);

function upsample(factor: number, input: Float64Array): { out: Float64Array; up: Upsampler } {
  const up = new Upsampler(factor);
  const out = new Float64Array(input.length * factor);
  up.process(input, out);
  return { out, up };
}

function decimate(factor: number, input: Float64Array): { out: Float64Array; down: Decimator } {
  const down = new Decimator(factor);
  const out = new Float64Array(down.outputLengthFor(input.length));
  down.process(input, out);
  return { out, down };
}

describe.each(FACTORS)('oversampling by %i', (factor) => {
  const settle = 400; // audio-rate samples, longer than any stage's impulse response

  it('upsampler passband gain stays within 0.001 dB from 0 to 0.45 of the audio rate', () => {
    const gains: number[] = [];
    for (let bin = 8; bin <= 0.45 * WINDOW; bin += 181) {
      const f = bin / WINDOW;
      const { out } = upsample(factor, sine(settle + WINDOW, f));
      gains.push(db(toneAmplitude(out, settle * factor, WINDOW * factor, f / factor)));
    }
    gains.push(db(toneAmplitude(upsample(factor, sine(settle + WINDOW, 3686 / WINDOW)).out, settle * factor, WINDOW * factor, 3686 / WINDOW / factor)));
    expect(Math.max(...gains.map(Math.abs))).toBeLessThan(0.001);
  });

  it('decimator passband gain stays within 0.001 dB from 0 to 0.45 of the audio rate', () => {
    const gains: number[] = [];
    for (let bin = 8; bin <= 0.45 * WINDOW; bin += 181) {
      const f = bin / WINDOW;
      const { out } = decimate(factor, sine((settle + WINDOW) * factor, f / factor));
      gains.push(db(toneAmplitude(out, settle, WINDOW, f)));
    }
    expect(Math.max(...gains.map(Math.abs))).toBeLessThan(0.001);
  });

  it('upsampler images of passband tones are at least 100 dB down', () => {
    for (const f of [82 / WINDOW, 1638 / WINDOW, 3277 / WINDOW, 3686 / WINDOW]) {
      const { out } = upsample(factor, sine(settle + WINDOW, f));
      // Remove the wanted tone exactly; what is left is images (and rounding).
      const start = settle * factor;
      const length = WINDOW * factor;
      const residual = new Float64Array(length);
      let c = 0;
      let s = 0;
      for (let n = 0; n < length; n++) {
        const phase = (2 * Math.PI * f * n) / factor;
        c += out[start + n] * Math.cos(phase);
        s += out[start + n] * Math.sin(phase);
      }
      c *= 2 / length;
      s *= 2 / length;
      for (let n = 0; n < length; n++) {
        const phase = (2 * Math.PI * f * n) / factor;
        residual[n] = out[start + n] - c * Math.cos(phase) - s * Math.sin(phase);
      }
      expect(db(rms(residual, 0, length) / Math.SQRT1_2)).toBeLessThan(-100);
    }
  });

  it('decimator attenuates tones that would alias below 0.45 of the audio rate by at least 100 dB', () => {
    // Tones at the internal rate, in multiples of the audio rate: from the stopband edge 0.55 up to the internal Nyquist.
    const audioMultiples = [0.55, 0.6, 0.75, 0.99, 1.3, 1.45, 1.55, 2.5, 3.45, 3.9].filter((m) => m < factor / 2);
    for (const multiple of audioMultiples) {
      const { out } = decimate(factor, sine((settle + WINDOW) * factor, multiple / factor));
      expect(db(rms(out, settle, WINDOW) / Math.SQRT1_2)).toBeLessThan(-100);
    }
  });

  it('has unit DC gain in both directions, within the passband ripple', () => {
    const ones = new Float64Array((settle + 100) * factor).fill(1);
    const { out: upOut } = upsample(factor, ones.subarray(0, settle + 100));
    const { out: downOut } = decimate(factor, ones);
    for (let n = settle * factor; n < upOut.length; n++) expect(Math.abs(upOut[n] - 1)).toBeLessThan(2e-6);
    for (let n = settle; n < downOut.length; n++) expect(Math.abs(downOut[n] - 1)).toBeLessThan(2e-6);
  });

  it('reports whole-sample latencies where a delayed impulse actually lands (peak and symmetry centre)', () => {
    const at = 50;
    const impulse = new Float64Array(settle);
    impulse[at] = 1;
    const { out: upOut, up } = upsample(factor, impulse);
    expect(Number.isInteger(up.latencySamples)).toBe(true);
    const upPeak = (at + up.latencySamples) * factor;
    expect(upOut.indexOf(Math.max(...upOut))).toBe(upPeak);
    for (let k = 1; k < upPeak; k++) expect(upOut[upPeak + k]).toBeCloseTo(upOut[upPeak - k], 14);

    const wide = new Float64Array(settle * factor);
    wide[at * factor] = factor; // unit area at the audio rate
    const { out: downOut, down } = decimate(factor, wide);
    expect(Number.isInteger(down.latencySamples)).toBe(true);
    const downPeak = at + down.latencySamples;
    expect(downOut.indexOf(Math.max(...downOut))).toBe(downPeak);
    expect(downOut[downPeak]).toBeCloseTo(1, 4);
    expect(up.latencyInternalSamples).toBe(up.latencySamples * factor);
    expect(down.latencyInternalSamples).toBe(down.latencySamples * factor);
  });

  it('returns a band-limited signal through up and down unchanged apart from the summed latency (error below -100 dB)', () => {
    const n = 3000;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = 0.5 * Math.sin(0.05 * i) + 0.3 * Math.sin(2.7 * i + 1) + 0.2 * Math.cos(1.1 * i);
    const { out: high, up } = upsample(factor, x);
    const { out: back, down } = decimate(factor, high);
    const delay = up.latencySamples + down.latencySamples;
    let errorSquares = 0;
    let count = 0;
    for (let i = settle; i < n - delay; i++) {
      errorSquares += (back[i + delay] - x[i]) ** 2;
      count++;
    }
    expect(db(Math.sqrt(errorSquares / count) / rms(x, settle, count))).toBeLessThan(-100);
  });

  it('gives bit-identical output whether fed in chunks of 1, 7 or 512 samples or all at once', () => {
    const n = 2000;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = Math.sin(0.37 * i) + 0.1 * Math.cos(0.011 * i * i);
    const wholeUp = upsample(factor, x).out;
    const wholeDown = decimate(factor, wholeUp).out;
    for (const chunk of [1, 7, 512]) {
      const up = new Upsampler(factor);
      const upOut = new Float64Array(n * factor);
      for (let i = 0; i < n; i += chunk) {
        const part = x.subarray(i, Math.min(n, i + chunk));
        up.process(part, upOut.subarray(i * factor));
      }
      expect(upOut).toEqual(wholeUp);
      const down = new Decimator(factor);
      const downOut = new Float64Array(n);
      let written = 0;
      for (let i = 0; i < n * factor; i += chunk) {
        written += down.process(wholeUp.subarray(i, Math.min(n * factor, i + chunk)), downOut.subarray(written));
      }
      expect(written).toBe(n);
      expect(downOut).toEqual(wholeDown);
    }
  });
});

describe('oversampler arguments', () => {
  it('rejects a factor other than 2, 4 or 8 with an InputError naming the factor', () => {
    for (const bad of [1, 3, 16, 0, Number.NaN]) {
      expect(() => new Upsampler(bad)).toThrow(InputError);
      expect(() => new Decimator(bad)).toThrow(/oversampling factor/);
    }
  });

  it('rejects an output buffer too short for the samples it must hold', () => {
    expect(() => new Upsampler(4).process(new Float64Array(10), new Float64Array(39))).toThrow(/upsampler output/);
    expect(() => new Decimator(4).process(new Float64Array(40), new Float64Array(9))).toThrow(/decimator output/);
  });
});
