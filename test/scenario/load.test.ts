import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseCircuit } from '../../src/circuit/parse.ts';
import { loadScenario, loadScenarioText } from '../../src/scenario/load.ts';
import type { Scenario } from '../../src/scenario/types.ts';
import { FILES, filesResolver, fullScenario, inputErrorOf, minimalScenario, receiverCircuit, transmitterCircuit } from './fixtures.ts';

describe('loadScenario', () => {
  it('maps every field of a full scenario to SI numbers with unit names, inline and file circuits parsed', () => {
    const resolver = filesResolver(FILES);
    const scenario = loadScenario(fullScenario(), resolver, 'link.json');
    const expected: Scenario = {
      title: 'test link',
      description: 'every field written',
      sampleRateHertz: 44100,
      oversampling: 8,
      method: 'bdf2',
      source: { kind: 'tone', frequencyHertz: 1000, seconds: 0.5, level: { kind: 'spl', dbSpl: 72 } },
      microphone: { sensitivityDbvPerPascal: -44, outputResistanceOhms: 2200, selfNoiseDbaSpl: 28, seed: 11 },
      transmitter: { circuit: parseCircuit(transmitterCircuit()), inputSource: 'VMIC', led: 'D1', cutoffAmperes: 50e-6 },
      lightPath: {
        channel: {
          kind: 'free-space',
          distanceMetres: 4,
          halfPowerSemiAngleDegrees: 15,
          detectorAreaSquareMetres: 1e-5,
          irradianceAngleDegrees: 5,
          incidenceAngleDegrees: 10,
          filterTransmission: 0.9,
          concentratorRefractiveIndex: 1.5,
          fieldOfViewSemiAngleDegrees: 60,
        },
        ambient: {
          meanPowerWatts: 1e-6,
          mainsFrequencyHertz: 50,
          flickerModulationDepth: 0.3,
          flickerHarmonicAmplitudes: [1, 0.2],
          flickerHarmonicPhasesDegrees: [0, 90],
        },
        darkCurrentAmperes: 1e-8,
        shotNoise: false,
        thermalNoiseOhms: 10000,
        seed: 12,
      },
      receiver: { circuit: parseCircuit(receiverCircuit()), detector: 'Q1', output: ['spk', 'gnd'], speakerOhms: 8 },
      output: { listeningGainDb: 6, format: 'float32' },
      taps: ['transmitter.led', 'light.detectorWatts'],
    };
    expect(scenario).toEqual(expected);
    expect(scenario.receiver.circuit.temperatureCelsius).toBe(25);
    expect(resolver.reads).toEqual(['circuits/rx.json']);
  });

  it('fills the documented defaults when optional fields are left out', () => {
    const scenario = loadScenario(minimalScenario(), filesResolver({}));
    expect(scenario.title).toBeUndefined();
    expect(scenario.description).toBeUndefined();
    expect(scenario.sampleRateHertz).toBe(48000);
    expect(scenario.oversampling).toBe(4);
    expect(scenario.method).toBe('tr');
    expect(scenario.source).toEqual({ kind: 'recording', file: 'speech/talk.wav', level: { kind: 'effort', effort: 'normal', distanceMetres: 0.5 } });
    expect(scenario.microphone).toEqual({ sensitivityDbvPerPascal: -44, outputResistanceOhms: 2200, selfNoiseDbaSpl: null, seed: 2 });
    expect(scenario.transmitter.cutoffAmperes).toBe(10e-6);
    expect(scenario.lightPath).toEqual({
      channel: { kind: 'light-guide', lengthMetres: 2, couplingLossDb: 3, attenuationDbPerMetre: 0.2 },
      ambient: null,
      darkCurrentAmperes: 0,
      shotNoise: true,
      thermalNoiseOhms: null,
      seed: 3,
    });
    expect(scenario.receiver.speakerOhms).toBeNull();
    expect(scenario.output).toEqual({ listeningGainDb: 0, format: 'pcm16' });
    expect(scenario.taps).toEqual([]);
  });

  it('fills free-space, ambient and generator-seed defaults', () => {
    const json = minimalScenario();
    json.source = { kind: 'speech-like', seconds: 3, level: { dbSpl: 65 } };
    json.lightPath.channel = { kind: 'free-space', distance: 2, halfPowerSemiAngle: 30, detectorArea: 1e-5 };
    json.lightPath.ambient = { power: '2u', mainsFrequency: 60, flickerDepth: 0.1 };
    const scenario = loadScenario(json, filesResolver({}));
    expect(scenario.source).toEqual({ kind: 'speech-like', seconds: 3, seed: 1, level: { kind: 'spl', dbSpl: 65 } });
    expect(scenario.lightPath.channel).toEqual({
      kind: 'free-space',
      distanceMetres: 2,
      halfPowerSemiAngleDegrees: 30,
      detectorAreaSquareMetres: 1e-5,
      irradianceAngleDegrees: 0,
      incidenceAngleDegrees: 0,
      filterTransmission: 1,
      concentratorRefractiveIndex: null,
      fieldOfViewSemiAngleDegrees: 90,
    });
    expect(scenario.lightPath.ambient).toEqual({
      meanPowerWatts: 2e-6,
      mainsFrequencyHertz: 60,
      flickerModulationDepth: 0.1,
      flickerHarmonicAmplitudes: [1],
      flickerHarmonicPhasesDegrees: [],
    });
  });

  it('maps every source kind', () => {
    const level = { dbSpl: 70 };
    const cases: Array<[unknown, Scenario['source']]> = [
      [{ kind: 'two-tone', preset: 'smpte', seconds: 1, level }, { kind: 'two-tone', preset: 'smpte', seconds: 1, level: { kind: 'spl', dbSpl: 70 } }],
      [
        { kind: 'sweep', start: 20, end: '20k', seconds: '2', level },
        { kind: 'sweep', startHertz: 20, endHertz: 20000, seconds: 2, level: { kind: 'spl', dbSpl: 70 } },
      ],
      [{ kind: 'pink-noise', seconds: 1, seed: 99, level }, { kind: 'pink-noise', seconds: 1, seed: 99, level: { kind: 'spl', dbSpl: 70 } }],
    ];
    for (const [source, expected] of cases) {
      const json = minimalScenario();
      json.source = source;
      expect(loadScenario(json, filesResolver({})).source).toEqual(expected);
    }
  });

  it('does not change the JSON it was given', () => {
    const json = fullScenario();
    const before = JSON.stringify(json);
    loadScenario(json, filesResolver(FILES));
    expect(JSON.stringify(json)).toBe(before);
  });
});

