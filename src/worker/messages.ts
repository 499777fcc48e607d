/**
 * Messages between the page and a render worker. Plain data only (structured
 * clone); the big typed arrays travel as transferables, never copied twice.
 *
 * Page → worker: RenderRequest. Worker → page: BiasMessage first (the DC
 * operating points, ready long before the render), ProgressMessage now and
 * then, then exactly one DoneMessage or FailedMessage. Cancelling is done by
 * the page terminating the worker: a render runs in one synchronous call, so a
 * cancel message could not be read before it ends.
 */
import type { TapRecord } from '../link/chain/taps.ts';
import type { RenderReport } from '../link/chain/report.ts';
import type { BiasReport } from '../solver/bias-report.ts';
import type { JsonValue } from '../scenario/summary.ts';
import type { ErrorData, RenderJob, RenderJobResult } from './jobs.ts';

/** A decoded recording handed to the worker (mono, its own rate). */
export interface RecordingData {
  samples: Float64Array;
  sampleRateHertz: number;
  /** File name, for messages. */
  label: string;
}

export interface RenderRequest {
  kind: 'render';
  id: number;
  /** Scenario JSON (glowtalk.scenario/1) as in a file; circuits inline or named in `files`. */
  scenario: unknown;
  /** Circuit file texts by the name the scenario uses. */
  files: Record<string, string>;
  /** Starts every error location, e.g. the scenario's file name. */
  label: string;
  /** The recording when the source is a recording. */
  recording: RecordingData | null;
  /** Render only the first this many seconds of the source; null for all of it. */
  excerptSeconds: number | null;
}

/** DC operating points of both circuits as the chain runs them. */
export interface BiasTables {
  transmitter: BiasReport;
  /** The receiver under the resting light (LED at its bias, through the light path, plus ambient). */
  receiver: BiasReport;
  ledRestingAmperes: number;
  restingDetectorWatts: number;
  /** Parts the chain adds (microphone output resistance, speaker load): shown apart. */
  addedParts: string[];
}

/** A spectrum reduced to log-spaced bands for display. */
export interface DisplaySpectrum {
  name: string;
  hertz: Float64Array;
  /** Strongest bin in each band, dB re the record's own mean square (dBr). */
  levelDb: Float64Array;
}

/** Figures of merit of one render, by name; null when a figure does not apply (reason given). */
export interface LinkMetric {
  key: string;
  label: string;
  unit: string;
  value: number | null;
  note?: string;
}

export interface RenderedLink {
  sampleRateHertz: number;
  internalRateHertz: number;
  sourcePascals: Float64Array;
  farEndVolts: Float64Array;
  taps: TapRecord[];
  report: RenderReport;
  summary: string[];
  settings: { [key: string]: JsonValue };
  metrics: LinkMetric[];
  spectra: DisplaySpectrum[];
  /** Seconds rendered and seconds the whole source lasts. */
  renderedSeconds: number;
  fullSeconds: number;
  /** Wall-clock seconds the render took in the worker. */
  wallSeconds: number;
}

export interface BiasMessage {
  kind: 'bias';
  id: number;
  bias: BiasTables;
}
export interface ProgressMessage {
  kind: 'progress';
  id: number;
  fraction: number;
}
export interface DoneMessage {
  kind: 'done';
  id: number;
  result: RenderedLink;
}
/** `where` and `expected` are set for the user's errors (bad input); `internal` marks a bug. */
export interface FailedMessage {
  kind: 'failed';
  id: number;
  message: string;
  where: string | null;
  internal: boolean;
}

export type WorkerReply = BiasMessage | ProgressMessage | DoneMessage | FailedMessage;

/**
 * Page → worker: one analysis job (jobs.ts) of a headroom search, sweep or
 * tolerance run, the same job the command line's worker threads run. The
 * worker answers with exactly one JobReply of the same id.
 */
export interface JobRequest {
  kind: 'job';
  id: number;
  job: RenderJob;
}
export type JobReply = { kind: 'job-done'; id: number; result: RenderJobResult } | { kind: 'job-failed'; id: number; error: ErrorData };

/** The buffers of a result, to transfer rather than copy. */
export function transferables(result: RenderedLink): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  const add = (array: { buffer: ArrayBufferLike }) => {
    if (array.buffer instanceof ArrayBuffer) buffers.add(array.buffer);
  };
  add(result.sourcePascals);
  add(result.farEndVolts);
  for (const tap of result.taps) add(tap.samples);
  for (const spectrum of result.spectra) {
    add(spectrum.hertz);
    add(spectrum.levelDb);
  }
  return [...buffers];
}
