import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.ts';
import { resample } from '../../src/audio/resample.ts';

// Targets are our own specification (docs/time-base.md): flat to 0.45 × the lower rate, ≥ 90 dB
// rejection of what would alias, output sample k at exactly t = k/to.
function sine(length: number, hertz: number, frequencyHertz: number, amplitude = 1): Float64Array {
  const x = new Float64Array(length);
  for (let n = 0; n < length; n++) x[n] = amplitude * Math.sin((2 * Math.PI * frequencyHertz * n) / hertz);
  return x;
}

/** Error of y against the analytic sine at rate `hertz`, in dB re the sine's power, away from the edges. */
function errorDb(y: Float64Array, hertz: number, frequencyHertz: number, from: number, to: number): number {
  let error = 0;
  let power = 0;
  for (let k = from; k < to; k++) {
    const reference = Math.sin((2 * Math.PI * frequencyHertz * k) / hertz);
    error += (y[k] - reference) ** 2;
    power += reference ** 2;
  }
  return 10 * Math.log10(error / power);
}

function rmsDb(y: Float64Array, from: number, to: number): number {
  let sum = 0;
  for (let k = from; k < to; k++) sum += y[k] * y[k];
  return 10 * Math.log10(sum / (to - from));
}

const EDGE = 300; // output samples skipped at each end (the kernel's reach at the lower rate is 65 samples)

describe('resample', () => {
  it('turns a 1 kHz sine at 44.1 kHz into the analytic 1 kHz sine at 48 kHz (error below -80 dB, also at the end of 3 s)', () => {
    const y = resample(sine(3 * 44100, 44100, 1000), 44100, 48000);
    expect(y.length).toBe(3 * 48000);
    expect(errorDb(y, 48000, 1000, EDGE, y.length - EDGE)).toBeLessThan(-80);
    // A time-scale error would grow with time: the last 0.1 s is checked on its own.
    expect(errorDb(y, 48000, 1000, y.length - 4800 - EDGE, y.length - EDGE)).toBeLessThan(-80);
  });

  it('keeps sample k at t = k/to for an irrational ratio (48 kHz to 10π kHz, 3.3 kHz tone)', () => {
    const to = 10000 * Math.PI;
    const y = resample(sine(48000, 48000, 3300), 48000, to);
    expect(y.length).toBe(Math.round(to));
    expect(errorDb(y, to, 3300, EDGE, y.length - EDGE)).toBeLessThan(-80);
  });

  it('upsamples 8 kHz to 48 kHz without images: a 3.5 kHz tone comes out clean (error below -80 dB)', () => {
    const y = resample(sine(8000, 8000, 3500), 8000, 48000);
    expect(errorDb(y, 48000, 3500, 6 * EDGE, y.length - 6 * EDGE)).toBeLessThan(-80);
  });

  it('is flat to 0.45 of the lower rate within 0.001 dB (48 kHz to 10 kHz)', () => {
    for (const f of [100, 1000, 2500, 4000, 4500]) {
      const y = resample(sine(48000, 48000, f), 48000, 10000);
      // Least-squares amplitude of the tone at the new rate.
      let c = 0;
      let s = 0;
      for (let k = EDGE; k < 10000 - EDGE; k++) {
        c += y[k] * Math.cos((2 * Math.PI * f * k) / 10000);
        s += y[k] * Math.sin((2 * Math.PI * f * k) / 10000);
      }
      const amplitude = (2 / (10000 - 2 * EDGE)) * Math.hypot(c, s);
      expect(Math.abs(20 * Math.log10(amplitude))).toBeLessThan(0.001);
    }
  });

  it('removes tones above the new Nyquist frequency by at least 90 dB (48 kHz to 10 kHz)', () => {
    for (const f of [5000, 5200, 6000, 9000, 15000, 23000]) {
      const y = resample(sine(48000, 48000, f, Math.SQRT2), 48000, 10000); // 0 dB rms in
      expect(rmsDb(y, EDGE, y.length - EDGE)).toBeLessThan(-90);
    }
  });

  it('removes a 23 kHz tone when going from 48 kHz to 44.1 kHz by at least 90 dB', () => {
    const y = resample(sine(48000, 48000, 23000, Math.SQRT2), 48000, 44100);
    expect(rmsDb(y, EDGE, y.length - EDGE)).toBeLessThan(-90);
  });

  it('returns round(n·to/from) samples', () => {
    for (const [n, from, to] of [
      [1001, 44100, 48000],
      [999, 48000, 10000],
      [7, 8000, 48000],
      [12345, 48000, 44100],
      [100, 48000, 48000],
    ]) {
      expect(resample(new Float64Array(n), from, to).length).toBe(Math.round((n * to) / from));
    }
    expect(resample(new Float64Array(0), 44100, 48000).length).toBe(0);
  });

  it('preserves DC within the passband ripple (1e-5) away from the edges', () => {
    for (const [from, to] of [
      [44100, 48000],
      [48000, 10000],
      [8000, 48000],
      [48000, 31415.5],
    ]) {
      const y = resample(new Float64Array(from).fill(0.7), from, to);
      let worst = 0;
      for (let k = 6 * EDGE; k < y.length - 6 * EDGE; k++) worst = Math.max(worst, Math.abs(y[k] - 0.7));
      expect(worst).toBeLessThan(0.7e-5);
    }
  });

  it('returns an equal-rate input as an unchanged copy', () => {
    const x = sine(100, 48000, 1000);
    const y = resample(x, 48000, 48000);
    expect(y).toEqual(x);
    expect(y).not.toBe(x);
  });

  it('rejects non-positive or non-finite rates with an InputError naming the argument', () => {
    const x = new Float64Array(10);
    for (const bad of [0, -48000, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => resample(x, bad, 48000)).toThrow(InputError);
      expect(() => resample(x, bad, 48000)).toThrow(/^fromHertz/);
      expect(() => resample(x, 48000, bad)).toThrow(/^toHertz/);
    }
  });

  it('rejects a non-finite sample, naming its index', () => {
    const x = new Float64Array(10);
    x[3] = Number.NaN;
    expect(() => resample(x, 44100, 48000)).toThrow(/samples\[3\]/);
  });
});
