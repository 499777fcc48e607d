import { InputError } from '../../errors.ts';
import type { Scenario } from '../../scenario/types.ts';
import type { KernelBackend } from '../../solver/kernel/step-kernel.ts';
import { AUDIO_TOLERANCES, type NewtonTolerances } from '../../solver/newton.ts';
import type { LinearAlgebra } from '../../solver/system.ts';
import { ReceiverStage, type ReceiverSummary, type ReceiverTiming } from './receiver-stage.ts';
import { buildReport, type RenderReport } from './report.ts';
import type { Recording } from './source.ts';
import type { StreamedRecording } from './source-stream.ts';
import { isReceiverTap, type TapRecord } from './taps.ts';
import { TransmitterStage, type StageSettings, type TransmitterSummary } from './transmitter-stage.ts';

export interface RenderOptions {
  /** The decoded recording when the source is a recording. */
  recording?: Recording;
  /**
   * The recording as a stream instead (long inputs): calibrated by passes over it
   * before the render, then read chunk by chunk; the result's sourcePascals is empty.
   */
  streamedRecording?: StreamedRecording;
  /** Receives the calibrated source (pascals, audio rate) chunk by chunk as it is rendered (a fresh array each time). */
  onSource?: (chunk: Float64Array) => void;
  /** Extra taps besides the scenario's own. */
  taps?: string[];
  /** Called now and then with the fraction done (0…1). */
  onProgress?: (fraction: number) => void;
  /** Checked between chunks; a true `aborted` stops the render with an error. */
  signal?: { readonly aborted: boolean };
  /** Audio-rate samples per chunk. */
  chunkSamples?: number;
  /** Called once before processing: how many samples the far end and each tap will have. */
  onStart?: (info: {
    farEndSamples: number;
    sampleRateHertz: number;
    /** Largest |source pressure|, pascals (known before the run: the source is calibrated first). */
    sourcePeakPascals: number;
    taps: Array<{ name: string; samples: number; sampleRateHertz: number }>;
  }) => void;
  /** Receives the far end chunk by chunk (volts, aligned); then the result's farEndVolts is empty. */
  onFarEnd?: (chunk: Float64Array) => void;
  /** Receives tap blocks as they fill; then the result's tap records are empty. */
  onTap?: (name: string, block: Float32Array) => void;
  /** Solver settings for both circuits (defaults: the fast path). The benchmark's reference run uses these. */
  solver?: {
    linearAlgebra?: LinearAlgebra;
    tolerances?: NewtonTolerances;
    /**
     * Integration steps per internal sample, for both circuits or each (default
     * DEFAULT_SUBSTEPS). The benchmark's reference run takes 8× the default in each.
     */
    substeps?: number | { transmitter: number; receiver: number };
    /** False: every step on the general loop, none in the generated kernels (for comparisons). */
    generatedSteps?: boolean;
    /** What the generated kernels run on (default 'wasm'; 'js' for comparisons). */
    kernelBackend?: KernelBackend;
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
  const settings = stageSettings(scenario, options);
  const tapNames = [...new Set([...scenario.taps, ...(options.taps ?? [])])];
  const transmitter = new TransmitterStage(scenario, options.streamedRecording ?? options.recording, settings, tapNames.filter((n) => !isReceiverTap(n)));
  const timing = receiverTiming(transmitter);
  const total = transmitter.totalSamples;
  const farEnd = new Float64Array(options.onFarEnd ? 0 : total);
  const receiver = new ReceiverStage(scenario, settings, timing, tapNames.filter(isReceiverTap), (chunk, offset) => {
    if (options.onFarEnd) options.onFarEnd(chunk.slice());
    else farEnd.set(chunk, offset);
  });
  options.onStart?.(startInfo(transmitter, receiver));
  const light = new Float64Array(settings.chunkSamples * transmitter.factor);
  for (;;) {
    if (options.signal?.aborted) throw new InputError('render', 'to run to the end', 'cancelled');
    const m = transmitter.next(light);
    if (m === 0) break;
    receiver.process(light, m);
    options.onProgress?.(Math.min(1, transmitter.fraction));
  }
  return assembleResult(scenario, transmitter, transmitter.summary(), receiver.summary(), farEnd, startedMs, tapNames);
}

/** The settings both stages share, from the render options. */
export function stageSettings(scenario: Scenario, options: RenderOptions): StageSettings {
  return {
    solver: {
      method: scenario.method,
      linearAlgebra: options.solver?.linearAlgebra,
      tolerances: options.solver?.tolerances ?? AUDIO_TOLERANCES,
      generatedSteps: options.solver?.generatedSteps,
      kernelBackend: options.solver?.kernelBackend,
    },
    substeps: substepsOf(options.solver?.substeps),
    chunkSamples: options.chunkSamples ?? 1024,
    onTap: options.onTap,
    onSource: options.onSource,
  };
}

/**
 * Integration steps per internal sample on the fast path. The transmitter takes two: its
 * first stage has a pole near the internal rate (a collector node behind a large resistor
 * and the Miller-multiplied collector–base capacitance). With one step everywhere the far
 * end of demo (a) is 1.3e-4 (relative rms) from the converged reference, 8.2e-5 of it from
 * the transmitter; two steps there bring it to 6.4e-5 for about a fifth more time (4 s of
 * demo (a): 0.98 s against 0.82 s).
 */
export const DEFAULT_SUBSTEPS = { transmitter: 2, receiver: 1 } as const;

function substepsOf(value: number | { transmitter: number; receiver: number } | undefined): { transmitter: number; receiver: number } {
  const whole = (n: number, where: string): number => {
    if (!(Number.isInteger(n) && n >= 1 && n <= 64)) throw new InputError(where, 'a whole number of steps per sample from 1 to 64', `got ${n}`);
    return n;
  };
  if (value === undefined) return { ...DEFAULT_SUBSTEPS };
  if (typeof value === 'number') return { transmitter: whole(value, 'solver.substeps'), receiver: whole(value, 'solver.substeps') };
  return { transmitter: whole(value.transmitter, 'solver.substeps.transmitter'), receiver: whole(value.receiver, 'solver.substeps.receiver') };
}

/** What the receiver stage needs to know of the transmitter stage. */
export function receiverTiming(transmitter: TransmitterStage): ReceiverTiming {
  return {
    sampleRateHertz: transmitter.sampleRateHertz,
    factor: transmitter.factor,
    totalSamples: transmitter.totalSamples,
    latencySamples: transmitter.latencySamples,
    holdbackSamples: transmitter.holdbackSamples,
    upLatencyInternal: transmitter.upLatencyInternal,
    offsetSeconds: transmitter.offsetSeconds,
    restingLightDriveWatts: transmitter.restingLightDriveWatts,
  };
}

function startInfo(transmitter: TransmitterStage, receiver: ReceiverStage): Parameters<NonNullable<RenderOptions['onStart']>>[0] {
  const fs = transmitter.sampleRateHertz;
  const total = transmitter.totalSamples;
  return {
    farEndSamples: total,
    sampleRateHertz: fs,
    sourcePeakPascals: transmitter.source.peakPascals,
    taps: [...transmitter.taps, ...receiver.taps].map((c) => ({
      name: c.name,
      samples: c.sampleRateHertz === fs ? total : total * transmitter.factor,
      sampleRateHertz: c.sampleRateHertz,
    })),
  };
}

/** What the report needs to know of the transmitter stage besides its summary (plain data). */
export interface TransmitterFacts {
  source: TransmitterStage['source'];
  restingLedAmperes: number;
  restingDetectorWatts: number;
  channelGain: number;
  internalRateHertz: number;
}

/** The result of a render from the two stages' summaries. */
export function assembleResult(
  scenario: Scenario,
  transmitter: TransmitterFacts,
  tx: TransmitterSummary,
  rx: ReceiverSummary,
  farEnd: Float64Array,
  startedMs: number,
  /** Tap names in the order the caller asked for them. */
  tapOrder: readonly string[],
): RenderResult {
  const report = buildReport({
    scenario,
    source: transmitter.source,
    farEnd: { rmsVolts: rx.farEndRmsVolts, peakVolts: rx.farEndPeakVolts },
    restingLedAmperes: transmitter.restingLedAmperes,
    restingDetectorWatts: transmitter.restingDetectorWatts,
    led: tx.led,
    channelGain: transmitter.channelGain,
    transistors: [...tx.transistors, ...rx.transistors],
    solver: {
      internalRateHertz: transmitter.internalRateHertz,
      transmitterSteps: tx.steps,
      receiverSteps: rx.steps,
      newtonIterations: tx.newtonIterations + rx.newtonIterations,
      transmitterNewtonIterations: tx.newtonIterations,
      receiverNewtonIterations: rx.newtonIterations,
      subdividedSteps: tx.subdividedSteps + rx.subdividedSteps,
      generatedSteps: tx.generatedSteps + rx.generatedSteps,
      transmitterReusedSteps: tx.reusedSteps,
      receiverReusedSteps: rx.reusedSteps,
      transmitterKernel: tx.kernel,
      receiverKernel: rx.kernel,
      wallSeconds: (Date.now() - startedMs) / 1000,
      transmitterSeconds: tx.seconds,
      receiverSeconds: rx.seconds,
    },
  });
  const taps = [...tx.taps, ...rx.taps].sort((a, b) => tapOrder.indexOf(a.name) - tapOrder.indexOf(b.name));
  return { sourcePascals: transmitter.source.pascals, farEndVolts: farEnd, taps, report };
}
