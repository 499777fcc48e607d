/**
 * What the analysis commands (headroom, sweep, tolerance, response) share:
 * reading the scenario (and its recording), number flags, the job runner
 * (worker threads or this thread), the progress bar, and writing the tables
 * and the JSON report without touching an input.
 */
import * as path from 'node:path';
import { SingleBar } from 'cli-progress';
import { decodeWav } from '../audio/wav-read.ts';
import { parseJsonText } from '../circuit/json-text.ts';
import { InputError } from '../errors.ts';
import type { Recording } from '../link/chain/source.ts';
import { loadScenario, type ScenarioResolver } from '../scenario/index.ts';
import type { Scenario } from '../scenario/types.ts';
import { readEngineering } from '../units/engineering.ts';
import { inProcessRunner, type JobRunner } from '../worker/jobs.ts';
import { NodePool, defaultWorkerCount } from '../worker/node-pool.ts';
import { readFileBytes, readFileText, writeFileAtomic } from './files.ts';
import { toCsv, toJsonTable, type Table } from './tables.ts';

export interface ScenarioInput {
  file: string;
  /** The file's JSON as written (sweeps change it by path). */
  json: unknown;
  scenario: Scenario;
  resolve: ScenarioResolver;
  recording: Recording | undefined;
  /** Every file read, so no output can overwrite one. */
  inputs: string[];
}

/** Reads a scenario file, the circuit files it names and (with `inputWav`, or a recording source) the recording. */
export function readScenario(file: string, inputWav?: string): ScenarioInput {
  const inputs: string[] = [file];
  const base = path.dirname(file);
  const resolve: ScenarioResolver = {
    readText: (relative) => {
      const circuitFile = path.resolve(base, relative);
      if (!inputs.includes(circuitFile)) inputs.push(circuitFile);
      return readFileText(circuitFile, 'circuit');
    },
  };
  const json = parseJsonText(readFileText(file, 'scenario'), file);
  let scenario = loadScenario(json, resolve, file);
  let recording: Recording | undefined;
  if (inputWav !== undefined) scenario = { ...scenario, source: { kind: 'recording', file: inputWav, level: scenario.source.level } };
  if (scenario.source.kind === 'recording') {
    const wav = inputWav ?? path.resolve(base, scenario.source.file);
    inputs.push(wav);
    const decoded = decodeWav(readFileBytes(wav, 'WAV'), wav);
    recording = { samples: decoded.mono, sampleRateHertz: decoded.sampleRateHertz, label: wav };
  }
  return { file, json, scenario, resolve, recording, inputs };
}

/** A number flag (engineering notation allowed), checked. */
export function numberFlag(text: string | undefined, flag: string, fallback: number, inRange: (v: number) => boolean, expected: string): number {
  if (text === undefined) return fallback;
  const read = readEngineering(String(text).trim());
  if (!read.ok || !inRange(read.value)) throw new InputError(flag, expected, `got "${text}"`);
  return read.value;
}

/** A comma-separated list of numbers. */
export function numberListFlag(text: string, flag: string, inRange: (v: number) => boolean, expected: string): number[] {
  const items = text.split(',').map((s) => s.trim());
  return items.map((item) => numberFlag(item, flag, 0, inRange, expected));
}

/** `--seconds`: a length, or "all" for the whole source (null). */
export function excerptFlag(text: string | undefined, fallback: number | null): number | null {
  if (text === undefined) return fallback;
  if (text === 'all') return null;
  return numberFlag(text, '--seconds', 0, (v) => v > 0 && v <= 600, 'a length in seconds from above 0 to 600, or "all" for the whole source');
}

/** `--spl`: overrides the scenario's level. */
export function withLevelFlag(scenario: Scenario, text: string | undefined): Scenario {
  if (text === undefined) return scenario;
  const dbSpl = numberFlag(text, '--spl', 0, (v) => v >= 0 && v <= 160, 'a level from 0 to 160 dB SPL');
  return { ...scenario, source: { ...scenario.source, level: { kind: 'spl', dbSpl } } };
}

/** `--tone HZ`: replaces the source with a steady tone at the scenario's level (THD and SINAD need one). */
export function withToneFlag(scenario: Scenario, text: string | undefined): Scenario {
  if (text === undefined) return scenario;
  const half = scenario.sampleRateHertz / 2;
  const frequencyHertz = numberFlag(text, '--tone', 0, (v) => v >= 20 && v < half, `a tone frequency from 20 Hz to below ${half} Hz`);
  return { ...scenario, source: { kind: 'tone', frequencyHertz, seconds: 1, level: scenario.source.level } };
}

/** Worker threads for `--workers N` (default: every core); 0 runs in this thread. Never more than the jobs. */
export function createRunner(text: string | undefined, jobs: number): JobRunner {
  const asked = numberFlag(text, '--workers', defaultWorkerCount(), (v) => Number.isInteger(v) && v >= 0 && v <= 256, 'a whole number of workers from 0 to 256');
  const size = Math.min(asked, Math.max(1, jobs));
  return size === 0 ? inProcessRunner() : new NodePool(size);
}

/** A progress bar on standard error when it is a terminal (and not turned off). */
export function progressBar(enabled: boolean | undefined, label: string): { update(done: number, total: number): void; stop(): void } {
  if (enabled === false || !process.stderr.isTTY) return { update: () => {}, stop: () => {} };
  const bar = new SingleBar({ format: `${label} [{bar}] {value}/{total} | {eta_formatted} left`, hideCursor: true, stream: process.stderr }, undefined);
  let started = false;
  return {
    update(done, total) {
      if (!started) {
        bar.start(total, 0);
        started = true;
      }
      bar.setTotal(Math.max(total, done));
      bar.update(done);
    },
    stop() {
      if (started) bar.stop();
    },
  };
}

export function defaultOutDir(sourceFile: string, verb: string): string {
  return path.join('out', `${path.basename(sourceFile).replace(/\.[^.]+$/, '')}-${verb}`);
}

/** Writes each table as CSV and the report (with the tables) as JSON; returns the files written. */
export function writeResults(outDir: string, reportName: string, report: Record<string, unknown>, tables: Table[], inputs: readonly string[]): string[] {
  const files: string[] = [];
  for (const table of tables) {
    const file = path.join(outDir, `${table.name}.csv`);
    writeFileAtomic(file, toCsv(table), inputs);
    files.push(file);
  }
  const reportFile = path.join(outDir, `${reportName}.json`);
  const body = { ...report, tables: tables.map(toJsonTable) };
  writeFileAtomic(reportFile, `${JSON.stringify(body, null, 2)}\n`, inputs);
  files.push(reportFile);
  return files;
}

/** Shell-quotes an argument for the "repeat" line of a report. */
/** The flags every analysis command shares, appended to its repeat line. */
export function repeatSharedFlags(
  repeat: string[],
  metrics: readonly string[],
  seconds: number | null,
  flags: { spl?: string; tone?: string; input?: string },
): void {
  repeat.push('--metrics', metrics.join(','), '--seconds', seconds === null ? 'all' : String(seconds));
  if (flags.spl !== undefined) repeat.push('--spl', flags.spl);
  if (flags.tone !== undefined) repeat.push('--tone', flags.tone);
  if (flags.input !== undefined) repeat.push('--input', flags.input);
}

export function shellWord(word: string): string {
  return /^[A-Za-z0-9_./:=,@%+-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}
