import { describe, expect, it } from 'vitest';
import { loadScenario } from '../../src/scenario/load.ts';
import { settingsSummary } from '../../src/scenario/summary.ts';
import { FILES, filesResolver, fullScenario, minimalScenario } from './fixtures.ts';

describe('settingsSummary', () => {
  it('lists every setting as plain JSON, circuits by title and part count', () => {
    const summary = settingsSummary(loadScenario(fullScenario(), filesResolver(FILES)));
    expect(JSON.parse(JSON.stringify(summary))).toEqual(summary);
    expect(summary.transmitter).toEqual({
      circuit: { title: 'test transmitter', partCount: 8, temperatureCelsius: 27 },
      inputSource: 'VMIC',
      led: 'D1',
      cutoffAmperes: 50e-6,
    });
    expect(summary.receiver).toEqual({
      circuit: { title: 'test receiver', partCount: 5, temperatureCelsius: 25 },
      detector: 'Q1',
      output: ['spk', 'gnd'],
      speakerOhms: 8,
    });
    expect(summary).toMatchObject({
      format: 'glowtalk.scenario/1',
      title: 'test link',
      sampleRateHertz: 44100,
      oversampling: 8,
      internalSampleRateHertz: 352800,
      method: 'bdf2',
      source: { kind: 'tone', frequencyHertz: 1000, seconds: 0.5, level: { kind: 'spl', dbSpl: 72 } },
      microphone: { sensitivityDbvPerPascal: -44, outputResistanceOhms: 2200, selfNoiseDbaSpl: 28, seed: 11 },
      lightPath: { darkCurrentAmperes: 1e-8, shotNoise: false, thermalNoiseOhms: 10000, seed: 12, ambient: { meanPowerWatts: 1e-6 } },
      output: { listeningGainDb: 6, format: 'float32' },
      taps: ['transmitter.led', 'light.detectorWatts'],
    });
    expect(JSON.stringify(summary)).not.toContain('saturationCurrent');
  });

  it('states the talker level an effort and distance give, and the channel gain', () => {
    const summary = settingsSummary(loadScenario(minimalScenario(), filesResolver({}))) as Record<string, any>;
    // ANSI S3.5-1997 Table 3: normal effort 62.35 dB SPL at 1 m; at 0.5 m the inverse-distance law adds 20·log10(2) dB.
    expect(summary.source.level.dbSpl).toBeCloseTo(62.35 + 20 * Math.log10(2), 10);
    // Light guide: 3 dB coupling + 0.2 dB/m × 2 m = 3.4 dB of optical power.
    expect(summary.lightPath.channel.gainDb).toBeCloseTo(-3.4, 10);
    expect(summary.lightPath.channel.gain).toBeCloseTo(10 ** -0.34, 10);
    expect(summary.lightPath.ambient).toBeNull();
    expect(summary.title).toBeNull();
  });

  it('gives a null gain in dB when the detector is outside the field of view', () => {
    const json = fullScenario();
    json.lightPath.channel.incidenceAngle = 70;
    const summary = settingsSummary(loadScenario(json, filesResolver(FILES))) as Record<string, any>;
    expect(summary.lightPath.channel.gain).toBe(0);
    expect(summary.lightPath.channel.gainDb).toBeNull();
  });
});
