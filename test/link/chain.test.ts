import { describe, expect, it } from 'vitest';
import { parseCircuit } from '../../src/circuit/index.ts';
import { linkJson } from '../analysis/link-fixture.ts';
import type { Circuit } from '../../src/circuit/types.ts';
import { Diode } from '../../src/devices/diode.ts';
import { VoltageSource } from '../../src/devices/sources.ts';
import { Bjt } from '../../src/devices/bjt.ts';
import { renderScenario } from '../../src/link/chain/chain.ts';
import { withLightInputAndSpeaker, withMicrophoneResistance } from '../../src/link/chain/rewire.ts';
import { dbSplToPascals } from '../../src/link/acoustics/sound-level.ts';
import { Simulator } from '../../src/solver/simulator.ts';
import type { Scenario } from '../../src/scenario/types.ts';

// The small link of our own shared with the analysis tests (not the demos).
const link = linkJson() as { transmitter: { circuit: unknown }; receiver: { circuit: unknown } };
const transmitter: Circuit = parseCircuit(link.transmitter.circuit);
const receiver: Circuit = parseCircuit(link.receiver.circuit);

function scenario(dbSpl: number, seconds = 0.3): Scenario {
  return {
    sampleRateHertz: 48000,
    oversampling: 4,
    method: 'tr',
    source: { kind: 'tone', frequencyHertz: 1000, seconds, level: { kind: 'spl', dbSpl } },
    microphone: { sensitivityDbvPerPascal: -44, outputResistanceOhms: 2200, selfNoiseDbaSpl: null, seed: 1 },
    transmitter: { circuit: transmitter, inputSource: 'VMIC', led: 'D1', cutoffAmperes: 10e-6 },
    lightPath: {
      // 30 dB: about 0.7 µW reaches the phototransistor, which then rests in its active region.
      channel: { kind: 'light-guide', couplingLossDb: 30, attenuationDbPerMetre: 0.2, lengthMetres: 2 },
      ambient: null,
      darkCurrentAmperes: 0,
      shotNoise: false,
      thermalNoiseOhms: null,
      seed: 3,
    },
    receiver: { circuit: receiver, detector: 'Q1', output: ['spk', 'gnd'], speakerOhms: null },
    output: { listeningGainDb: 0, format: 'float32' },
    taps: ['transmitter.led'],
  };
}

/** Amplitude of the `hertz` component over a whole number of periods ending `endSkip` samples before the last. */
function amplitudeAt(samples: ArrayLike<number>, rateHertz: number, hertz: number, periods: number, endSkip = 0): number {
  const count = Math.round((periods * rateHertz) / hertz);
  let re = 0;
  let im = 0;
  for (let k = 0; k < count; k++) {
    const i = samples.length - endSkip - count + k;
    const phase = (2 * Math.PI * hertz * i) / rateHertz;
    re += samples[i] * Math.cos(phase);
    im += samples[i] * Math.sin(phase);
  }
  return (2 * Math.hypot(re, im)) / count;
}

/** Drives one circuit alone with a small sine on its upstream input and returns the output amplitude. */
function stageGain(
  circuit: Circuit,
  setInput: (simulator: Simulator, value: number) => void,
  readOutput: (simulator: Simulator) => number,
  restingInput: number,
  inputAmplitude: number,
): number {
  const simulator = new Simulator(circuit);
  setInput(simulator, restingInput);
  simulator.operatingPoint();
  const rate = 192000;
  const h = 1 / rate;
  // Same span as the chain's measurement window below: coupling capacitors have long settled by then.
  const out = new Float64Array(Math.round(0.78 * rate));
  for (let n = 1; n <= out.length; n++) {
    setInput(simulator, restingInput + inputAmplitude * Math.sin(2 * Math.PI * 1000 * n * h));
    simulator.step(h, n * h);
    out[n - 1] = readOutput(simulator);
  }
  return amplitudeAt(out, rate, 1000, 50) / inputAmplitude;
}

