import { describe, expect, it } from 'vitest';
import { LightPath, checkLightPathSettings, type LightPathSettings } from '../../../src/link/light-path/light-path.ts';
import { variance } from '../noise-spectrum.ts';

const Q = 1.602176634e-19; // elementary charge, exact (SI 2019)
const FS = 96000;

const freeSpace: LightPathSettings = {
  sampleRateHertz: FS,
  channel: {
    kind: 'free-space',
    halfPowerSemiAngleDegrees: 60,
    detectorAreaSquareMetres: 1e-4,
    distanceMetres: 1,
    irradianceAngleDegrees: 0,
    incidenceAngleDegrees: 0,
    filterTransmission: 1,
    concentratorRefractiveIndex: null,
    fieldOfViewSemiAngleDegrees: 90,
  },
  ambient: null,
  detector: { responsivityAmperesPerWatt: 0.4, darkCurrentAmperes: 0, shotNoise: false, thermalNoiseOhms: null, temperatureKelvin: 300, seed: 3 },
};

const guide: LightPathSettings = {
  ...freeSpace,
  channel: { kind: 'light-guide', couplingLossDb: 0, attenuationDbPerMetre: 0.15, lengthMetres: 10 },
};

const ambient = {
  meanPowerWatts: 1e-6,
  mainsFrequencyHertz: 50,
  flickerModulationDepth: 0.2,
  flickerHarmonicAmplitudes: [1, 0.2],
  flickerHarmonicPhasesDegrees: [],
};

describe('light path', () => {
  // Kahn & Barry 1997: m = 1, A = 1 cm², d = 1 m on axis → H = 1e-4/π = 3.183099e-5.
  it('scales emitter power by the free-space line-of-sight gain', () => {
    const path = new LightPath(freeSpace);
    expect(Math.abs(path.gain / 3.183099e-5 - 1)).toBeLessThan(1e-6);
    const out = new Float64Array(3);
    path.process(Float64Array.from([0, 10e-3, 20e-3]), out);
    expect(Array.from(out)).toEqual([0, path.gain * 10e-3, path.gain * 20e-3]);
  });

  // Decibel definition: 0.15 dB/m × 10 m = 1.5 dB → T = 0.707946.
  it('scales emitter power by the light-guide transmission', () => {
    const path = new LightPath(guide);
    expect(Math.abs(path.gain - 0.707946)).toBeLessThan(1e-6);
  });

  it('adds ambient light and flicker on top of the signal, continuing across chunks', () => {
    const settings = { ...guide, ambient };
    const emitter = new Float64Array(4800);
    for (let i = 0; i < emitter.length; i++) emitter[i] = 5e-3 * (1 + 0.5 * Math.sin(i / 10));
    const whole = new Float64Array(4800);
    new LightPath(settings).process(emitter, whole);
    const dark = new Float64Array(4800);
    new LightPath(guide).process(emitter, dark);
    let sumAmbient = 0;
    for (let i = 0; i < 4800; i++) sumAmbient += whole[i] - dark[i];
    expect(sumAmbient / 4800).toBeCloseTo(1e-6, 15); // 4800 samples = 5 whole 100 Hz cycles at 96 kHz
    const chunked = new Float64Array(4800);
    const path = new LightPath(settings);
    const buffer = new Float64Array(600);
    for (let start = 0; start < 4800; start += 600) {
      path.process(emitter.subarray(start, start + 600), buffer);
      chunked.set(buffer, start);
    }
    expect(chunked).toEqual(whole);
  });

  it('turns detector power into photocurrent R·P + dark current when noise is off', () => {
    const path = new LightPath({ ...freeSpace, detector: { ...freeSpace.detector, darkCurrentAmperes: 1e-9 } });
    const amps = new Float64Array(2);
    path.photocurrent(Float64Array.from([0, 1e-6]), amps);
    expect(amps[0]).toBe(1e-9);
    expect(amps[1]).toBeCloseTo(0.4e-6 + 1e-9, 20);
  });

  // Schottky 1918: shot variance 2qI·(fs/2) = q·I·fs for I = R·P + I_dark (signal, ambient and dark current alike).
  it('adds shot noise of the whole photocurrent, including ambient and dark current', () => {
    const settings: LightPathSettings = {
      ...guide,
      ambient: { ...ambient, flickerModulationDepth: 0 },
      detector: { ...guide.detector, shotNoise: true, darkCurrentAmperes: 2e-8 },
    };
    const path = new LightPath(settings);
    const emitter = new Float64Array(1 << 17).fill(1e-3);
    const watts = new Float64Array(emitter.length);
    path.process(emitter, watts);
    const amps = new Float64Array(emitter.length);
    path.photocurrent(watts, amps);
    const meanAmperes = 0.4 * (0.707946 * 1e-3 + 1e-6) + 2e-8;
    expect(Math.abs(variance(amps, meanAmperes) / (Q * meanAmperes * FS) - 1)).toBeLessThan(0.03);
  });

  it('repeats its noise after reset', () => {
    const settings: LightPathSettings = { ...freeSpace, ambient, detector: { ...freeSpace.detector, shotNoise: true, thermalNoiseOhms: 1e4 } };
    const path = new LightPath(settings);
    const run = (): Float64Array => {
      const watts = new Float64Array(500);
      path.process(new Float64Array(500).fill(1e-2), watts);
      const amps = new Float64Array(500);
      path.photocurrent(watts, amps);
      return amps;
    };
    const first = run();
    path.reset();
    expect(run()).toEqual(first);
  });

  it('names the field of bad settings', () => {
    expect(() =>
      checkLightPathSettings({ ...freeSpace, channel: { ...freeSpace.channel, distanceMetres: -2 } }),
    ).toThrow('lightPath.channel.distanceMetres: got -2; expected a positive number of metres');
    expect(() => checkLightPathSettings({ ...freeSpace, channel: { kind: 'wormhole' } })).toThrow(
      /lightPath\.channel\.kind: got "wormhole"; expected "free-space" or "light-guide"/,
    );
    expect(() => checkLightPathSettings({ ...freeSpace, ambient: { ...ambient, mainsFrequencyHertz: 0 } })).toThrow(
      /lightPath\.ambient\.mainsFrequencyHertz: got 0/,
    );
    expect(() =>
      checkLightPathSettings({ ...freeSpace, detector: { ...freeSpace.detector, responsivityAmperesPerWatt: 0 } }),
    ).toThrow(/lightPath\.detector\.responsivityAmperesPerWatt: got 0/);
    expect(() => checkLightPathSettings({ ...freeSpace, detector: { ...freeSpace.detector, seed: 'x' } })).toThrow(/lightPath\.detector\.seed/);
  });
});
