import { Diode } from '../../devices/diode.ts';
import type { DriveSignal } from '../../devices/wave.ts';
import { VoltageSource } from '../../devices/sources.ts';
import { InputError } from '../../errors.ts';
import type { PhototransistorModel } from '../../circuit/types.ts';
import type { Scenario } from '../../scenario/types.ts';
import type { KernelBackend } from '../../solver/kernel/step-kernel.ts';
import { Simulator, type SimulatorOptions } from '../../solver/simulator.ts';
import { LightPath } from '../light-path/light-path.ts';
import { Microphone } from '../microphone.ts';
import { Decimator, Upsampler } from '../oversampler.ts';
import { IntervalTracker, toEpisodes, type Episodes } from './intervals.ts';
import { withMicrophoneResistance } from './rewire.ts';
import { SubstepInput, substepHoldback } from './substep-input.ts';
import type { CalibratedSource } from './source.ts';
import { openSource, type PascalsReader, type SourceInput } from './source-stream.ts';
import { TapCapture, captureTaps, readsDeviceState, type TapRecord } from './taps.ts';
import { finishWatches, updateWatches, watchTransistors, type TransistorEpisodes, type TransistorWatch } from './transistor-watch.ts';

/** Settings shared by both stages of a render. */
export interface StageSettings {
  solver: SimulatorOptions;
  /** Integration steps per internal sample in each circuit (1 = one). */
  substeps: { transmitter: number; receiver: number };
  /** Audio-rate samples per chunk. */
  chunkSamples: number;
  /** Receives tap blocks as they fill (then the tap records come back empty). */
  onTap?: (name: string, block: Float32Array) => void;
  /** Receives the calibrated source (pascals) chunk by chunk as it is fed in. */
  onSource?: (chunk: Float64Array) => void;
}

/** What either stage reports of its circuit's solver and its taps. */
export interface StageFigures {
  transistors: TransistorEpisodes[];
  steps: number;
  newtonIterations: number;
  subdividedSteps: number;
  generatedSteps: number;
  reusedSteps: number;
  /** What the generated kernel ran on (null: no kernel, every step on the general loop). */
  kernel: KernelBackend | null;
  seconds: number;
  taps: TapRecord[];
}

/** A stage's figures at the end of its run (ends open episodes, finishes the taps). */
export function stageFigures(simulator: Simulator, watches: readonly TransistorWatch[], milliseconds: number, taps: readonly TapCapture[]): StageFigures {
  return {
    transistors: finishWatches(watches),
    steps: simulator.steps,
    newtonIterations: simulator.newton.totalIterations,
    subdividedSteps: simulator.subdividedSteps,
    generatedSteps: simulator.generatedSteps,
    reusedSteps: simulator.reusedSteps,
    kernel: simulator.kernel?.backend ?? null,
    seconds: milliseconds / 1000,
    taps: taps.map((t) => t.finish()),
  };
}

export interface TransmitterSummary extends StageFigures {
  led: { minimum: number; maximum: number; mean: number; cutoff: Episodes };
}

/**
 * The first half of the link: source → microphone → upsampler → transmitter
 * circuit → LED light → light path. Each `next` turns one audio chunk into the
 * light that drives the receiver's detector, sample by sample at the internal
 * rate (expressed as watts of light, the detector noise included).
 */
