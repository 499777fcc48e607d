import * as path from 'node:path';
import { SingleBar } from 'cli-progress';
import { InputError } from '../errors.ts';
import { renderScenario, type RenderOptions } from '../link/chain/chain.ts';
import { renderPipelined } from '../worker/node-pipeline.ts';
import { availableParallelism } from 'node:os';
import { summariseRender } from '../link/chain/summary.ts';
import type { StreamedRecording } from '../link/chain/source-stream.ts';
import { VOCAL_EFFORTS, type VocalEffort } from '../link/acoustics/sound-level.ts';
import { loadScenarioText, settingsSummary } from '../scenario/index.ts';
import type { Scenario } from '../scenario/types.ts';
import { parseEngineering } from '../units/engineering.ts';
import { AtomicFile, openWavFile, readFileText, refuseInputOverwrite, writeFileAtomic } from './files.ts';
import { WavStreamEncoder } from '../audio/wav-stream.ts';

export interface RenderFlags {
  input?: string;
  out?: string;
  tap?: string[];
  format?: string;
  spl?: string;
  effort?: string;
  distance?: string;
  progress?: boolean;
  workers?: string;
}

/** `glowtalk render SCENARIO`: far-end WAV, tap WAVs and report.json; a summary on the terminal. */
export async function runRender(scenarioFile: string, flags: RenderFlags, write: (text: string) => void): Promise<void> {
  const inputs: string[] = [scenarioFile];
  const base = path.dirname(scenarioFile);
  const scenario = loadScenarioText(
    readFileText(scenarioFile, 'scenario'),
    {
      readText: (relative) => {
        const file = path.resolve(base, relative);
        inputs.push(file);
        return readFileText(file, 'circuit');
      },
    },
    scenarioFile,
  );
  const adjusted = applyFlags(scenario, flags);
  // A recording is streamed from its file (any length in constant memory): calibrated by passes over it, then read chunk by chunk.
  let streamedRecording: StreamedRecording | undefined;
  let closeInput = (): void => {};
  if (adjusted.source.kind === 'recording') {
    const file = flags.input ?? path.resolve(base, adjusted.source.file);
    inputs.push(file);
    const opened = openWavFile(file);
    streamedRecording = { frames: opened.frames, file };
    closeInput = opened.close;
  }
  try {
    await renderToFiles(scenarioFile, adjusted, flags, inputs, streamedRecording, write);
  } finally {
    closeInput();
  }
}

/** A duration for people: "12.3 s", "4 min 05 s", "1 h 02 min". */
function formatDuration(seconds: number): string {
  if (seconds < 60) return `${seconds.toFixed(1)} s`;
  const minutes = Math.floor(seconds / 60);
  if (minutes < 60) return `${minutes} min ${String(Math.floor(seconds - 60 * minutes)).padStart(2, '0')} s`;
  return `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, '0')} min`;
}

