import { InputError } from '../../errors.ts';
import type { Scenario } from '../../scenario/types.ts';
import type { NewtonTolerances } from '../../solver/newton.ts';
import type { LinearAlgebra } from '../../solver/system.ts';
import { LightPath } from '../light-path/light-path.ts';
import { Microphone } from '../microphone.ts';
import { Decimator, Upsampler } from '../oversampler.ts';
import { IntervalTracker } from './intervals.ts';
import { buildLinkCircuits } from './link-circuits.ts';
import { buildReport, type RenderReport } from './report.ts';
import { calibratedSource, type Recording } from './source.ts';
import { TapCapture, resolveTap, type TapRecord } from './taps.ts';
import { updateWatches, watchTransistors } from './transistor-watch.ts';

export interface RenderOptions {
  /** The decoded recording when the source is a recording. */
  recording?: Recording;
  /** Extra taps besides the scenario's own. */
  taps?: string[];
  /** Called now and then with the fraction done (0…1). */
  onProgress?: (fraction: number) => void;
  /** Checked between chunks; a true `aborted` stops the render with an error. */
  signal?: { readonly aborted: boolean };
  /** Audio-rate samples per chunk. */
  chunkSamples?: number;
  /** Called once before processing: how many samples the far end and each tap will have. */
  onStart?: (info: { farEndSamples: number; sampleRateHertz: number; taps: Array<{ name: string; samples: number; sampleRateHertz: number }> }) => void;
  /** Receives the far end chunk by chunk (volts, aligned); then the result's farEndVolts is empty. */
  onFarEnd?: (chunk: Float64Array) => void;
  /** Receives tap blocks as they fill; then the result's tap records are empty. */
  onTap?: (name: string, block: Float32Array) => void;
  /** Solver settings for both circuits (defaults: the fast path). The benchmark's reference run uses these. */
  solver?: {
    linearAlgebra?: LinearAlgebra;
    tolerances?: NewtonTolerances;
    /** Integration steps per internal sample (1 = one step per sample). */
    substeps?: number;
  };
}

export interface RenderResult {
  /** Sound pressure at the microphone, pascals, at the audio rate. */
  sourcePascals: Float64Array;
  /** Voltage across the speaker, volts, at the audio rate, aligned with the source. */
  farEndVolts: Float64Array;
  taps: TapRecord[];
  report: RenderReport;
}

/**
 * Runs the whole link, chunk by chunk: source pressure → microphone volts →
 * upsampled → transmitter circuit (the microphone drives one source) → LED
 * junction current → optical watts → light path (gain, ambient, flicker,
 * detector noise) → receiver circuit (the phototransistor is lit) → speaker
 * volts → decimated to the audio rate. Filter latency is compensated so the
 * far end lines up with the source sample for sample.
 */
