/**
 * The four demo circuits (samples/demo-bay, samples/demo-workshop; our own
 * design, see DESIGN.md beside them): they parse, bias where the design notes
 * say, and meet the link's targets in short fixed-step runs at 192 kHz with
 * 1 kHz tones.
 *
 * Levels at the microphone: ANSI S3.5-1997 Table 3 speech levels at 1 m
 * (normal 62.35, shout 82.30 dB SPL, in src/link/acoustics/sound-level.ts),
 * inverse-distance law, and a −44 dBV/Pa capsule (a typical electret figure,
 * from memory). Speech peaks are taken 15 dB over the rms (common practice,
 * no source). The capsule's 2.2 kΩ output resistance goes in series through
 * the chain's own rewiring.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../src/circuit/index.ts';
import type { Circuit, Drive, LedModel, Part, PhototransistorModel, Wave } from '../../src/circuit/types.ts';
import { Simulator } from '../../src/solver/simulator.ts';
import { resolveProbe } from '../../src/solver/probes.ts';
import { withMicrophoneResistance } from '../../src/link/chain/rewire.ts';
import { dbSplToPascals, speechLevelDbSpl } from '../../src/link/acoustics/sound-level.ts';
import { lineOfSightGain } from '../../src/link/light-path/lambertian.ts';
import { lightGuideTransmission } from '../../src/link/light-path/light-guide.ts';
import { photonEnergyVolts } from '../../src/units/constants.ts';
import { thd } from '../../src/analysis/thd.ts';

const STEP_SECONDS = 1 / 192000;
const TONE_HERTZ = 1000;
/** 20 ms to settle from the operating point, then 20 whole cycles measured. */
const SETTLE_STEPS = 3840;
const MEASURE_STEPS = 3840;
const MIC_VOLTS_PER_PASCAL = 10 ** (-44 / 20);
const MIC_OHMS = 2200;
/** LED current counted as cut off (the demo scenarios' `cutoffCurrent`). */
const CUTOFF_AMPERES = 10e-6;

const micRmsVolts = (dbSpl: number) => dbSplToPascals(dbSpl) * MIC_VOLTS_PER_PASCAL;
/** Peak of speech over its rms (common practice, no source). */
const SPEECH_PEAK_OVER_RMS = 10 ** (15 / 20);
const NORMAL_AT_30CM = speechLevelDbSpl('normal', 0.3); // ≈ 72.8 dB SPL → 0.55 mV rms
const SHOUT_AT_10CM = speechLevelDbSpl('shout', 0.1); // ≈ 102.3 dB SPL → 16.4 mV rms

type Demo = 'bay' | 'workshop';

function load(demo: Demo, which: 'transmitter' | 'receiver'): Circuit {
  const url = new URL(`../../samples/demo-${demo}/${which}.json`, import.meta.url);
  return parseCircuitText(readFileSync(url, 'utf8'), `${demo}/${which}.json`);
}

function part(circuit: Circuit, ref: string): Part {
  const found = circuit.parts.find((p) => p.ref === ref);
  if (!found) throw new Error(`no part ${ref}`);
  return found;
}

function withInputWave(circuit: Circuit, wave: Wave): Circuit {
  return { ...circuit, parts: circuit.parts.map((p) => (p.ref === 'VMIC' && p.kind === 'voltage-source' ? { ...p, wave } : p)) };
}

/** Q1 lit by `light` (watts) instead of the file's standalone value. */
function withLight(circuit: Circuit, light: Drive): Circuit {
  return { ...circuit, parts: circuit.parts.map((p) => (p.ref === 'Q1' && p.kind === 'phototransistor' ? { ...p, light } : p)) };
}

const sine = (amplitude: number): Wave => ({ shape: 'sine', amplitude, frequencyHertz: TONE_HERTZ, phaseDegrees: 0, delaySeconds: 0 });