async function renderToFiles(
  scenarioFile: string,
  adjusted: Scenario,
  flags: RenderFlags,
  inputs: string[],
  streamedRecording: StreamedRecording | undefined,
  write: (text: string) => void,
): Promise<void> {
  const format = flags.format ?? adjusted.output.format;
  if (format !== 'pcm16' && format !== 'float32') throw new InputError('--format', '"pcm16" or "float32"', `got "${format}"`);
  const outDir = flags.out ?? path.join('out', path.basename(scenarioFile).replace(/\.json$/i, ''));
  const threads = flags.workers === undefined ? Math.min(2, availableParallelism()) : Number(flags.workers);
  if (threads !== 1 && threads !== 2) throw new InputError('--workers', '1 (one thread) or 2 (transmitter and receiver on two threads)', `got "${flags.workers}"`);
  // Check before the (long) render, not after it.
  for (const name of ['far-end.wav', 'source.wav', 'report.json']) refuseInputOverwrite(path.join(outDir, name), inputs);

  const bar = flags.progress === false || !process.stderr.isTTY ? null : new SingleBar({ format: 'rendering [{bar}] {percentage}% | {eta}s left', hideCursor: true }, undefined);
  const startedMs = Date.now();
  let barStarted = false;
  if (bar && streamedRecording) {
    // Two passes over the file come first, with nothing else to show for a long recording.
    const seconds = streamedRecording.frames.frames / streamedRecording.frames.sampleRateHertz;
    process.stderr.write(`measuring the level of ${path.basename(streamedRecording.file ?? streamedRecording.frames.label)} (${formatDuration(seconds)} of audio)…\n`);
  }
  // The far end, the source and the taps stream to their files as they are rendered (memory stays flat).
  const writers = new Map<string, { file: AtomicFile; encoder: WavStreamEncoder; path: string }>();
  const open = (key: string, file: string, frames: number, rate: number, wavFormat: 'pcm16' | 'float32') => {
    const encoder = new WavStreamEncoder(frames, rate, wavFormat);
    const atomic = new AtomicFile(file, inputs);
    atomic.write(encoder.header());
    writers.set(key, { file: atomic, encoder, path: file });
  };
  const gain = 10 ** (adjusted.output.listeningGainDb / 20);
  const listening = new Float64Array(4096);
  let sourcePeak = 0;
  let result: Awaited<ReturnType<typeof renderPipelined>>;
  try {
    const renderOptions: RenderOptions = {
      streamedRecording,
      taps: flags.tap,
      onStart: (info) => {
        open('far-end', path.join(outDir, 'far-end.wav'), info.farEndSamples, info.sampleRateHertz, format);
        for (const tap of info.taps) {
          open(`tap:${tap.name}`, path.join(outDir, `tap-${tap.name.replace(/[^A-Za-z0-9_.-]+/g, '_')}.wav`), tap.samples, tap.sampleRateHertz, 'float32');
        }
        // The peak is known before the run (the source is calibrated first), so source.wav can be normalised as it streams.
        sourcePeak = Math.max(info.sourcePeakPascals, 1e-30);
        open('source', path.join(outDir, 'source.wav'), info.farEndSamples, info.sampleRateHertz, 'float32');
      },
      onSource: (chunk) => {
        const w = writers.get('source')!;
        for (let i = 0; i < chunk.length; i++) chunk[i] = chunk[i] / sourcePeak;
        w.file.write(w.encoder.encode(chunk));
      },
      onFarEnd: (chunk) => {
        const w = writers.get('far-end')!;
        const scaled = chunk.length <= listening.length ? listening.subarray(0, chunk.length) : new Float64Array(chunk.length);
        for (let i = 0; i < chunk.length; i++) scaled[i] = chunk[i] * gain;
        w.file.write(w.encoder.encode(scaled));
      },
      onTap: (name, block) => {
        const w = writers.get(`tap:${name}`)!;
        w.file.write(w.encoder.encode(block));
      },
      onProgress: (fraction) => {
        if (!bar) return;
        if (!barStarted && Date.now() - startedMs > 1000) {
          bar.start(100, 0);
          barStarted = true;
        }
        if (barStarted) bar.update(Math.round(fraction * 100));
      },
    };
    // Two threads: the transmitter half on a worker, the receiver half here (identical output).
    result = threads > 1 ? await renderPipelined(adjusted, renderOptions) : renderScenario(adjusted, renderOptions);
    for (const w of writers.values()) {
      w.file.write(w.encoder.trailer());
      w.file.commit();
    }
  } catch (error) {
    for (const w of writers.values()) w.file.abandon();
    throw error;
  } finally {
    if (barStarted) bar?.stop();
  }

  const files: Record<string, string> = {};
  for (const [key, w] of writers) files[key] = w.path;
  const farEnd = writers.get('far-end')!.encoder;
  const report = {
    ...result.report,
    farEnd: { ...result.report.farEnd, wavFormat: format, clippedSamples: farEnd.clippedSamples },
    files,
    notes: {
      'source.wav': 'sound pressure at the microphone, normalised to its peak (full scale = peak pascals, see microphone.peakDbSpl)',
      'tap WAVs': "raw SI values (volts, amperes, watts, pascals) as 32-bit float at the tap's own rate",
    },
    settings: settingsSummary(adjusted),
  };
  const reportFile = path.join(outDir, 'report.json');
  writeFileAtomic(reportFile, `${JSON.stringify(report, null, 2)}\n`, inputs);
  const lines = summariseRender(result.report);
  if (farEnd.clippedSamples > 0) lines.push(`Warning: ${farEnd.clippedSamples} far-end samples clipped in the ${format} WAV; lower output.listeningGain.`);
  lines.push(`Files: ${outDir}/ (far-end.wav, source.wav, ${writers.size - 2} tap WAVs, report.json).`);
  write(`${lines.join('\n')}\n`);
}

/** Level overrides from the command line. */
function applyFlags(scenario: Scenario, flags: RenderFlags): Scenario {
  let source = scenario.source;
  if (flags.input) source = { kind: 'recording', file: flags.input, level: source.level };
  if (flags.spl !== undefined) {
    const dbSpl = Number(flags.spl);
    if (!Number.isFinite(dbSpl) || dbSpl < 0 || dbSpl > 160) throw new InputError('--spl', 'a level from 0 to 160 dB SPL', `got "${flags.spl}"`);
    source = { ...source, level: { kind: 'spl', dbSpl } };
  }
  if (flags.effort !== undefined || flags.distance !== undefined) {
    const effort = flags.effort ?? 'normal';
    if (!(VOCAL_EFFORTS as string[]).includes(effort)) throw new InputError('--effort', VOCAL_EFFORTS.join(', '), `got "${effort}"`);
    let distanceMetres = 1;
    if (flags.distance !== undefined) {
      try {
        distanceMetres = parseEngineering(flags.distance);
      } catch {
        distanceMetres = NaN;
      }
      if (!(distanceMetres > 0.01 && distanceMetres < 100)) throw new InputError('--distance', 'a distance from 0.01 to 100 metres', `got "${flags.distance}"`);
    }
    source = { ...source, level: { kind: 'effort', effort: effort as VocalEffort, distanceMetres } };
  }
  return { ...scenario, source };
}
