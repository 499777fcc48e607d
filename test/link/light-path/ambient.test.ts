import { describe, expect, it } from 'vitest';
import { AmbientLight, checkAmbientLightSettings, type AmbientLightSettings } from '../../../src/link/light-path/ambient.ts';

const base: AmbientLightSettings = {
  meanPowerWatts: 2e-6,
  mainsFrequencyHertz: 50,
  flickerModulationDepth: 0.3,
  flickerHarmonicAmplitudes: [1],
  flickerHarmonicPhasesDegrees: [],
  sampleRateHertz: 48000,
};

function render(settings: AmbientLightSettings, length: number, chunk = length): Float64Array {
  const block = new AmbientLight(settings);
  const out = new Float64Array(length);
  const zeros = new Float64Array(chunk);
  const buffer = new Float64Array(chunk);
  for (let start = 0; start < length; start += chunk) {
    const n = Math.min(chunk, length - start);
    if (n === chunk) {
      block.process(zeros, buffer);
      out.set(buffer, start);
    } else {
      const tail = new Float64Array(n);
      block.process(new Float64Array(n), tail);
      out.set(tail, start);
    }
  }
  return out;
}

/** Amplitude of the component at `hertz` by a single-bin DFT over a whole number of cycles. */
function amplitudeAt(x: Float64Array, sampleRateHertz: number, hertz: number): number {
  let re = 0;
  let im = 0;
  for (let n = 0; n < x.length; n++) {
    const angle = (2 * Math.PI * hertz * n) / sampleRateHertz;
    re += x[n] * Math.cos(angle);
    im -= x[n] * Math.sin(angle);
  }
  return (2 * Math.hypot(re, im)) / x.length;
}

function mean(x: Float64Array): number {
  let sum = 0;
  for (const v of x) sum += v;
  return sum / x.length;
}

describe('ambient light with mains flicker', () => {
  // Lamp power ∝ i² and cos²(ωt) = (1 + cos 2ωt)/2 (trigonometric identity): 50 Hz mains flickers at 100 Hz.
  it('flickers at 100 Hz on 50 Hz mains and at 120 Hz on 60 Hz mains, with nothing at the mains frequency', () => {
    const x = render(base, 48000); // one second: whole cycles of every component
    const depthWatts = 0.3 * 2e-6;
    expect(amplitudeAt(x, 48000, 100) / depthWatts).toBeCloseTo(1, 9);
    expect(amplitudeAt(x, 48000, 50)).toBeLessThan(1e-18);
    expect(amplitudeAt(x, 48000, 200)).toBeLessThan(1e-18);
    const y = render({ ...base, mainsFrequencyHertz: 60 }, 48000);
    expect(amplitudeAt(y, 48000, 120) / depthWatts).toBeCloseTo(1, 9);
  });

  it('places harmonics at multiples of twice the mains frequency in the stated proportions', () => {
    const x = render({ ...base, flickerHarmonicAmplitudes: [1, 0.25, 0.1], flickerHarmonicPhasesDegrees: [0, 90, 30] }, 48000);
    const a100 = amplitudeAt(x, 48000, 100);
    expect(amplitudeAt(x, 48000, 200) / a100).toBeCloseTo(0.25, 9);
    expect(amplitudeAt(x, 48000, 300) / a100).toBeCloseTo(0.1, 9);
    expect(amplitudeAt(x, 48000, 150)).toBeLessThan(1e-18);
  });

  // Modulation depth ("percent flicker") = (P_max − P_min)/(P_max + P_min) (IEEE Std 1789-2015; from memory).
  it('has the stated modulation depth and mean power', () => {
    const x = render(base, 48000);
    const max = Math.max(...x);
    const min = Math.min(...x);
    expect((max - min) / (max + min)).toBeCloseTo(0.3, 12);
    expect(mean(x)).toBeCloseTo(2e-6, 18);
    // With harmonics the extremes move; sample finely to see them.
    const rich = { ...base, flickerHarmonicAmplitudes: [1, 0.4, 0.2], flickerHarmonicPhasesDegrees: [0, 45, 10], sampleRateHertz: 1_000_000 };
    const z = render(rich, 100_000);
    const zMax = Math.max(...z);
    const zMin = Math.min(...z);
    expect(Math.abs((zMax - zMin) / (zMax + zMin) - 0.3)).toBeLessThan(1e-7);
    expect(mean(z)).toBeCloseTo(2e-6, 17);
  });

  it('reaches zero light at full modulation depth and never goes below it', () => {
    const x = render({ ...base, flickerModulationDepth: 1, flickerHarmonicAmplitudes: [1, 0.5] }, 48000);
    expect(Math.min(...x)).toBeGreaterThanOrEqual(-1e-20);
    expect(Math.min(...x)).toBeLessThan(1e-9 * 2e-6);
  });

  it('is phase continuous: chunked output equals one-chunk output bit for bit', () => {
    const settings = { ...base, mainsFrequencyHertz: 60, flickerHarmonicAmplitudes: [1, 0.3, 0.05] };
    const whole = render(settings, 20000);
    expect(render(settings, 20000, 441)).toEqual(whole);
    expect(render(settings, 3000, 1)).toEqual(whole.subarray(0, 3000));
  });

  it('adds to the signal it is given and restarts from phase zero after reset', () => {
    const block = new AmbientLight(base);
    const signal = Float64Array.from([1e-3, 2e-3, 3e-3]);
    const out = new Float64Array(3);
    block.process(signal, out);
    const alone = render(base, 3);
    for (let i = 0; i < 3; i++) expect(out[i]).toBe(signal[i] + alone[i]);
    block.reset();
    const again = new Float64Array(3);
    block.process(new Float64Array(3), again);
    expect(again).toEqual(alone);
  });

  it('is steady light when the modulation depth is zero', () => {
    const x = render({ ...base, flickerModulationDepth: 0 }, 100);
    expect(x.every((v) => v === 2e-6)).toBe(true);
  });

  it('names the field of bad settings', () => {
    expect(() => checkAmbientLightSettings({ ...base, flickerModulationDepth: 1.2 })).toThrow(
      /ambient\.flickerModulationDepth: got 1.2; expected a modulation depth from 0 to 1/,
    );
    expect(() => checkAmbientLightSettings({ ...base, flickerHarmonicAmplitudes: [1, -0.5] })).toThrow(/ambient\.flickerHarmonicAmplitudes\[1\]: got -0.5/);
    expect(() => checkAmbientLightSettings({ ...base, flickerHarmonicAmplitudes: [] })).toThrow(/at least one amplitude above 0/);
    expect(() => checkAmbientLightSettings({ ...base, sampleRateHertz: 8000, flickerHarmonicAmplitudes: [1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1] })).toThrow(
      /harmonics below half the sample rate/,
    );
    expect(() => checkAmbientLightSettings({ ...base, meanPowerWatts: -1 })).toThrow(/ambient\.meanPowerWatts: got -1/);
  });
});
