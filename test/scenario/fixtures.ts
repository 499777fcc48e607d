/** Small scenario objects for the scenario tests: tiny circuits, every block written out. */
import type { ScenarioResolver } from '../../src/scenario/load.ts';

/** LED in the collector of an NPN stage whose base the microphone drives through C1. */
export function transmitterCircuit(): Record<string, unknown> {
  return {
    format: 'glowtalk.circuit/1',
    title: 'test transmitter',
    parts: [
      { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 5 },
      { ref: 'VMIC', kind: 'voltage-source', pins: ['mic', 'gnd'], wave: { shape: 'upstream' } },
      { ref: 'C1', kind: 'capacitor', pins: ['mic', 'base'], value: '10u' },
      { ref: 'RB1', kind: 'resistor', pins: ['vcc', 'base'], value: '10k' },
      { ref: 'RB2', kind: 'resistor', pins: ['base', 'gnd'], value: '5.6k' },
      { ref: 'Q1', kind: 'npn', pins: ['cathode', 'base', 'emitter'], model: 'generic-npn' },
      { ref: 'RE', kind: 'resistor', pins: ['emitter', 'gnd'], value: 100 },
      { ref: 'D1', kind: 'led', pins: ['vcc', 'cathode'], model: 'generic-red-led' },
    ],
  };
}

/** Phototransistor emitter follower, AC-coupled to the speaker node. */
export function receiverCircuit(): Record<string, unknown> {
  return {
    format: 'glowtalk.circuit/1',
    title: 'test receiver',
    temperature: 25,
    parts: [
      { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 5 },
      { ref: 'Q1', kind: 'phototransistor', pins: ['vcc', 'e'], model: 'generic-phototransistor' },
      { ref: 'RE', kind: 'resistor', pins: ['e', 'gnd'], value: '1k' },
      { ref: 'C1', kind: 'capacitor', pins: ['e', 'spk'], value: '100u' },
      { ref: 'RL', kind: 'resistor', pins: ['spk', 'gnd'], value: '10k' },
    ],
  };
}

/** A valid scenario with every optional field written; the receiver circuit is the file "circuits/rx.json". */
export function fullScenario(): Record<string, any> {
  return {
    format: 'glowtalk.scenario/1',
    title: 'test link',
    description: 'every field written',
    sampleRate: '44.1k',
    oversampling: 8,
    method: 'bdf2',
    source: { kind: 'tone', frequency: '1k', seconds: 0.5, level: { dbSpl: 72 } },
    microphone: { sensitivity: -44, outputResistance: '2.2k', selfNoise: 28, seed: 11 },
    transmitter: { circuit: transmitterCircuit(), input: 'VMIC', led: 'D1', cutoffCurrent: '50u' },
    lightPath: {
      channel: {
        kind: 'free-space',
        distance: 4,
        halfPowerSemiAngle: 15,
        detectorArea: '10u',
        irradianceAngle: 5,
        incidenceAngle: 10,
        filterTransmission: 0.9,
        concentratorIndex: 1.5,
        fieldOfView: 60,
      },
      ambient: { power: '1u', mainsFrequency: 50, flickerDepth: 0.3, harmonics: [1, 0.2], phases: [0, 90] },
      darkCurrent: '10n',
      shotNoise: false,
      thermalNoiseResistance: '10k',
      seed: 12,
    },
    receiver: { circuit: 'circuits/rx.json', detector: 'Q1', output: ['spk', 'gnd'], speaker: 8 },
    output: { listeningGain: 6, format: 'float32' },
    taps: ['transmitter.led', 'light.detectorWatts'],
  };
}

/** Only what must be written. */
export function minimalScenario(): Record<string, any> {
  return {
    format: 'glowtalk.scenario/1',
    source: { kind: 'recording', file: 'speech/talk.wav', level: { effort: 'normal', distance: 0.5 } },
    microphone: { sensitivity: -44, outputResistance: 2200, selfNoise: null },
    transmitter: { circuit: transmitterCircuit(), input: 'VMIC', led: 'D1' },
    lightPath: { channel: { kind: 'light-guide', length: 2, couplingLoss: 3, attenuation: 0.2 }, ambient: null },
    receiver: { circuit: receiverCircuit(), detector: 'Q1', output: ['spk', 'gnd'], speaker: null },
  };
}

/** Resolver over an in-memory file table; a missing file throws like a file system would. */
export function filesResolver(files: Record<string, string>): ScenarioResolver & { reads: string[] } {
  const reads: string[] = [];
  return {
    reads,
    readText(relativePath: string): string {
      reads.push(relativePath);
      if (!Object.hasOwn(files, relativePath)) throw new Error(`ENOENT: no such file, open '${relativePath}'`);
      return files[relativePath];
    },
  };
}

export const FILES = { 'circuits/rx.json': JSON.stringify(receiverCircuit(), null, 2) };

export { inputErrorOf } from '../helpers/input-error.ts';
