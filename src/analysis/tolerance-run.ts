/**
 * A whole tolerance run: the nominal link, the corners when asked, then the
 * Monte Carlo runs, rendered through a job runner; then the spread of each
 * metric over the Monte Carlo runs, each parameter's correlation with each
 * metric (Pearson's r over the Monte Carlo runs: which parts matter), and the
 * worst cases (over all runs) with the values of the parts that matter most.
 */
import type { Recording } from '../link/chain/source.ts';
import type { Scenario } from '../scenario/types.ts';
import { runAll, type JobOutcome, type JobRunner } from '../worker/jobs.ts';
import { LINK_METRICS, type MetricName } from './link-metrics.ts';
import { spreadOf, type Spread } from './spread.ts';
import { applyRun, cornerRuns, drawRun, nominalRun, toleranceParameters, type ToleranceParameter, type ToleranceRun, type ToleranceSpec } from './tolerance.ts';

export interface TolerancePlan {
  runs: number;
  seed: number;
  corners: boolean;
}

export interface ToleranceRow {
  run: ToleranceRun;
  outcome: JobOutcome;
}

export interface WorstCase {
  metric: MetricName;
  /** Which extreme: the highest or the lowest value. */
  extreme: 'highest' | 'lowest';
  label: string;
  value: number;
  /**
   * The parameters that drive this metric most (largest |correlation| over the Monte Carlo runs), with
   * their values in this run and where those sit in their range (offset ±1 = a range end).
   * Empty for the corner runs, where every parameter sits at one end.
   */
  drivers: Array<{ key: string; value: number; nominal: number; unit: string; offset: number; correlation: number }>;
}

/** Pearson correlation of each parameter with a metric over the Monte Carlo runs (0 where undefined). */
export interface Sensitivity {
  metric: MetricName;
  correlations: Array<{ key: string; correlation: number }>;
}

export interface ToleranceResult {
  parameters: ToleranceParameter[];
  rows: ToleranceRow[];
  /** Over the Monte Carlo runs only. */
  spreads: Array<{ metric: MetricName; spread: Spread | null }>;
  worst: WorstCase[];
  /** Parameters ordered by |correlation| with each metric, strongest first. */
  sensitivities: Sensitivity[];
  failedRuns: number;
}

export function planRuns(parameters: readonly ToleranceParameter[], spec: ToleranceSpec, plan: TolerancePlan): ToleranceRun[] {
  const runs = [nominalRun(parameters)];
  if (plan.corners) runs.push(...cornerRuns(parameters));
  for (let i = 0; i < plan.runs; i++) runs.push(drawRun(parameters, plan.seed, i, spec.distribution));
  return runs;
}

export async function runTolerance(
  scenario: Scenario,
  recording: Recording | undefined,
  spec: ToleranceSpec,
  plan: TolerancePlan,
  metrics: MetricName[],
  runner: JobRunner,
  onDone?: (done: number, total: number) => void,
): Promise<ToleranceResult> {
  const parameters = toleranceParameters(scenario, spec);
  const runs = planRuns(parameters, spec, plan);
  const jobs = runs.map((run) => ({ scenario: applyRun(scenario, parameters, run), recording, metrics }));
  const outcomes = await runAll(jobs, runner, onDone);
  const rows = runs.map((run, i) => ({ run, outcome: outcomes[i] }));
  return summariseTolerance(parameters, rows, metrics);
}

export function summariseTolerance(parameters: ToleranceParameter[], rows: ToleranceRow[], metrics: MetricName[]): ToleranceResult {
  const valueOf = (row: ToleranceRow, metric: MetricName): number | null => (row.outcome.ok ? (row.outcome.result.metrics.values[metric] ?? null) : null);
  const monteCarlo = rows.filter((r) => r.run.index !== null);
  const spreads = metrics.map((metric) => ({ metric, spread: spreadOf(monteCarlo.map((r) => valueOf(r, metric))) }));
  const varied = rows.filter((r) => r.run.label !== 'nominal');
  const worst: WorstCase[] = [];
  const sensitivities: Sensitivity[] = [];
  for (const metric of metrics) {
    const correlations = correlate(parameters, monteCarlo, (r) => valueOf(r, metric));
    sensitivities.push({ metric, correlations: [...correlations].sort((a, b) => Math.abs(b.correlation) - Math.abs(a.correlation)) });
    const worse = LINK_METRICS[metric].worse;
    const extremes: Array<'highest' | 'lowest'> = worse === 'higher' ? ['highest'] : worse === 'lower' ? ['lowest'] : ['lowest', 'highest'];
    for (const extreme of extremes) {
      let best: ToleranceRow | null = null;
      let bestValue = 0;
      for (const row of varied) {
        const value = valueOf(row, metric);
        if (value === null) continue;
        // Strictly better only, so ties go to the earlier run and the answer does not depend on timing.
        if (best === null || (extreme === 'highest' ? value > bestValue : value < bestValue)) {
          best = row;
          bestValue = value;
        }
      }
      // A metric every run agrees on has no worst case.
      const all = varied.map((r) => valueOf(r, metric)).filter((v): v is number => v !== null);
      if (all.every((v) => v === all[0])) continue;
      if (best) worst.push({ metric, extreme, label: best.run.label, value: bestValue, drivers: best.run.index === null ? [] : drivers(parameters, correlations, best.run, 3) });
    }
  }
  return { parameters, rows, spreads, worst, sensitivities, failedRuns: rows.filter((r) => !r.outcome.ok).length };
}

/** Pearson's r between each parameter's values and the metric, over the runs where the metric was measured. */
function correlate(parameters: readonly ToleranceParameter[], runs: readonly ToleranceRow[], value: (r: ToleranceRow) => number | null): Array<{ key: string; correlation: number }> {
  const measured = runs.map((r) => ({ run: r.run, y: value(r) })).filter((m): m is { run: ToleranceRun; y: number } => m.y !== null);
  const n = measured.length;
  const meanY = measured.reduce((a, m) => a + m.y, 0) / Math.max(1, n);
  return parameters.map((p, j) => {
    const meanX = measured.reduce((a, m) => a + m.run.values[j], 0) / Math.max(1, n);
    let sxy = 0;
    let sxx = 0;
    let syy = 0;
    for (const m of measured) {
      const dx = m.run.values[j] - meanX;
      const dy = m.y - meanY;
      sxy += dx * dy;
      sxx += dx * dx;
      syy += dy * dy;
    }
    return { key: p.key, correlation: n > 2 && sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : 0 };
  });
}

/** The `count` parameters with the strongest correlation, as they were in `run`. */
function drivers(
  parameters: readonly ToleranceParameter[],
  correlations: ReadonlyArray<{ key: string; correlation: number }>,
  run: ToleranceRun,
  count: number,
): WorstCase['drivers'] {
  return parameters
    .map((p, i) => {
      const half = (p.high - p.low) / 2;
      const centre = (p.high + p.low) / 2;
      const offset = half > 0 ? (run.values[i] - centre) / half : 0;
      return { key: p.key, value: run.values[i], nominal: p.nominal, unit: p.unit, offset, correlation: correlations[i].correlation };
    })
    .filter((d) => d.correlation !== 0)
    .sort((a, b) => Math.abs(b.correlation) - Math.abs(a.correlation))
    .slice(0, count);
}
