/**
 * A whole tolerance run: the nominal link, the corners when asked, then the
 * Monte Carlo runs, rendered through a job runner; then the spread of each
 * metric over the Monte Carlo runs and the worst cases (over all runs) with
 * the part values that produced them.
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
  /** The parameters furthest from nominal in that run, as a fraction of their half-range (±1 = a range end). */
  furthest: Array<{ key: string; value: number; nominal: number; unit: string; offset: number }>;
  // For the corner runs every parameter sits at one end, so `furthest` lists none.

}

export interface ToleranceResult {
  parameters: ToleranceParameter[];
  rows: ToleranceRow[];
  /** Over the Monte Carlo runs only. */
  spreads: Array<{ metric: MetricName; spread: Spread | null }>;
  worst: WorstCase[];
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
  for (const metric of metrics) {
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
      if (best) worst.push({ metric, extreme, label: best.run.label, value: bestValue, furthest: best.run.index === null ? [] : furthestParameters(parameters, best.run, 3) });
    }
  }
  return { parameters, rows, spreads, worst, failedRuns: rows.filter((r) => !r.outcome.ok).length };
}

function furthestParameters(parameters: readonly ToleranceParameter[], run: ToleranceRun, count: number): WorstCase['furthest'] {
  return parameters
    .map((p, i) => {
      const half = (p.high - p.low) / 2;
      const centre = (p.high + p.low) / 2;
      return { key: p.key, value: run.values[i], nominal: p.nominal, unit: p.unit, offset: half > 0 ? (run.values[i] - centre) / half : 0 };
    })
    .sort((a, b) => Math.abs(b.offset) - Math.abs(a.offset))
    .slice(0, count);
}
