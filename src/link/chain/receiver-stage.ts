import { Bjt } from '../../devices/bjt.ts';
import { voltageAt } from '../../devices/resistor.ts';
import type { DriveSignal } from '../../devices/wave.ts';
import { InputError } from '../../errors.ts';
import type { Scenario } from '../../scenario/types.ts';
import { Simulator } from '../../solver/simulator.ts';
import { Decimator } from '../oversampler.ts';
import { withLightInputAndSpeaker } from './rewire.ts';
import { SubstepInput, substepHoldback } from './substep-input.ts';
import { TapCapture, captureTaps, readsDeviceState } from './taps.ts';
import { stageFigures, type StageFigures, type StageSettings } from './transmitter-stage.ts';
import { updateWatches, watchTransistors, type TransistorWatch } from './transistor-watch.ts';

/** Where the receiver stage stands in the run (from the transmitter stage). */
export interface ReceiverTiming {
  sampleRateHertz: number;
  factor: number;
  totalSamples: number;
  latencySamples: number;
  /** Audio samples run on after the padding for the stages' substep look-ahead. */
  holdbackSamples: number;
  upLatencyInternal: number;
  offsetSeconds: number;
  /** The detector's light drive at rest, watts. */
  restingLightDriveWatts: number;
}

export interface ReceiverSummary extends StageFigures {
  farEndRmsVolts: number;
  farEndPeakVolts: number;
}

/**
 * The second half of the link: the detector's light → receiver circuit →
 * speaker volts → decimated to the audio rate, with the filter latency taken
 * off so the far end lines up with the source.
 */
export class ReceiverStage {
  readonly taps: TapCapture[];
  /** The taps that read the receiver circuit and the speaker (found once, not per chunk). */
  private readonly circuitTaps: TapCapture[];
  private readonly tapsReadDevices: boolean;
  private readonly speakerTaps: TapCapture[];
  private readonly simulator: Simulator;
  private readonly drive: DriveSignal;
  private readonly speakerPlus: number;
  private readonly speakerMinus: number;
  private readonly down: Decimator;
  private readonly watches: TransistorWatch[];
  private readonly speaker: Float64Array;
  private readonly farChunk: Float64Array;
  /** The light of one chunk's steps, and the solutions they produce. */
  private readonly stepInputs: Float64Array;
  private readonly solutions: Float64Array;
  private readonly x: Float64Array;
  private readonly substepInput: SubstepInput;
  private index = 0;
  private farWritten: number;
  private squares = 0;
  private peak = 0;
  private count = 0;
  private milliseconds = 0;

  constructor(
    scenario: Scenario,
    private readonly settings: StageSettings,
    private readonly timing: ReceiverTiming,
    tapNames: readonly string[],
    /** Receives the far end (volts) in order, chunk by chunk. */
    private readonly onFarEnd: (chunk: Float64Array, offset: number) => void,
  ) {
    const r = scenario.receiver;
    this.simulator = new Simulator(withLightInputAndSpeaker(r.circuit, r.detector, r.output, r.speakerOhms), settings.solver);
    const detector = this.simulator.system.devicesByRef.get(r.detector);
    if (!(detector instanceof Bjt) || !detector.light) throw new InputError('receiver.detector', 'the ref of a phototransistor in the receiver circuit');
    this.drive = detector.light;
    this.speakerPlus = this.simulator.system.nodeIndex(r.output[0]) ?? -1;
    this.speakerMinus = this.simulator.system.nodeIndex(r.output[1]) ?? -1;
    this.drive.upstreamValue = timing.restingLightDriveWatts;
    this.simulator.operatingPoint();
    const h = 1 / (timing.sampleRateHertz * timing.factor);
    this.down = new Decimator(timing.factor);
    this.farWritten = -timing.latencySamples;
    this.watches = watchTransistors('receiver', this.simulator, h, timing.offsetSeconds);
    this.taps = captureTaps(tapNames, { receiver: this.simulator }, timing, settings.onTap);
    this.circuitTaps = this.taps.filter((t) => t.source.stage === 'receiver');
    this.tapsReadDevices = readsDeviceState(this.circuitTaps);
    this.speakerTaps = this.taps.filter((t) => t.source.stage === 'speaker');
    this.speaker = new Float64Array(settings.chunkSamples * timing.factor);
    this.farChunk = new Float64Array(settings.chunkSamples + 1);
    const size = this.simulator.system.size;
    const substeps = settings.substeps.receiver;
    this.substepInput = new SubstepInput(substeps, substepHoldback(timing.factor), timing.restingLightDriveWatts, settings.chunkSamples * timing.factor);
    this.stepInputs = new Float64Array(settings.chunkSamples * timing.factor * substeps);
    this.solutions = new Float64Array(settings.chunkSamples * timing.factor * substeps * size);
    this.x = new Float64Array(size + 1);
  }