/** Runs from the operating point; returns each probe's bias and its last MEASURE_STEPS samples. */
function run(circuit: Circuit, probes: string[]): { bias: number[]; samples: Float64Array[]; all: Float64Array[] } {
  const sim = new Simulator(circuit);
  sim.operatingPoint();
  const read = probes.map((name) => resolveProbe(sim, name));
  const bias = read.map((r) => r(sim.x));
  const total = SETTLE_STEPS + MEASURE_STEPS;
  const all = probes.map(() => new Float64Array(total + 1));
  read.forEach((r, k) => (all[k][0] = r(sim.x)));
  for (let n = 1; n <= total; n++) {
    sim.step(STEP_SECONDS, n * STEP_SECONDS);
    for (let k = 0; k < read.length; k++) all[k][n] = read[k](sim.x);
  }
  return { bias, samples: all.map((a) => a.subarray(total + 1 - MEASURE_STEPS)), all };
}

const min = (a: Float64Array) => a.reduce((m, v) => Math.min(m, v), Infinity);
const max = (a: Float64Array) => a.reduce((m, v) => Math.max(m, v), -Infinity);
function acRms(a: Float64Array): number {
  const mean = a.reduce((s, v) => s + v, 0) / a.length;
  return Math.sqrt(a.reduce((s, v) => s + (v - mean) ** 2, 0) / a.length);
}
const thdOf = (a: Float64Array) => thd(a, 1 / STEP_SECONDS, { fundamentalHertz: TONE_HERTZ, harmonicCount: 10 }).thdFundamental;

/** The transmitter as the chain runs it, with a tone of `amplitude` volts at the capsule. */
function transmitterWithTone(demo: Demo, amplitude: number): Circuit {
  return withMicrophoneResistance(withInputWave(load(demo, 'transmitter'), sine(amplitude)), 'VMIC', MIC_OHMS);
}

/** Design figures from the DESIGN.md beside each demo. */
const DESIGN = {
  bay: {
    ledAmperes: 1.9816e-3,
    nodes: { sense: 0.932, coll1: 3.594 },
    // 12 V; 2 m guide, 3 dB coupling + 0.2 dB/m (DESIGN.md)
    channelGain: lightGuideTransmission({ couplingLossDb: 3, attenuationDbPerMetre: 0.2, lengthMetres: 2 }),
    ambientWatts: 0,
    photoAmperes: 7.180e-3,
    normalModulation: 0.081,
    // A tone well past the LED's cut-off amplitude (about 9 mV for this design).
    pastCutoffVolts: 16e-3,
  },
  workshop: {
    ledAmperes: 19.167e-3,
    nodes: { sense: 0.905, coll1: 3.122 },
    // Kahn & Barry 1997 line-of-sight gain; concentrator gain after Komine & Nakagawa 2004
    channelGain: lineOfSightGain({
      halfPowerSemiAngleDegrees: 10,
      detectorAreaSquareMetres: 1e-5,
      distanceMetres: 4,
      irradianceAngleDegrees: 0,
      incidenceAngleDegrees: 0,
      filterTransmission: 1,
      concentratorRefractiveIndex: 1.5,
      fieldOfViewSemiAngleDegrees: 10,
    }),
    ambientWatts: 3e-6,
    photoAmperes: 1.1155e-3,
    normalModulation: 0.147,
    // A tone past the LED's cut-off amplitude (about 5.5 mV for this design).
    pastCutoffVolts: 6.4e-3,
  },
} as const;

function ledWattsPerAmpere(demo: Demo): number {
  const model = (part(load(demo, 'transmitter'), 'D1') as { model: LedModel }).model;
  return model.quantumEfficiency * photonEnergyVolts(model.wavelength);
}

