/**
 * What the Margins tab runs, built the way the command line builds it
 * (src/cli/headroom.ts, sweep.ts, tolerance.ts) so the page and
 * `glowtalk headroom/sweep/tolerance` give the same numbers for the same
 * settings: the same scenario, the same short renders, the same jobs. No DOM
 * here, so Node tests check it against the command line.
 */
import { HEADROOM_DEFAULTS, type HeadroomOptions } from '../../src/analysis/headroom.ts';
import { defaultMetrics, sourceSignal, type MetricName } from '../../src/analysis/link-metrics.ts';
import { shortenSource } from '../../src/analysis/source-excerpt.ts';
import { LEVEL_AXIS, sweepPoints, type SweepPoint } from '../../src/analysis/sweep-run.ts';
import type { ToleranceSpec } from '../../src/analysis/tolerance.ts';
import { InputError } from '../../src/errors.ts';
import type { Recording } from '../../src/link/chain/source.ts';
import { loadScenario, type ScenarioResolver } from '../../src/scenario/index.ts';
import type { Scenario } from '../../src/scenario/types.ts';

/** The page keeps circuits inline, so a scenario that still names a file cannot be run here. */
const INLINE_ONLY: ScenarioResolver = {
  readText: (name) => {
    throw new InputError(name, 'the circuit inline in the scenario (open the scenario together with its circuit files)', 'a file name');
  },
};

export function loadForMargins(json: unknown, label: string): Scenario {
  return loadScenario(json, INLINE_ONLY, label);
}

/** The test tone of the headroom search and the level sweep. */
export const TONE_HERTZ = 1000;

/** The CLI's `--tone HZ`: a steady tone at the scenario's own level (the length is cut to the render length later). */
export function withTone(scenario: Scenario, hertz = TONE_HERTZ): Scenario {
  return { ...scenario, source: { kind: 'tone', frequencyHertz: hertz, seconds: 1, level: scenario.source.level } };
}

/** Headroom on the tone criteria only (cut-off, THD 1/3/10 %); the speech searches are the command line's. */
export function pageHeadroomOptions(toneSeconds: number): HeadroomOptions {
  return { ...HEADROOM_DEFAULTS, toneHertz: TONE_HERTZ, toneSeconds, speech: false, stoiThreshold: null };
}

export const SWEEP_METRICS: MetricName[] = ['thdPercent', 'cutoffFraction', 'sinadDb', 'farEndDbv'];

export interface LevelSweepSettings {
  fromDbSpl: number;
  toDbSpl: number;
  steps: number;
  /** Length of each tone render. */
  seconds: number;
}

/** `glowtalk sweep FILE --set level=FROM:TO:STEPS --tone 1000 --seconds S`, point by point. */
export function levelSweepPoints(json: unknown, label: string, s: LevelSweepSettings): SweepPoint[] {
  if (!(Number.isInteger(s.steps) && s.steps >= 1 && s.steps <= 200)) throw new InputError('steps', 'a whole number of levels from 1 to 200', `got ${s.steps}`);
  if (!(s.seconds > 0 && s.seconds <= 10)) throw new InputError('render length', 'a length from above 0 to 10 s', `got ${s.seconds}`);
  const axis = { path: LEVEL_AXIS, from: s.fromDbSpl, to: s.toDbSpl, steps: s.steps, log: false };
  return sweepPoints(json, [axis], INLINE_ONLY, label, undefined, s.seconds, (scenario) => withTone(scenario));
}

/** The command line's defaults plus the transistor gain range the page starts with. */
export const PAGE_TOLERANCES: ToleranceSpec = {
  resistorPercent: 5,
  capacitorPercent: 10,
  betaRange: [100, 300],
  photoBetaRange: null,
  ledForwardVolts: 0,
  emitterEfficiencyPercent: 0,
  distribution: 'uniform',
  fixed: [],
};

/** The scenario, recording and metrics `glowtalk tolerance FILE` renders (its default --seconds and --metrics). */
export function toleranceInputs(
  scenario: Scenario,
  recording: Recording | undefined,
): { scenario: Scenario; recording: Recording | undefined; metrics: MetricName[]; seconds: number } {
  const seconds = sourceSignal(scenario) === 'speech' ? 1 : 0.3;
  const short = shortenSource(scenario, recording, seconds);
  return { ...short, metrics: defaultMetrics(scenario), seconds };
}

export interface Histogram {
  /** Bin edges, one more than the counts. */
  edges: Float64Array;
  counts: Float64Array;
}

/**
 * Counts in k equal bins from the lowest to the highest value, with k from
 * Sturges' rule k = ⌈log2 n⌉ + 1 (H. A. Sturges, "The choice of a class
 * interval", J. Am. Stat. Assoc. 21, 1926). The top edge is closed. All values
 * equal: one bin of width 1 around them.
 */
export function histogram(values: readonly number[]): Histogram {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return { edges: new Float64Array(0), counts: new Float64Array(0) };
  let low = Infinity;
  let high = -Infinity;
  for (const v of finite) {
    low = Math.min(low, v);
    high = Math.max(high, v);
  }
  if (high === low) return { edges: Float64Array.of(low - 0.5, low + 0.5), counts: Float64Array.of(finite.length) };
  const k = Math.ceil(Math.log2(finite.length)) + 1;
  const edges = Float64Array.from({ length: k + 1 }, (_, i) => (i === k ? high : low + ((high - low) * i) / k));
  const counts = new Float64Array(k);
  for (const v of finite) counts[Math.min(k - 1, Math.floor(((v - low) / (high - low)) * k))]++;
  return { edges, counts };
}