  /** Steps the receiver through `count` more internal samples of light (watts), less its look-ahead. */
  process(light: Float64Array, count: number): void {
    // No loop here, only in the two calls: the engine then compiles this whole, not from the middle
    // of a loop, and a new render's far-end callback does not send it back to the interpreter.
    const clock = performance.now();
    const m = this.stepCircuit(light, count);
    this.milliseconds += performance.now() - clock;
    const produced = this.down.process(this.speaker.subarray(0, m), this.farChunk);
    const from = Math.max(0, -this.farWritten);
    const to = Math.min(produced, this.timing.totalSamples - this.farWritten);
    this.measureFarEnd(from, to);
    if (to > from) {
      this.onFarEnd(this.farChunk.subarray(from, to), this.farWritten + from);
      this.count += to - from;
    }
    this.farWritten += produced;
  }

  /** The circuit's steps for the next light samples, into `speaker`; returns how many samples. */
  private stepCircuit(light: Float64Array, count: number): number {
    const { simulator, drive, speaker, watches, stepInputs, solutions, x } = this;
    const size = simulator.system.size;
    const substeps = this.settings.substeps.receiver;
    const hSub = 1 / (this.timing.sampleRateHertz * this.timing.factor) / substeps;
    const plus = this.speakerPlus;
    const minus = this.speakerMinus;
    const circuitTaps = this.circuitTaps;
    const m = this.substepInput.process(light, count, stepInputs);
    const first = this.index * substeps + 1;
    // A tap that reads a device's own state must see it right after its step: then one sample at a time.
    const run = this.tapsReadDevices ? 1 : m;
    const probed = circuitTaps.length > 0;
    for (let i = 0; i < m; i++) {
      if (i % run === 0) simulator.runBlock(hSub, drive, stepInputs, i * substeps, Math.min(m, i + run) * substeps, first, solutions);
      const index = this.index++;
      // The sample's solution is read in place; copied out only for probes that want it whole.
      const row = (i * substeps + substeps - 1) * size;
      if (probed) for (let k = 0; k < size; k++) x[k] = solutions[row + k];
      speaker[i] = voltageAt(solutions, plus, row) - voltageAt(solutions, minus, row);
      updateWatches(watches, index, solutions, row);
      for (const tap of circuitTaps) tap.push((tap.source as { probe: (x: Float64Array) => number }).probe(x));
    }
    return m;
  }

  /** Far-end samples `from`…`to` of the last chunk into the level, the peak and the speaker taps. */
  private measureFarEnd(from: number, to: number): void {
    const far = this.farChunk;
    const speakerTaps = this.speakerTaps;
    let squares = this.squares;
    let peak = this.peak;
    for (let i = from; i < to; i++) {
      const v = far[i];
      squares += v * v;
      if (Math.abs(v) > peak) peak = Math.abs(v);
      for (const tap of speakerTaps) tap.push(v);
    }
    this.squares = squares;
    this.peak = peak;
  }

  summary(): ReceiverSummary {
    return {
      farEndRmsVolts: Math.sqrt(this.squares / Math.max(1, this.count)),
      farEndPeakVolts: this.peak,
      ...stageFigures(this.simulator, this.watches, this.milliseconds, this.taps),
    };
  }
}