describe('the signal chain', () => {
  it('for a small tone, has the gain of its stages linearised one by one at their bias points', () => {
    // Stage by stage: microphone (IEC 60268-4: sensitivity re 1 Pa), transmitter transconductance
    // (microphone volts → LED amperes), LED optics (P = η·hc/(λq)·I), light guide gain, receiver
    // transimpedance (detector watts → speaker volts). Each circuit is linearised numerically by a
    // small sine around its own DC operating point.
    const s = scenario(60, 0.8);
    const result = renderScenario(s);
    // Linearising only means something if no stage saturates or cuts off.
    for (const t of result.report.transistors) expect([t.ref, t.saturation.fraction, t.cutoff.fraction]).toEqual([t.ref, 0, 0]);
    const pascalsRms = dbSplToPascals(60);
    // The tone fades out over its last 10 ms: measure the 50 periods before that.
    const farEndAmplitude = amplitudeAt(result.farEndVolts, 48000, 1000, 50, 960);
    const chainGain = farEndAmplitude / (pascalsRms * Math.SQRT2);

    const micVoltsPerPascal = 10 ** (-44 / 20);
    const tx = withMicrophoneResistance(transmitter, 'VMIC', 2200);
    const ampsPerVolt = stageGain(
      tx,
      (sim, v) => ((sim.system.devicesByRef.get('VMIC') as VoltageSource).drive.upstreamValue = v),
      (sim) => (sim.system.devicesByRef.get('D1') as Diode).junctionCurrent(sim.x),
      0,
      1e-5,
    );
    const led = transmitter.parts.find((p) => p.ref === 'D1')!;
    if (led.kind !== 'led') throw new Error('D1 is not an LED');
    const wattsPerAmp = led.model.quantumEfficiency * (1239.84198e-9 / led.model.wavelength); // E = hc/(λq)
    const guideGain = 10 ** (-(30 + 0.2 * 2) / 10);
    const rx = withLightInputAndSpeaker(receiver, 'Q1', ['spk', 'gnd'], null);
    const restingWatts = result.report.light.restingDetectorWatts;
    const voltsPerWatt = stageGain(
      rx,
      (sim, w) => ((sim.system.devicesByRef.get('Q1') as Bjt).light!.upstreamValue = w),
      (sim) => sim.x[sim.system.nodeIndex('spk')!],
      restingWatts,
      restingWatts * 1e-3,
    );
    const product = micVoltsPerPascal * ampsPerVolt * wattsPerAmp * guideGain * voltsPerWatt;
    expect(chainGain / product).toBeGreaterThan(0.995);
    expect(chainGain / product).toBeLessThan(1.005);
  });

  it('for a loud tone, drives the LED current to zero and lists the cut-off intervals once per cycle', () => {
    const result = renderScenario(scenario(104));
    const led = result.report.led;
    expect(led.minimumAmperes).toBeLessThan(10e-6);
    expect(led.cutoff.count).toBeGreaterThan(250); // 0.3 s of 1 kHz: one interval per cycle, less the fade-in
    expect(led.cutoff.count).toBeLessThanOrEqual(301);
    const periods = led.cutoff.intervals.slice(10, 20).map((iv, i, all) => (i > 0 ? iv.startSeconds - all[i - 1].startSeconds : 1e-3));
    for (const p of periods) expect(Math.abs(p - 1e-3)).toBeLessThanOrEqual(1 / 192000 + 1e-12); // starts fall on internal samples
    expect(led.cutoff.fraction).toBeGreaterThan(0.05);
    const tap = result.taps.find((t) => t.name === 'transmitter.led')!;
    expect(tap.samples.length).toBe(0.3 * 192000);
    expect(Math.min(...tap.samples)).toBeLessThan(10e-6);
  });

  it('lines the far end up with the source: the cross-correlation of pink noise peaks within 2 samples of lag 0', () => {
    // Without compensation the oversampling filters alone would delay the far end by 80 samples at 4×.
    const s = scenario(60, 0.5);
    s.source = { kind: 'pink-noise', seconds: 0.5, seed: 7, level: { kind: 'spl', dbSpl: 60 } };
    const result = renderScenario(s);
    const a = result.sourcePascals;
    const b = result.farEndVolts;
    expect(b.length).toBe(a.length);
    let bestLag = 0;
    let best = 0;
    for (let lag = -120; lag <= 120; lag++) {
      let sum = 0;
      for (let i = 4800; i < a.length - 200; i++) sum += a[i] * b[i + lag];
      if (Math.abs(sum) > best) {
        best = Math.abs(sum);
        bestLag = lag;
      }
    }
    expect(Math.abs(bestLag)).toBeLessThanOrEqual(2);
  });
});