export function renderScenario(scenario: Scenario, options: RenderOptions = {}): RenderResult {
  const startedMs = Date.now();
  const fs = scenario.sampleRateHertz;
  const factor = scenario.oversampling;
  const internalRate = fs * factor;
  const h = 1 / internalRate;
  const source = calibratedSource(scenario.source, fs, options.recording);
  const microphone = new Microphone({ ...scenario.microphone, sampleRateHertz: fs });
  const solverOptions = { method: scenario.method, linearAlgebra: options.solver?.linearAlgebra, tolerances: options.solver?.tolerances };
  const substeps = Math.max(1, Math.round(options.solver?.substeps ?? 1));
  const hSub = h / substeps;

  const circuits = buildLinkCircuits(scenario, solverOptions);
  const { transmitter: tx, receiver: rx, microphoneDrive: micDrive, led, lightDrive, responsivity } = circuits;
  const { speakerPlus: outPlus, speakerMinus: outMinus } = circuits;

  const lp = scenario.lightPath;
  const lightPath = new LightPath({
    sampleRateHertz: internalRate,
    channel: lp.channel,
    ambient: lp.ambient,
    detector: {
      responsivityAmperesPerWatt: responsivity,
      darkCurrentAmperes: lp.darkCurrentAmperes,
      shotNoise: lp.shotNoise,
      thermalNoiseOhms: lp.thermalNoiseOhms,
      temperatureKelvin: 300,
      seed: lp.seed,
    },
  });

  // Operating points: the transmitter at rest, then the receiver under the resting light.
  tx.operatingPoint();
  const restingEmitterWatts = led.opticalWatts(tx.x);
  const restingDetectorWatts = lightPath.gain * restingEmitterWatts + (lp.ambient?.meanPowerWatts ?? 0);
  lightDrive.upstreamValue = restingDetectorWatts + lp.darkCurrentAmperes / responsivity;
  rx.operatingPoint();
  const restingLedAmperes = led.junctionCurrent(tx.x);

  const up = new Upsampler(factor);
  const down = new Decimator(factor);
  const latency = up.latencySamples + down.latencySamples;
  const upLatencyInternal = up.latencyInternalSamples;
  const offsetSeconds = -upLatencyInternal * h;
  const total = source.pascals.length;
  const padded = total + latency;

  // Statistics, per internal sample.
  const ledCutoff = new IntervalTracker(h, offsetSeconds);
  let ledMin = Infinity;
  let ledMax = -Infinity;
  let ledSum = 0;
  let ledCount = 0;
  const txWatches = watchTransistors('transmitter', tx, h, offsetSeconds);
  const rxWatches = watchTransistors('receiver', rx, h, offsetSeconds);
  const watches = [...txWatches, ...rxWatches];

  // Taps.
  const tapNames = [...new Set([...scenario.taps, ...(options.taps ?? [])])];
  const captures = tapNames.map((name, i) => {
    const tap = resolveTap(name, `taps[${i}]`, { transmitter: tx, receiver: rx, ledRef: scenario.transmitter.led });
    return new TapCapture(
      name,
      tap.unit,
      tap.internalRate ? internalRate : fs,
      tap.source,
      tap.internalRate ? upLatencyInternal : 0,
      tap.internalRate ? total * factor : total,
      options.onTap,
    );
  });
  options.onStart?.({
    farEndSamples: total,
    sampleRateHertz: fs,
    taps: captures.map((c) => ({ name: c.name, samples: c.sampleRateHertz === fs ? total : total * factor, sampleRateHertz: c.sampleRateHertz })),
  });
  const byStage = (stage: string): TapCapture[] => captures.filter((c) => c.source.stage === stage);
  const sourceTaps = byStage('source');
  const micTaps = byStage('microphone');
  const txTaps = byStage('transmitter');
  const emitterTaps = byStage('emitter');
  const detectorTaps = byStage('detector');
  const rxTaps = byStage('receiver');
  const speakerTaps = byStage('speaker');

  const chunk = options.chunkSamples ?? 1024;
  const pascals = new Float64Array(chunk);
  const micVolts = new Float64Array(chunk);
  const internal = new Float64Array(chunk * factor);
  const emitterWatts = new Float64Array(chunk * factor);
  const detectorWatts = new Float64Array(chunk * factor);
  const photoAmperes = new Float64Array(chunk * factor);
  const speaker = new Float64Array(chunk * factor);
  const farChunk = new Float64Array(chunk + 1);
  const farEnd = new Float64Array(options.onFarEnd ? 0 : total);
  const farStats = { squares: 0, peak: 0, count: 0 };
  let transmitterMs = 0;
  let receiverMs = 0;
  let previousMicVolts = 0;
  let previousLightWatts = lightDrive.upstreamValue;
  let farWritten = -latency; // the first `latency` decimated samples are filter fill
  let step = 0;

  for (let start = 0; start < padded; start += chunk) {
    if (options.signal?.aborted) throw new InputError('render', 'to run to the end', 'cancelled');
    const n = Math.min(chunk, padded - start);
    const inputs = pascals.subarray(0, n);
    for (let i = 0; i < n; i++) inputs[i] = start + i < total ? source.pascals[start + i] : 0;
    for (const tap of sourceTaps) for (let i = 0; i < n; i++) if (start + i < total) tap.push(inputs[i]);
    const volts = micVolts.subarray(0, n);
    microphone.process(inputs, volts);
    for (const tap of micTaps) for (let i = 0; i < n; i++) if (start + i < total) tap.push(volts[i]);
    const m = up.process(volts, internal);

    let clock = performance.now();
    for (let i = 0; i < m; i++) {
      step++;
      // Substeps see the input interpolated linearly, as the trapezoidal rule assumes between samples.
      for (let k = substeps - 1; k >= 0; k--) {
        micDrive.upstreamValue = internal[i] - (k / substeps) * (internal[i] - previousMicVolts);
        tx.step(hSub, (step * substeps - k) * hSub);
      }
      previousMicVolts = internal[i];
      const x = tx.x;
      const amperes = led.junctionCurrent(x);
      emitterWatts[i] = amperes > 0 ? amperes * led.wattsPerAmpere : 0;
      const index = step - 1;
      ledCutoff.update(index, amperes < scenario.transmitter.cutoffAmperes);
      if (index >= upLatencyInternal && index < upLatencyInternal + total * factor) {
        if (amperes < ledMin) ledMin = amperes;
        if (amperes > ledMax) ledMax = amperes;
        ledSum += amperes;
        ledCount++;
      }
      updateWatches(txWatches, index, x);
      for (const tap of txTaps) tap.push((tap.source as { probe: (x: Float64Array) => number }).probe(x));
    }

    transmitterMs += performance.now() - clock;
    const emitted = emitterWatts.subarray(0, m);
    const detected = detectorWatts.subarray(0, m);
    lightPath.process(emitted, detected);
    lightPath.photocurrent(detected, photoAmperes.subarray(0, m));
    for (const tap of emitterTaps) for (let i = 0; i < m; i++) tap.push(emitted[i]);
    for (const tap of detectorTaps) for (let i = 0; i < m; i++) tap.push(detected[i]);

    const rxStart = step - m;
    clock = performance.now();
    for (let i = 0; i < m; i++) {
      const index = rxStart + i;
      const watts = photoAmperes[i] / responsivity;
      for (let k = substeps - 1; k >= 0; k--) {
        lightDrive.upstreamValue = watts - (k / substeps) * (watts - previousLightWatts);
        rx.step(hSub, ((index + 1) * substeps - k) * hSub);
      }
      previousLightWatts = watts;
      const x = rx.x;
      speaker[i] = (outPlus < 0 ? 0 : x[outPlus]) - (outMinus < 0 ? 0 : x[outMinus]);
      updateWatches(rxWatches, index, x);
      for (const tap of rxTaps) tap.push((tap.source as { probe: (x: Float64Array) => number }).probe(x));
    }

    receiverMs += performance.now() - clock;
    const produced = down.process(speaker.subarray(0, m), farChunk);
    const from = Math.max(0, -farWritten);
    const to = Math.min(produced, total - farWritten);
    for (let i = from; i < to; i++) {
      const v = farChunk[i];
      farStats.squares += v * v;
      if (Math.abs(v) > farStats.peak) farStats.peak = Math.abs(v);
      for (const tap of speakerTaps) tap.push(v);
    }
    if (to > from) {
      if (options.onFarEnd) options.onFarEnd(farChunk.slice(from, to));
      else farEnd.set(farChunk.subarray(from, to), farWritten + from);
      farStats.count += to - from;
    }
    farWritten += produced;
    options.onProgress?.(Math.min(1, (start + n) / padded));
  }
  ledCutoff.finish();
  for (const w of watches) {
    w.saturation.finish();
    w.cutoff.finish();
  }

  const taps = captures.map((c) => c.finish());
  const report = buildReport({
    scenario,
    source,
    farEnd: { rmsVolts: Math.sqrt(farStats.squares / Math.max(1, farStats.count)), peakVolts: farStats.peak },
    restingLedAmperes,
    restingDetectorWatts,
    led: { minimum: ledMin, maximum: ledMax, mean: ledCount > 0 ? ledSum / ledCount : 0, cutoff: ledCutoff },
    channelGain: lightPath.gain,
    watches,
    solver: {
      internalRateHertz: internalRate,
      transmitterSteps: tx.steps,
      receiverSteps: rx.steps,
      newtonIterations: tx.newton.totalIterations + rx.newton.totalIterations,
      subdividedSteps: tx.subdividedSteps + rx.subdividedSteps,
      wallSeconds: (Date.now() - startedMs) / 1000,
      transmitterSeconds: transmitterMs / 1000,
      receiverSeconds: receiverMs / 1000,
    },
  });
  return { sourcePascals: source.pascals, farEndVolts: farEnd, taps, report };
}