export class TransmitterStage {
  readonly source: CalibratedSource;
  readonly sampleRateHertz: number;
  readonly factor: number;
  readonly internalRateHertz: number;
  /** Source samples; the run feeds `paddedSamples − totalSamples` of silence after them so the far end is complete. */
  readonly totalSamples: number;
  /** Filter latency from source to far end, audio samples (taken off to align them). */
  readonly latencySamples: number;
  /** Audio samples the stages hold back for their substep look-ahead (run on, not taken off). */
  readonly holdbackSamples: number;
  /** Internal samples by which the circuits lag the source (the upsampler). */
  readonly upLatencyInternal: number;
  /** Source time of internal sample 0 (negative: the filter fill). */
  readonly offsetSeconds: number;
  readonly restingLedAmperes: number;
  readonly restingDetectorWatts: number;
  /** The detector's light drive at rest, watts (ambient and dark current included). */
  readonly restingLightDriveWatts: number;
  readonly channelGain: number;
  readonly taps: TapCapture[];
  /** The taps that read the transmitter circuit (found once, not per chunk). */
  private readonly circuitTaps: TapCapture[];
  private readonly ledTaps: TapCapture[];
  private readonly tapsReadDevices: boolean;
  private readonly simulator: Simulator;
  private readonly microphone: Microphone;
  private readonly up: Upsampler;
  private readonly lightPath: LightPath;
  private readonly drive: DriveSignal;
  private readonly led: Diode;
  private readonly responsivity: number;
  private readonly cutoffAmperes: number;
  private readonly ledCutoff: IntervalTracker;
  private readonly watches: TransistorWatch[];
  private readonly sourceReader: PascalsReader;
  private readonly pascals: Float64Array;
  private readonly micVolts: Float64Array;
  private readonly internal: Float64Array;
  private readonly emitterWatts: Float64Array;
  private readonly detectorWatts: Float64Array;
  private readonly photoAmperes: Float64Array;
  /** The drive values of one chunk's steps, and the solutions they produce. */
  private readonly stepInputs: Float64Array;
  private readonly solutions: Float64Array;
  private readonly x: Float64Array;
  private position = 0;
  private step = 0;
  private readonly substepInput: SubstepInput;
  private ledMin = Infinity;
  private ledMax = -Infinity;
  private ledSum = 0;
  private ledCount = 0;
  private milliseconds = 0;

