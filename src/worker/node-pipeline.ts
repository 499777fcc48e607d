/**
 * Renders a link with its two halves on two threads (Node): a worker thread
 * runs the transmitter stage (source to light) and streams the light to this
 * thread, which runs the receiver stage (light to far end) at the same time.
 * The output is identical to renderScenario's. Node APIs: the command line's shell.
 *
 * A streamed recording is calibrated here (passes over the file), then the worker
 * opens the file itself and reads it chunk by chunk: no samples cross the threads
 * but the source chunks that onSource asks for.
 */
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import { workerBootCode } from './node-boot.ts';
import { assembleResult, receiverTiming, stageSettings, type RenderOptions, type RenderResult, type TransmitterFacts } from '../link/chain/chain.ts';
import { ReceiverStage, type ReceiverTiming } from '../link/chain/receiver-stage.ts';
import { isReceiverTap } from '../link/chain/taps.ts';
import { TransmitterStage, type TransmitterSummary } from '../link/chain/transmitter-stage.ts';
import type { Recording } from '../link/chain/source.ts';
import { calibrateRecording, type SourceCalibration, type SourceInput } from '../link/chain/source-stream.ts';
import { InputError } from '../errors.ts';
import { openWavFile } from '../cli/files.ts';
import type { Scenario } from '../scenario/types.ts';
import { errorFromData, errorToData, type ErrorData } from './jobs.ts';

const ROLE = 'glowtalk-transmitter-stage';
/** Light chunks the worker may run ahead of the receiver (bounds memory). */
const MAX_AHEAD = 16;

interface StageRequest {
  role: typeof ROLE;
  scenario: Scenario;
  recording?: Recording;
  /** A streamed recording: the worker opens the file and uses this calibration. */
  streamed?: { file: string; calibration: SourceCalibration };
  taps: string[];
  solver: RenderOptions['solver'];
  chunkSamples?: number;
  streamTaps: boolean;
  streamSource: boolean;
}

type StageMessage =
  | { type: 'start'; timing: ReceiverTiming; facts: TransmitterFacts; taps: Array<{ name: string; samples: number; sampleRateHertz: number }> }
  | { type: 'light'; m: number; light: Float64Array }
  | { type: 'tap'; name: string; block: Float32Array }
  | { type: 'source'; chunk: Float64Array }
  | { type: 'done'; summary: TransmitterSummary }
  | { type: 'error'; error: ErrorData };

/** Like renderScenario, with the transmitter and the receiver on two threads. */
export async function renderPipelined(scenario: Scenario, options: RenderOptions = {}): Promise<RenderResult> {
  const startedMs = Date.now();
  const tapNames = [...new Set([...scenario.taps, ...(options.taps ?? [])])];
  let streamed: StageRequest['streamed'];
  if (options.streamedRecording) {
    const { frames, file, calibration } = options.streamedRecording;
    if (file === undefined) throw new InputError('streamedRecording.file', 'the file a streamed recording reads (the transmitter thread opens it again)', 'none given');
    streamed = { file, calibration: calibration ?? calibrateRecording(scenario.source, scenario.sampleRateHertz, frames) };
  }
  const request: StageRequest = {
    role: ROLE,
    scenario,
    recording: streamed ? undefined : options.recording,
    streamed,
    taps: tapNames.filter((n) => !isReceiverTap(n)),
    solver: options.solver,
    chunkSamples: options.chunkSamples,
    streamTaps: options.onTap !== undefined,
    streamSource: options.onSource !== undefined,
  };
  const worker = new Worker(workerBootCode(import.meta.url), { eval: true, workerData: request });
  return new Promise<RenderResult>((resolve, reject) => {
    let receiver: ReceiverStage | null = null;
    let facts: TransmitterFacts | null = null;
    let farEnd = new Float64Array(0);
    let processedInternal = 0;
    let totalInternal = 1;
    let settled = false;
    const finish = (error: Error | null, result?: RenderResult): void => {
      if (settled) return;
      settled = true;
      void worker.terminate();
      if (error) reject(error);
      else resolve(result!);
    };
    worker.on('error', (error) => finish(error instanceof Error ? error : new Error(String(error))));
    worker.on('exit', (code) => finish(new Error(`the transmitter thread stopped unexpectedly (exit code ${code})`)));
    worker.on('message', (message: StageMessage) => {
      try {
        if (options.signal?.aborted) throw errorFromData({ name: 'InputError', message: 'render: cancelled; expected to run to the end', where: 'render', expected: 'to run to the end' });
        switch (message.type) {
          case 'start': {
            facts = message.facts;
            const timing = message.timing;
            farEnd = new Float64Array(options.onFarEnd ? 0 : timing.totalSamples);
            totalInternal = (timing.totalSamples + timing.latencySamples + timing.holdbackSamples) * timing.factor;
            receiver = new ReceiverStage(scenario, stageSettings(scenario, options), timing, tapNames.filter(isReceiverTap), (chunk, offset) => {
              if (options.onFarEnd) options.onFarEnd(chunk.slice());
              else farEnd.set(chunk, offset);
            });
            options.onStart?.({
              farEndSamples: timing.totalSamples,
              sampleRateHertz: timing.sampleRateHertz,
              sourcePeakPascals: message.facts.source.peakPascals,
              taps: [
                ...message.taps,
                ...receiver.taps.map((c) => ({
                  name: c.name,
                  samples: c.sampleRateHertz === timing.sampleRateHertz ? timing.totalSamples : timing.totalSamples * timing.factor,
                  sampleRateHertz: c.sampleRateHertz,
                })),
              ],
            });
            break;
          }
          case 'light':
            receiver!.process(message.light, message.m);
            worker.postMessage('ack');
            processedInternal += message.m;
            options.onProgress?.(Math.min(1, processedInternal / totalInternal));
            break;
          case 'tap':
            options.onTap?.(message.name, message.block);
            break;
          case 'source':
            options.onSource?.(message.chunk);
            break;
          case 'done':
            finish(null, assembleResult(scenario, facts!, message.summary, receiver!.summary(), farEnd, startedMs, tapNames));
            break;
          case 'error':
            finish(errorFromData(message.error));
            break;
        }
      } catch (error) {
        finish(error instanceof Error ? error : new Error(String(error)));
      }
    });
  });
}

