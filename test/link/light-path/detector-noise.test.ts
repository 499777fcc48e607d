import { describe, expect, it } from 'vitest';
import {
  DetectorNoise,
  checkDetectorNoiseSettings,
  shotNoiseRmsAmperes,
  thermalNoiseRmsAmperes,
  type DetectorNoiseSettings,
} from '../../../src/link/light-path/detector-noise.ts';
import { bandPower, variance } from '../noise-spectrum.ts';

const Q = 1.602176634e-19; // elementary charge, exact (SI 2019)
const K = 1.380649e-23; // Boltzmann constant, exact (SI 2019)
const FS = 192000;
const N = 1 << 17;

const base: DetectorNoiseSettings = { sampleRateHertz: FS, shotNoise: true, thermalNoiseOhms: null, temperatureKelvin: 300, seed: 11 };

function noiseOf(settings: DetectorNoiseSettings, meanAmperes: number, length = N): Float64Array {
  const input = new Float64Array(length).fill(meanAmperes);
  const output = new Float64Array(length);
  new DetectorNoise(settings).process(input, output);
  for (let i = 0; i < length; i++) output[i] -= meanAmperes;
  return output;
}

describe('detector noise formulas', () => {
  // Schottky 1918: i_rms = √(2qIB); 1 µA in 20 kHz → √(2·1.602176634e-19·1e-6·2e4) = 80.054 pA.
  it('gives 80.054 pA rms of shot noise for 1 µA in 20 kHz', () => {
    expect(shotNoiseRmsAmperes(1e-6, 20e3)).toBeCloseTo(80.054e-12, 15);
  });

  // Johnson 1928 / Nyquist 1928: i_rms = √(4kTB/R); 1 kΩ, 300 K, 20 kHz → 575.64 pA.
  it('gives 575.64 pA rms of thermal noise current for 1 kΩ at 300 K in 20 kHz', () => {
    expect(thermalNoiseRmsAmperes(1000, 300, 20e3)).toBeCloseTo(575.64e-12, 14);
  });
});

describe('simulated detector noise', () => {
  // Schottky 1918, one-sided density 2qI; a sample sequence at fs covers B = fs/2, so σ² = q·I·fs.
  it('has the shot-noise variance 2qI·(fs/2) per sample within 3 %', () => {
    const x = noiseOf(base, 1e-6);
    expect(Math.abs(variance(x) / (2 * Q * 1e-6 * (FS / 2)) - 1)).toBeLessThan(0.03);
  });

  // Schottky 1918: in any band B the power is 2qI·B — here 0…20 kHz of a 192 kHz simulation, by periodogram.
  it('has the shot-noise power 2qIB in a 20 kHz band within 3 %', () => {
    const x = noiseOf(base, 1e-6);
    const expected = shotNoiseRmsAmperes(1e-6, 20e3) ** 2;
    expect(Math.abs(bandPower(x, FS, 0, 20e3) / expected - 1)).toBeLessThan(0.03);
  });

  // Shot-noise power is proportional to the mean current (Schottky 1918): 100× the current, 100× the variance.
  it('scales its shot-noise variance with the mean current', () => {
    const small = variance(noiseOf(base, 1e-8));
    const large = variance(noiseOf(base, 1e-6));
    expect(Math.abs(small / (Q * 1e-8 * FS) - 1)).toBeLessThan(0.03);
    expect(Math.abs(large / small / 100 - 1)).toBeLessThan(0.05);
  });

  // Johnson–Nyquist: density 4kT/R, so σ² = (4kT/R)·fs/2 per sample and 4kTB/R in a band B.
  it('has the thermal-noise variance 4kT(fs/2)/R per sample and 4kTB/R in 20 kHz within 3 %', () => {
    const settings = { ...base, shotNoise: false, thermalNoiseOhms: 10e3, temperatureKelvin: 300 };
    const x = noiseOf(settings, 0);
    expect(Math.abs(variance(x) / ((4 * K * 300 * (FS / 2)) / 10e3) - 1)).toBeLessThan(0.03);
    expect(Math.abs(bandPower(x, FS, 0, 20e3) / thermalNoiseRmsAmperes(10e3, 300, 20e3) ** 2 - 1)).toBeLessThan(0.03);
  });

  // Independent noises add in power: shot + thermal.
  it('adds shot and thermal noise in power', () => {
    const settings = { ...base, thermalNoiseOhms: 100e3 };
    const x = noiseOf(settings, 1e-7);
    const expected = Q * 1e-7 * FS + (2 * K * 300 * FS) / 100e3;
    expect(Math.abs(variance(x) / expected - 1)).toBeLessThan(0.03);
  });

  it('adds no noise to zero or negative current when thermal noise is off', () => {
    const input = Float64Array.from([0, -1e-6, 0]);
    const out = new Float64Array(3);
    new DetectorNoise(base).process(input, out);
    expect(out).toEqual(input);
  });

  it('repeats exactly for the same seed, differs for another seed, and restarts on reset', () => {
    const a = noiseOf(base, 1e-6, 1000);
    expect(noiseOf(base, 1e-6, 1000)).toEqual(a);
    expect(noiseOf({ ...base, seed: 12 }, 1e-6, 1000)).not.toEqual(a);
    const block = new DetectorNoise(base);
    const input = new Float64Array(1000).fill(1e-6);
    const first = new Float64Array(1000);
    block.process(input, first);
    block.reset();
    const second = new Float64Array(1000);
    block.process(input, second);
    expect(second).toEqual(first);
  });

  it('gives the same noise whether the current arrives in one chunk or many', () => {
    const settings = { ...base, thermalNoiseOhms: 1e4 };
    const input = new Float64Array(5000);
    for (let i = 0; i < input.length; i++) input[i] = 1e-6 * (1 + 0.5 * Math.sin(i / 30));
    const whole = new Float64Array(5000);
    new DetectorNoise(settings).process(input, whole);
    const block = new DetectorNoise(settings);
    const pieces = new Float64Array(5000);
    for (let start = 0; start < 5000; start += 777) {
      const end = Math.min(5000, start + 777);
      const out = new Float64Array(end - start);
      block.process(input.subarray(start, end), out);
      pieces.set(out, start);
    }
    expect(pieces).toEqual(whole);
  });

  it('names the field of bad settings', () => {
    expect(() => checkDetectorNoiseSettings({ ...base, thermalNoiseOhms: 0 })).toThrow(/detectorNoise\.thermalNoiseOhms: got 0/);
    expect(() => checkDetectorNoiseSettings({ ...base, shotNoise: 'yes' })).toThrow(/detectorNoise\.shotNoise: got "yes"; expected true or false/);
    expect(() => checkDetectorNoiseSettings({ ...base, temperatureKelvin: -5 })).toThrow(/detectorNoise\.temperatureKelvin: got -5/);
    expect(() => checkDetectorNoiseSettings({ ...base, seed: -1 })).toThrow(/detectorNoise\.seed/);
  });
});