for (const demo of ['bay', 'workshop'] as const) {
  const design = DESIGN[demo];

  describe(`demo-${demo} transmitter`, () => {
    it('has the microphone input VMIC (mic, gnd) driven from upstream, the signal LED D1 and at least two transistors', () => {
      const circuit = load(demo, 'transmitter');
      expect(circuit.title).toMatch(/our own design/);
      const vmic = part(circuit, 'VMIC');
      expect(vmic.kind).toBe('voltage-source');
      expect(vmic.pins).toEqual(['mic', 'gnd']);
      expect(vmic.kind === 'voltage-source' && vmic.dc).toBe(0);
      expect(vmic.kind === 'voltage-source' && vmic.wave?.shape).toBe('upstream');
      expect(part(circuit, 'D1').kind).toBe('led');
      expect(circuit.parts.filter((p) => p.kind === 'npn' || p.kind === 'pnp').length).toBeGreaterThanOrEqual(2);
      expect(circuit.parts.length).toBeLessThanOrEqual(20);
    });

    it('biases the LED and the amplifier where DESIGN.md says', () => {
      const circuit = load(demo, 'transmitter');
      const { bias } = run(circuit, ['D1', 'sense', 'coll1']);
      expect(bias[0]).toBeCloseTo(design.ledAmperes, 5); // within 5 µA
      expect(Math.abs(bias[1] - design.nodes.sense)).toBeLessThan(0.01);
      expect(Math.abs(bias[2] - design.nodes.coll1)).toBeLessThan(0.02);
    });

    it('normal speech at 30 cm (a tone at its rms) modulates the LED modestly, and a tone reaching its peaks (+15 dB) swings under 70 % of the bias', () => {
      const rmsTone = run(transmitterWithTone(demo, Math.SQRT2 * micRmsVolts(NORMAL_AT_30CM)), ['D1']);
      const bias = rmsTone.bias[0];
      const led = rmsTone.samples[0];
      const modulation = (max(led) - min(led)) / (2 * bias);
      expect(Math.abs(modulation - design.normalModulation)).toBeLessThan(0.01);

      const peaks = run(transmitterWithTone(demo, SPEECH_PEAK_OVER_RMS * micRmsVolts(NORMAL_AT_30CM)), ['D1']).samples[0];
      const swing = Math.max(max(peaks) - bias, bias - min(peaks));
      expect(swing / bias).toBeLessThan(0.7);
      expect(swing / bias).toBeGreaterThan(design.normalModulation * (SPEECH_PEAK_OVER_RMS / Math.SQRT2) * 0.9);
    });

    it('a tone past the cut-off amplitude swings the LED current past its bias: cut off below 10 µA on one side, above twice the bias on the other', () => {
      const { bias, samples } = run(transmitterWithTone(demo, design.pastCutoffVolts), ['D1']);
      expect(min(samples[0])).toBeLessThan(CUTOFF_AMPERES);
      expect(max(samples[0])).toBeGreaterThan(2 * bias[0]);
    });

    it('shouting at 10 cm (tone at the shout rms) keeps the LED cut off for over a quarter of every cycle', () => {
      const led = run(transmitterWithTone(demo, Math.SQRT2 * micRmsVolts(SHOUT_AT_10CM)), ['D1']).samples[0];
      const off = led.reduce((n, v) => n + (v < CUTOFF_AMPERES ? 1 : 0), 0) / led.length;
      expect(off).toBeGreaterThan(0.25);
      expect(off).toBeLessThan(0.75);
    });
  });

  describe(`demo-${demo} receiver`, () => {
    it('has the phototransistor Q1 (collector, emitter), the 8 Ω speaker RSPK on (spk, gnd) behind a capacitor, and at least two power-stage transistors', () => {
      const circuit = load(demo, 'receiver');
      expect(circuit.title).toMatch(/our own design/);
      const q1 = part(circuit, 'Q1');
      expect(q1.kind).toBe('phototransistor');
      expect(q1.pins).toHaveLength(2);
      const speaker = part(circuit, 'RSPK');
      expect(speaker.pins).toEqual(['spk', 'gnd']);
      expect(speaker.kind === 'resistor' && speaker.value).toBe(8);
      expect(circuit.parts.some((p) => p.kind === 'capacitor' && p.pins.includes('spk'))).toBe(true);
      expect(circuit.parts.filter((p) => p.kind === 'npn' || p.kind === 'pnp').length).toBeGreaterThanOrEqual(2);
      expect(circuit.parts.length).toBeLessThanOrEqual(20);
    });

    it('is lit, for standalone runs, by the DC light computed from the LED bias, η, photon energy and channel gain', () => {
      const expected = design.ledAmperes * ledWattsPerAmpere(demo) * design.channelGain + design.ambientWatts;
      const q1 = part(load(demo, 'receiver'), 'Q1');
      const dc = q1.kind === 'phototransistor' ? q1.light.dc : NaN;
      expect(Math.abs(dc / expected - 1)).toBeLessThan(1e-3);
    });

    it('biases the phototransistor and puts the output midpoint near half the supply', () => {
      const { bias } = run(load(demo, 'receiver'), ['Q1.collector', 'mid', 'Q3.collector']);
      expect(Math.abs(bias[0] / design.photoAmperes - 1)).toBeLessThan(0.01);
      expect(Math.abs(bias[1] - 6.33)).toBeLessThan(0.05);
      expect(bias[2]).toBeGreaterThan(5e-3); // class AB: a few mA standing in the output pair
      expect(bias[2]).toBeLessThan(30e-3);
    });

    const ledDetectorWatts = () => design.ledAmperes * ledWattsPerAmpere(demo) * design.channelGain;
    const restingWatts = () => ledDetectorWatts() + design.ambientWatts;

    // 0.15 V rms is about 3 mW in 8 Ω: conversation level at a metre from a small speaker (common practice, no source).
    it('plays normal speech at 0.15–1 V rms into 8 Ω with under 1 % THD', () => {
      const circuit = withLight(load(demo, 'receiver'), { dc: restingWatts(), wave: sine(design.normalModulation * ledDetectorWatts()) });
      const spk = run(circuit, ['spk']).samples[0];
      expect(acRms(spk)).toBeGreaterThan(0.15);
      expect(acRms(spk)).toBeLessThan(1);
      expect(thdOf(spk)).toBeLessThan(0.01);
    });

    it('does not clip when the LED swings from cutoff to twice its bias: the output adds under 1 % THD to the detector’s own', () => {
      const circuit = withLight(load(demo, 'receiver'), { dc: restingWatts(), wave: sine(ledDetectorWatts()) });
      const [spk, photo] = run(circuit, ['spk', 'photo']).samples;
      expect(thdOf(spk)).toBeLessThan(thdOf(photo) + 0.01);
      expect(max(spk)).toBeLessThan(4.2);
      expect(-min(spk)).toBeLessThan(4.2);
      expect(min(photo)).toBeGreaterThan(1); // phototransistor out of saturation at twice the light
    });
  });

  describe(`demo-${demo} link`, () => {
    it('past the cut-off amplitude the LED cuts off first: the receiver follows the clipped light with under 1 % extra THD', () => {
      const tx = run(transmitterWithTone(demo, design.pastCutoffVolts), ['D1']).all[0];
      const wattsPerAmpere = ledWattsPerAmpere(demo) * design.channelGain;
      const points: [number, number][] = Array.from(tx, (amperes, n) => [n * STEP_SECONDS, Math.max(amperes, 0) * wattsPerAmpere + design.ambientWatts]);
      const lit = withLight(load(demo, 'receiver'), { dc: 0, wave: { shape: 'points', points } });
      const spk = run(lit, ['spk']).samples[0];
      const light = tx.subarray(tx.length - MEASURE_STEPS).map((a) => Math.max(a, 0));
      expect(min(light)).toBeLessThan(CUTOFF_AMPERES);
      expect(thdOf(spk)).toBeLessThan(thdOf(light) + 0.01);
    });
  });
}

describe('demo receivers', () => {
  it('use phototransistor models whose responsivity is 0.3–0.5 A/W', () => {
    for (const demo of ['bay', 'workshop'] as const) {
      const model = (part(load(demo, 'receiver'), 'Q1') as { model: PhototransistorModel }).model;
      expect(model.responsivity).toBeGreaterThanOrEqual(0.3);
      expect(model.responsivity).toBeLessThanOrEqual(0.5);
    }
  });
});