/** The worker's side: run the transmitter stage and stream its light. */
async function runTransmitterThread(request: StageRequest): Promise<void> {
  const port = parentPort!;
  let acknowledged = 0;
  let waiting: (() => void) | null = null;
  port.on('message', () => {
    acknowledged++;
    waiting?.();
  });
  let closeFile: (() => void) | null = null;
  try {
    const settings = stageSettings(request.scenario, { solver: request.solver, chunkSamples: request.chunkSamples });
    if (request.streamTaps) settings.onTap = (name, block) => port.postMessage({ type: 'tap', name, block: block.slice() } satisfies StageMessage);
    if (request.streamSource) settings.onSource = (chunk) => port.postMessage({ type: 'source', chunk } satisfies StageMessage, [chunk.buffer as ArrayBuffer]);
    let input: SourceInput = request.recording;
    if (request.streamed) {
      const opened = openWavFile(request.streamed.file);
      closeFile = opened.close;
      input = { frames: opened.frames, calibration: request.streamed.calibration };
    }
    const stage = new TransmitterStage(request.scenario, input, settings, request.taps);
    const facts: TransmitterFacts = {
      source: stage.source,
      restingLedAmperes: stage.restingLedAmperes,
      restingDetectorWatts: stage.restingDetectorWatts,
      channelGain: stage.channelGain,
      internalRateHertz: stage.internalRateHertz,
    };
    const taps = stage.taps.map((c) => ({
      name: c.name,
      samples: c.sampleRateHertz === stage.sampleRateHertz ? stage.totalSamples : stage.totalSamples * stage.factor,
      sampleRateHertz: c.sampleRateHertz,
    }));
    port.postMessage({ type: 'start', timing: receiverTiming(stage), facts, taps } satisfies StageMessage);
    let sent = 0;
    for (;;) {
      const light = new Float64Array(settings.chunkSamples * stage.factor);
      const m = stage.next(light);
      if (m === 0) break;
      port.postMessage({ type: 'light', m, light } satisfies StageMessage, [light.buffer]);
      sent++;
      while (sent - acknowledged >= MAX_AHEAD) await new Promise<void>((resume) => (waiting = resume));
    }
    port.postMessage({ type: 'done', summary: stage.summary() } satisfies StageMessage);
  } catch (error) {
    port.postMessage({ type: 'error', error: errorToData(error) } satisfies StageMessage);
  } finally {
    closeFile?.();
  }
}

if (!isMainThread && (workerData as StageRequest | undefined)?.role === ROLE) void runTransmitterThread(workerData as StageRequest);
