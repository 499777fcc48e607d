/**
 * Parameter sweeps: any numeric setting of a scenario file, addressed by its
 * path (scenario/set-value.ts), or the talker level itself ("level", in dB
 * SPL), stepped over a linear or logarithmic range;
 * several axes make a grid (the first axis changes slowest). Every point is
 * loaded and checked before anything renders, so a value out of range stops
 * the sweep at once with the path and value named. Grid values come from the
 * integer step index (never by repeated addition), so they repeat exactly.
 */
import { InputError } from '../errors.ts';
import { targetLevelDbSpl, type Recording } from '../link/chain/source.ts';
import { loadScenario, setScenarioValue, type ScenarioResolver } from '../scenario/index.ts';
import type { Scenario } from '../scenario/types.ts';
import { readEngineering } from '../units/engineering.ts';
import { runAll, type JobOutcome, type JobRunner, type RenderJob } from '../worker/jobs.ts';
import type { MetricName } from './link-metrics.ts';
import { shortenSource } from './source-excerpt.ts';

export interface SweepAxis {
  path: string;
  from: number;
  to: number;
  steps: number;
  log: boolean;
}

/** Grid points are capped so a typo (1:100:100000) cannot start a week of renders. */
export const MAX_SWEEP_POINTS = 10000;

const AXIS_EXPECTED = 'PATH=FROM:TO:STEPS, e.g. lightPath.channel.length=1:20:8 (append :log for a logarithmic axis)';

/** Reads `PATH=FROM:TO:STEPS[:log|:lin]`; `logByDefault` is the --log flag. */
export function parseSweepAxis(text: string, logByDefault: boolean): SweepAxis {
  const where = `--set ${text}`;
  const equals = text.lastIndexOf('=');
  if (equals <= 0) throw new InputError(where, AXIS_EXPECTED, 'no "=" after the path');
  const path = text.slice(0, equals).trim();
  const fields = text.slice(equals + 1).split(':');
  if (fields.length < 3 || fields.length > 4) throw new InputError(where, AXIS_EXPECTED, `got ${fields.length} fields after "="`);
  const number = (field: string, name: string): number => {
    const read = readEngineering(field.trim());
    if (!read.ok) throw new InputError(`${where} (${name})`, 'a number or engineering notation such as 4.7k', `got ${read.got}`);
    return read.value;
  };
  const from = number(fields[0], 'FROM');
  const to = number(fields[1], 'TO');
  const steps = Number(fields[2]);
  if (!Number.isInteger(steps) || steps < 1) throw new InputError(`${where} (STEPS)`, 'a whole number of steps, at least 1', `got "${fields[2]}"`);
  let log = logByDefault;
  if (fields.length === 4) {
    const scale = fields[3].trim();
    if (scale !== 'log' && scale !== 'lin') throw new InputError(where, '"log" or "lin" as the fourth field', `got "${scale}"`);
    log = scale === 'log';
  }
  if (log && !(from > 0 && to > 0)) throw new InputError(where, 'FROM and TO above 0 for a logarithmic axis', `got ${from} and ${to}`);
  return { path, from, to, steps, log };
}

/** The values of one axis: from + (to − from)·i/(n − 1), or from·(to/from)^(i/(n − 1)) on a log axis. */
export function axisValues(axis: SweepAxis): number[] {
  const n = axis.steps;
  if (n === 1) return [axis.from];
  return Array.from({ length: n }, (_, i) => {
    if (i === n - 1) return axis.to;
    const t = i / (n - 1);
    return axis.log ? axis.from * (axis.to / axis.from) ** t : axis.from + (axis.to - axis.from) * t;
  });
}

/** Every combination of axis values, the first axis slowest. */
export function sweepGrid(axes: readonly SweepAxis[]): number[][] {
  if (axes.length === 0) throw new InputError('--set', `at least one axis: ${AXIS_EXPECTED}`, 'got none');
  const count = axes.reduce((product, axis) => product * axis.steps, 1);
  if (count > MAX_SWEEP_POINTS) throw new InputError('--set', `at most ${MAX_SWEEP_POINTS} points in all`, `the axes make ${count}`);
  let grid: number[][] = [[]];
  for (const axis of axes) {
    const values = axisValues(axis);
    grid = grid.flatMap((point) => values.map((value) => [...point, value]));
  }
  return grid;
}

/**
 * Not a path in the file: the talker level at the microphone in dB SPL,
 * however the scenario states it (dB SPL or vocal effort and distance).
 */
export const LEVEL_AXIS = 'level';

export interface SweepPoint {
  values: number[];
  scenario: Scenario;
  recording: Recording | undefined;
  /** Talker level at the microphone at this point, dB SPL. */
  levelDbSpl: number;
}

/**
 * Loads the scenario at every grid point. `adjust` applies command-line
 * overrides (level, excerpt) after loading, the same for every point.
 */
export function sweepPoints(
  json: unknown,
  axes: readonly SweepAxis[],
  resolve: ScenarioResolver,
  label: string,
  recording: Recording | undefined,
  excerptSeconds: number | null,
  adjust: (scenario: Scenario) => Scenario = (s) => s,
): SweepPoint[] {
  return sweepGrid(axes).map((values) => {
    let changed = json;
    let levelDbSpl: number | null = null;
    values.forEach((value, i) => {
      if (axes[i].path === LEVEL_AXIS) levelDbSpl = value;
      else changed = setScenarioValue(changed, axes[i].path, value, resolve);
    });
    let scenario: Scenario;
    try {
      scenario = adjust(loadScenario(changed, resolve, label));
      if (levelDbSpl !== null) {
        if (!(levelDbSpl >= 0 && levelDbSpl <= 160)) throw new InputError(LEVEL_AXIS, 'a level from 0 to 160 dB SPL', `got ${levelDbSpl}`);
        scenario = { ...scenario, source: { ...scenario.source, level: { kind: 'spl', dbSpl: levelDbSpl } } };
      }
    } catch (error) {
      if (error instanceof InputError) {
        const at = axes.map((axis, i) => `${axis.path}=${values[i]}`).join(', ');
        error.message = `${error.message} (at sweep point ${at})`;
      }
      throw error;
    }
    return { values, levelDbSpl: targetLevelDbSpl(scenario.source.level), ...shortenSource(scenario, recording, excerptSeconds) };
  });
}

export interface SweepRow {
  values: number[];
  levelDbSpl: number;
  outcome: JobOutcome;
}

export async function runSweep(
  points: readonly SweepPoint[],
  metrics: MetricName[],
  runner: JobRunner,
  onDone?: (done: number, total: number) => void,
): Promise<SweepRow[]> {
  const jobs: RenderJob[] = points.map((p) => ({ scenario: p.scenario, recording: p.recording, metrics }));
  const outcomes = await runAll(jobs, runner, onDone);
  return points.map((p, i) => ({ values: p.values, levelDbSpl: p.levelDbSpl, outcome: outcomes[i] }));
}