  constructor(
    scenario: Scenario,
    sourceInput: SourceInput,
    private readonly settings: StageSettings,
    tapNames: readonly string[],
  ) {
    const fs = scenario.sampleRateHertz;
    this.sampleRateHertz = fs;
    this.factor = scenario.oversampling;
    this.internalRateHertz = fs * this.factor;
    const h = 1 / this.internalRateHertz;
    const opened = openSource(scenario.source, fs, sourceInput);
    this.source = opened.calibrated;
    this.sourceReader = opened.reader;
    this.microphone = new Microphone({ ...scenario.microphone, sampleRateHertz: fs });
    const t = scenario.transmitter;
    this.simulator = new Simulator(withMicrophoneResistance(t.circuit, t.inputSource, scenario.microphone.outputResistanceOhms), settings.solver);
    const input = this.simulator.system.devicesByRef.get(t.inputSource);
    if (!(input instanceof VoltageSource) || !input.drive.isUpstream) {
      throw new InputError('transmitter.input', 'the ref of a voltage source whose wave is {"shape": "upstream"}');
    }
    this.drive = input.drive;
    const led = this.simulator.system.devicesByRef.get(t.led);
    if (!(led instanceof Diode) || !led.isLed) throw new InputError('transmitter.led', 'the ref of an LED in the transmitter circuit');
    this.led = led;
    this.cutoffAmperes = t.cutoffAmperes;
    const detectorPart = scenario.receiver.circuit.parts.find((p) => p.ref === scenario.receiver.detector);
    if (detectorPart?.kind !== 'phototransistor') throw new InputError('receiver.detector', 'the ref of a phototransistor in the receiver circuit');
    this.responsivity = (detectorPart as { model: PhototransistorModel }).model.responsivity;

    const lp = scenario.lightPath;
    this.lightPath = new LightPath({
      sampleRateHertz: this.internalRateHertz,
      channel: lp.channel,
      ambient: lp.ambient,
      detector: {
        responsivityAmperesPerWatt: this.responsivity,
        darkCurrentAmperes: lp.darkCurrentAmperes,
        shotNoise: lp.shotNoise,
        thermalNoiseOhms: lp.thermalNoiseOhms,
        temperatureKelvin: 300,
        seed: lp.seed,
      },
    });
    this.channelGain = this.lightPath.gain;

    this.simulator.operatingPoint();
    this.restingLedAmperes = led.junctionCurrent(this.simulator.x);
    this.restingDetectorWatts = this.channelGain * led.opticalWatts(this.simulator.x) + (lp.ambient?.meanPowerWatts ?? 0);
    this.restingLightDriveWatts = this.restingDetectorWatts + lp.darkCurrentAmperes / this.responsivity;

    this.up = new Upsampler(this.factor);
    this.latencySamples = this.up.latencySamples + new Decimator(this.factor).latencySamples;
    const holdback = substepHoldback(this.factor);
    const s = settings.substeps;
    this.holdbackSamples = ((s.transmitter > 1 ? holdback : 0) + (s.receiver > 1 ? holdback : 0)) / this.factor;
    this.substepInput = new SubstepInput(s.transmitter, holdback, 0, settings.chunkSamples * this.factor);
    this.upLatencyInternal = this.up.latencyInternalSamples;
    this.offsetSeconds = -this.upLatencyInternal * h;
    this.totalSamples = this.source.samples;
    this.ledCutoff = new IntervalTracker(h, this.offsetSeconds);
    this.watches = watchTransistors('transmitter', this.simulator, h, this.offsetSeconds);

    this.taps = captureTaps(
      tapNames,
      { transmitter: this.simulator },
      { sampleRateHertz: fs, factor: this.factor, upLatencyInternal: this.upLatencyInternal, totalSamples: this.totalSamples },
      settings.onTap,
    );
    this.circuitTaps = this.taps.filter((t) => t.source.stage === 'transmitter');
    this.ledTaps = this.taps.filter((t) => t.source.stage === 'led');
    this.tapsReadDevices = readsDeviceState(this.circuitTaps);
    const chunk = settings.chunkSamples;
    this.pascals = new Float64Array(chunk);
    this.micVolts = new Float64Array(chunk);
    this.internal = new Float64Array(chunk * this.factor);
    this.emitterWatts = new Float64Array(chunk * this.factor);
    this.detectorWatts = new Float64Array(chunk * this.factor);
    this.photoAmperes = new Float64Array(chunk * this.factor);
    const size = this.simulator.system.size;
    this.stepInputs = new Float64Array(chunk * this.factor * settings.substeps.transmitter);
    this.solutions = new Float64Array(chunk * this.factor * settings.substeps.transmitter * size);
    this.x = new Float64Array(size + 1);
  }

  /** Source samples and the silence after them that the run feeds through. */
  get paddedSamples(): number {
    return this.totalSamples + this.latencySamples + this.holdbackSamples;
  }

  /** Audio samples fed so far, out of `paddedSamples`. */
  get fraction(): number {
    return this.position / this.paddedSamples;
  }

