/**
 * A small link of our own for the analysis tests (the circuits of
 * test/link/chain.test.ts: a two-stage transmitter sinking a red LED, a
 * phototransistor with a collector resistor into a 1 kΩ load), as scenario
 * JSON so sweeps can change it by path, and loaded.
 */
import { loadScenario } from '../../src/scenario/index.ts';
import type { Scenario } from '../../src/scenario/types.ts';

export function linkJson(source: unknown = { kind: 'tone', frequency: 1000, seconds: 0.1, level: { dbSpl: 90 } }): Record<string, unknown> {
  return {
    format: 'glowtalk.scenario/1',
    title: 'analysis test link',
    sampleRate: 48000,
    oversampling: 4,
    source,
    microphone: { sensitivity: -44, outputResistance: '2.2k', selfNoise: null },
    transmitter: {
      circuit: {
        format: 'glowtalk.circuit/1',
        parts: [
          { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 12 },
          { ref: 'VMIC', kind: 'voltage-source', pins: ['mic', 'gnd'], wave: { shape: 'upstream' } },
          { ref: 'C1', kind: 'capacitor', pins: ['mic', 'b1'], value: '10u' },
          { ref: 'R1', kind: 'resistor', pins: ['vcc', 'b1'], value: '100k' },
          { ref: 'R2', kind: 'resistor', pins: ['b1', 'gnd'], value: '12k' },
          { ref: 'Q1', kind: 'npn', pins: ['c1', 'b1', 'e1'], model: 'generic-npn' },
          { ref: 'RC1', kind: 'resistor', pins: ['vcc', 'c1'], value: '10k' },
          { ref: 'RE1', kind: 'resistor', pins: ['e1', 'gnd'], value: '1k' },
          { ref: 'CE1', kind: 'capacitor', pins: ['e1', 'gnd'], value: '220u' },
          { ref: 'C2', kind: 'capacitor', pins: ['c1', 'b2'], value: '10u' },
          { ref: 'R3', kind: 'resistor', pins: ['vcc', 'b2'], value: '47k' },
          { ref: 'R4', kind: 'resistor', pins: ['b2', 'gnd'], value: '10k' },
          { ref: 'Q2', kind: 'npn', pins: ['k', 'b2', 'e2'], model: 'generic-npn' },
          { ref: 'RE2', kind: 'resistor', pins: ['e2', 'gnd'], value: '150' },
          { ref: 'D1', kind: 'led', pins: ['vcc', 'k'], model: 'generic-red-led' },
        ],
      },
      input: 'VMIC',
      led: 'D1',
    },
    lightPath: {
      channel: { kind: 'light-guide', length: 2, couplingLoss: 3, attenuation: 0.2 },
      ambient: null,
      shotNoise: false,
    },
    receiver: {
      circuit: {
        format: 'glowtalk.circuit/1',
        parts: [
          { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 12 },
          { ref: 'Q1', kind: 'phototransistor', pins: ['pc', 'gnd'], model: 'generic-phototransistor' },
          { ref: 'RL', kind: 'resistor', pins: ['vcc', 'pc'], value: '2.2k' },
          { ref: 'C1', kind: 'capacitor', pins: ['pc', 'spk'], value: '100u' },
          { ref: 'RSPK', kind: 'resistor', pins: ['spk', 'gnd'], value: '1k' },
        ],
      },
      detector: 'Q1',
      output: ['spk', 'gnd'],
      speaker: null,
    },
    output: { format: 'float32' },
  };
}

const noFiles = { readText: (file: string): string => { throw new Error(`no file ${file} in this test`); } };

export function linkScenario(source?: unknown): Scenario {
  return loadScenario(linkJson(source), noFiles, 'test-link');
}

export const NO_FILES = noFiles;
