/**
 * Render jobs for sweeps, tolerance runs and headroom searches: one scenario
 * in, its metrics out. Core code (no Node APIs): the same job runs in this
 * thread (inProcessRunner) or in a worker (node-pool.ts for the command line).
 * A job is fully described by its own data, so a table built from jobs is the
 * same whatever the number of workers or the order they finish in.
 */
import { measureRender, type MetricName, type MetricValues } from '../analysis/link-metrics.ts';
import { ConvergenceError, InputError, isUserFacing } from '../errors.ts';
import { renderScenario } from '../link/chain/chain.ts';
import type { Recording } from '../link/chain/source.ts';
import type { Scenario } from '../scenario/types.ts';

export interface RenderJob {
  scenario: Scenario;
  /** Samples when the source is a recording. */
  recording?: Recording;
  metrics: MetricName[];
}

/** The render's own figures every job returns, beside its metrics. */
export interface JobSummary {
  restingLedAmperes: number;
  minimumLedAmperes: number;
  cutoffCount: number;
  cutoffFraction: number;
  renderedSeconds: number;
  wallSeconds: number;
}

export interface RenderJobResult {
  metrics: MetricValues;
  summary: JobSummary;
}

/** A job that ended in the user's error (bad setting, no convergence) keeps the message; bugs are thrown. */
export type JobOutcome = { ok: true; result: RenderJobResult } | { ok: false; error: string };

export function runRenderJob(job: RenderJob): RenderJobResult {
  const result = renderScenario(job.scenario, { recording: job.recording });
  const report = result.report;
  return {
    metrics: measureRender(job.scenario, result, job.metrics),
    summary: {
      restingLedAmperes: report.led.restingAmperes,
      minimumLedAmperes: report.led.minimumAmperes,
      cutoffCount: report.led.cutoff.count,
      cutoffFraction: report.led.cutoff.fraction,
      renderedSeconds: report.durationSeconds,
      wallSeconds: report.solver.wallSeconds,
    },
  };
}

/** Runs jobs somewhere; `size` is how many run at once. */
export interface JobRunner {
  readonly size: number;
  run(job: RenderJob): Promise<RenderJobResult>;
  close(): Promise<void>;
}

/** Runs every job in this thread, one at a time. */
export function inProcessRunner(): JobRunner {
  return {
    size: 1,
    run: async (job) => runRenderJob(job),
    close: async () => {},
  };
}

/**
 * Runs all jobs through the runner and returns their outcomes in job order.
 * `onDone(done, total)` is called as each finishes. The user's errors end one
 * job, not the batch; anything else (a bug) rejects the whole batch.
 */
export async function runAll(jobs: readonly RenderJob[], runner: JobRunner, onDone?: (done: number, total: number) => void): Promise<JobOutcome[]> {
  const outcomes: JobOutcome[] = new Array(jobs.length);
  let done = 0;
  let next = 0;
  // Keep each runner slot busy with one job queued behind it; no more, so a failure stops the batch early.
  const lane = async (): Promise<void> => {
    while (next < jobs.length) {
      const index = next++;
      try {
        outcomes[index] = { ok: true, result: await runner.run(jobs[index]) };
      } catch (error) {
        if (!isUserFacing(error)) throw error;
        outcomes[index] = { ok: false, error: error.message };
      }
      done++;
      onDone?.(done, jobs.length);
    }
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(jobs.length, runner.size * 2)) }, lane));
  return outcomes;
}

/** An error as plain data, to cross a worker boundary. */
export interface ErrorData {
  name: string;
  message: string;
  where?: string;
  expected?: string;
  seconds?: number | null;
  node?: string | null;
  part?: string | null;
  stack?: string;
}

export function errorToData(error: unknown): ErrorData {
  if (error instanceof InputError) return { name: error.name, message: error.message, where: error.where, expected: error.expected };
  if (error instanceof ConvergenceError) {
    return { name: error.name, message: error.message, seconds: error.seconds, node: error.node, part: error.part };
  }
  if (error instanceof Error) return { name: error.name, message: error.message, stack: error.stack };
  return { name: 'Error', message: String(error) };
}

/** Rebuilds the error on this side with its class, so the user's errors stay the user's. */
export function errorFromData(data: ErrorData): Error {
  if (data.name === 'InputError') {
    const error = new InputError(data.where ?? 'input', data.expected ?? 'valid input');
    error.message = data.message;
    return error;
  }
  if (data.name === 'ConvergenceError') return new ConvergenceError(data.message, data.seconds ?? null, data.node ?? null, data.part ?? null);
  const error = new Error(data.message);
  error.name = data.name;
  if (data.stack) error.stack = data.stack;
  return error;
}