describe('loadScenarioText', () => {
  it('reads the text of a scenario file', () => {
    const scenario = loadScenarioText(JSON.stringify(fullScenario()), filesResolver(FILES), 'link.json');
    expect(scenario.sampleRateHertz).toBe(44100);
  });

  it('reports JSON syntax errors with the label, line and column', () => {
    const error = inputErrorOf(() => loadScenarioText('{\n  "format": "glowtalk.scenario/1",\n}', filesResolver({}), 'link.json'));
    expect(error.where).toBe('link.json line 3, column 1');
  });

  it('starts every validation error with the label', () => {
    const json = fullScenario();
    json.lightPath.channel.distance = -4;
    const error = inputErrorOf(() => loadScenarioText(JSON.stringify(json), filesResolver(FILES), 'link.json'));
    expect(error.where).toBe('link.json: lightPath.channel.distance');
    expect(error.message).toBe('link.json: lightPath.channel.distance: got -4; expected a distance in metres > 0');
  });

  it('gives an inline circuit\'s errors the label and the full path prefix', () => {
    const json = fullScenario();
    json.transmitter.circuit.parts[2].value = '10uu';
    const error = inputErrorOf(() => loadScenarioText(JSON.stringify(json), filesResolver(FILES), 'link.json'));
    expect(error.where).toBe('link.json: transmitter.circuit.parts[2].value');
  });
});

describe('docs/scenario-format.md', () => {
  it('its complete example loads', () => {
    const doc = readFileSync(new URL('../../docs/scenario-format.md', import.meta.url), 'utf8');
    const example = /```json\n([\s\S]*?)```/.exec(doc)![1];
    const files = { 'circuits/tx.json': JSON.stringify(transmitterCircuit()), 'circuits/rx.json': JSON.stringify(receiverCircuit()) };
    const scenario = loadScenarioText(example, filesResolver(files), 'docs example');
    expect(scenario.source).toEqual({ kind: 'recording', file: 'speech/talk.wav', level: { kind: 'effort', effort: 'normal', distanceMetres: 0.3 } });
    expect(scenario.lightPath.ambient?.meanPowerWatts).toBe(1e-6);
  });
});