  /**
   * Runs the next audio chunk; writes the detector's light drive (watts) for
   * each internal sample into `light` and returns how many (0 when done).
   */
  next(light: Float64Array): number {
    const padded = this.paddedSamples;
    if (this.position >= padded) return 0;
    const start = this.position;
    const n = Math.min(this.settings.chunkSamples, padded - start);
    const total = this.totalSamples;
    const inputs = this.pascals.subarray(0, n);
    const real = Math.max(0, Math.min(n, total - start)); // source samples in this chunk; silence after them
    this.sourceReader.read(inputs.subarray(0, real));
    inputs.fill(0, real);
    if (real > 0) this.settings.onSource?.(inputs.slice(0, real));
    const volts = this.micVolts.subarray(0, n);
    this.microphone.process(inputs, volts);
    for (const tap of this.taps) {
      if (tap.source.stage === 'source') for (let i = 0; i < n; i++) if (start + i < total) tap.push(inputs[i]);
      if (tap.source.stage === 'microphone') for (let i = 0; i < n; i++) if (start + i < total) tap.push(volts[i]);
    }
    const upsampled = this.up.process(volts, this.internal);
    const m = this.substepInput.process(this.internal, upsampled, this.stepInputs);
    this.position += n;
    // Only while the look-ahead fills (a chunk shorter than it): nothing to hand on yet.
    if (m === 0) return this.next(light);

    const clock = performance.now();
    this.runCircuit(m);
    this.milliseconds += performance.now() - clock;

    const emitted = this.emitterWatts.subarray(0, m);
    const detected = this.detectorWatts.subarray(0, m);
    const amperes = this.photoAmperes.subarray(0, m);
    this.lightPath.process(emitted, detected);
    this.lightPath.photocurrent(detected, amperes);
    for (const tap of this.taps) {
      if (tap.source.stage === 'emitter') for (let i = 0; i < m; i++) tap.push(emitted[i]);
      if (tap.source.stage === 'detector') for (let i = 0; i < m; i++) tap.push(detected[i]);
    }
    const perWatt = 1 / this.responsivity;
    for (let i = 0; i < m; i++) light[i] = amperes[i] * perWatt;
    return m;
  }

  private runCircuit(m: number): void {
    const { simulator, drive, led, watches, emitterWatts, ledCutoff, cutoffAmperes, stepInputs, solutions, x } = this;
    const substeps = this.settings.substeps.transmitter;
    const hSub = 1 / this.internalRateHertz / substeps;
    const size = simulator.system.size;
    const firstKept = this.upLatencyInternal;
    const lastKept = firstKept + this.totalSamples * this.factor;
    const circuitTaps = this.circuitTaps;
    const ledTaps = this.ledTaps;
    // Hot loop: state in locals, written back at the end.
    let step = this.step;
    let ledMin = this.ledMin;
    let ledMax = this.ledMax;
    let ledSum = this.ledSum;
    let ledCount = this.ledCount;
    const first = step * substeps + 1;
    // A tap that reads a device's own state must see it right after its step: then one sample at a time.
    const run = this.tapsReadDevices ? 1 : m;
    const probed = circuitTaps.length > 0;
    for (let i = 0; i < m; i++) {
      if (i % run === 0) simulator.runBlock(hSub, drive, stepInputs, i * substeps, Math.min(m, i + run) * substeps, first, solutions);
      step++;
      // The sample's solution is read in place; copied out only for probes that want it whole.
      const row = (i * substeps + substeps - 1) * size;
      if (probed) for (let k = 0; k < size; k++) x[k] = solutions[row + k];
      const amperes = led.junctionCurrent(solutions, row);
      emitterWatts[i] = amperes > 0 ? amperes * led.wattsPerAmpere : 0;
      const index = step - 1;
      ledCutoff.update(index, amperes < cutoffAmperes);
      if (index >= firstKept && index < lastKept) {
        if (amperes < ledMin) ledMin = amperes;
        if (amperes > ledMax) ledMax = amperes;
        ledSum += amperes;
        ledCount++;
      }
      updateWatches(watches, index, solutions, row);
      for (const tap of ledTaps) tap.push(amperes);
      for (const tap of circuitTaps) tap.push((tap.source as { probe: (x: Float64Array) => number }).probe(x));
    }
    this.step = step;
    this.ledMin = ledMin;
    this.ledMax = ledMax;
    this.ledSum = ledSum;
    this.ledCount = ledCount;
  }

  summary(): TransmitterSummary {
    this.ledCutoff.finish();
    return {
      led: {
        minimum: this.ledMin,
        maximum: this.ledMax,
        mean: this.ledCount > 0 ? this.ledSum / this.ledCount : 0,
        cutoff: toEpisodes(this.ledCutoff),
      },
      ...stageFigures(this.simulator, this.watches, this.milliseconds, this.taps),
    };
  }
}

