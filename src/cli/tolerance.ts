import { checkMetricsApply, defaultMetrics, LINK_METRICS, parseMetricList, sourceSignal } from '../analysis/link-metrics.ts';
import { shortenSource } from '../analysis/source-excerpt.ts';
import type { ToleranceSpec } from '../analysis/tolerance.ts';
import { runTolerance, type ToleranceResult } from '../analysis/tolerance-run.ts';
import { InputError } from '../errors.ts';
import { settingsSummary } from '../scenario/index.ts';
import { readEngineering } from '../units/engineering.ts';
import { createRunner, defaultOutDir, excerptFlag, numberFlag, progressBar, readScenario, shellWord, withLevelFlag, withToneFlag, writeResults, repeatSharedFlags } from './analysis-common.ts';
import { formatNumber, toText, type Table } from './tables.ts';

export interface ToleranceFlags {
  runs?: string;
  seed?: string;
  corners?: boolean;
  resistors?: string;
  capacitors?: string;
  beta?: string;
  photoBeta?: string;
  ledVf?: string;
  efficiency?: string;
  distribution?: string;
  fixed?: string;
  metrics?: string;
  seconds?: string;
  spl?: string;
  tone?: string;
  input?: string;
  workers?: string;
  out?: string;
  progress?: boolean;
}

function rangeFlag(text: string | undefined, flag: string): [number, number] | null {
  if (text === undefined) return null;
  const parts = text.split(':');
  const expected = 'a current-gain range MIN:MAX, e.g. 100:300';
  if (parts.length !== 2) throw new InputError(flag, expected, `got "${text}"`);
  const [low, high] = parts.map((part) => readEngineering(part.trim()));
  if (!low.ok || !high.ok || !(low.value > 0 && high.value >= low.value && high.value <= 1e5)) throw new InputError(flag, expected, `got "${text}"`);
  return [low.value, high.value];
}

/** `glowtalk tolerance SCENARIO --runs N --seed S [--corners]`: Monte Carlo over the declared part tolerances. */
export async function runToleranceCommand(file: string, flags: ToleranceFlags, write: (text: string) => void): Promise<void> {
  const runs = numberFlag(flags.runs, '--runs', 100, (v) => Number.isInteger(v) && v >= 0 && v <= 100000, 'a whole number of runs from 0 to 100000');
  const seed = numberFlag(flags.seed, '--seed', 1, (v) => Number.isInteger(v) && v >= 0 && v <= 0xffffffff, 'a whole-number seed from 0 to 4294967295');
  const distribution = flags.distribution ?? 'uniform';
  if (distribution !== 'uniform' && distribution !== 'normal') throw new InputError('--distribution', '"uniform" or "normal"', `got "${distribution}"`);
  const percent = (text: string | undefined, flag: string, fallback: number) => numberFlag(text, flag, fallback, (v) => v >= 0 && v < 100, 'a tolerance in percent from 0 to below 100');
  const spec: ToleranceSpec = {
    // E24 resistors are commonly ±5 %, ceramic and electrolytic capacitors ±10 % or wider (common practice, no source).
    resistorPercent: percent(flags.resistors, '--resistors', 5),
    capacitorPercent: percent(flags.capacitors, '--capacitors', 10),
    betaRange: rangeFlag(flags.beta, '--beta'),
    photoBetaRange: rangeFlag(flags.photoBeta, '--photo-beta'),
    ledForwardVolts: numberFlag(flags.ledVf, '--led-vf', 0, (v) => v >= 0 && v <= 1, 'a forward-voltage spread from 0 to 1 V'),
    emitterEfficiencyPercent: percent(flags.efficiency, '--efficiency', 0),
    distribution,
    fixed: flags.fixed === undefined ? [] : flags.fixed.split(',').map((s) => s.trim()).filter((s) => s !== ''),
  };
  if (runs === 0 && !flags.corners) throw new InputError('--runs', 'at least 1 run, or --corners', 'got 0 runs and no corners');

  const input = readScenario(file, flags.input);
  const nominal = withToneFlag(withLevelFlag(input.scenario, flags.spl), flags.tone);
  const metrics = flags.metrics === undefined ? defaultMetrics(nominal) : parseMetricList(flags.metrics, '--metrics');
  checkMetricsApply(metrics, nominal, '--metrics');
  const seconds = excerptFlag(flags.seconds, sourceSignal(nominal) === 'speech' ? 1 : 0.3);
  const short = shortenSource(nominal, input.recording, seconds);

  const total = runs + 1 + (flags.corners ? 2 : 0);
  const runner = createRunner(flags.workers, total);
  const bar = progressBar(flags.progress, 'tolerance');
  const startedMs = Date.now();
  let result: ToleranceResult;
  try {
    result = await runTolerance(short.scenario, short.recording, spec, { runs, seed, corners: flags.corners === true }, metrics, runner, (done, all) => bar.update(done, all));
  } finally {
    bar.stop();
    await runner.close();
  }
  const wallSeconds = (Date.now() - startedMs) / 1000;

  const p = result.parameters;
  const runsTable: Table = {
    name: 'runs',
    columns: [{ key: 'run' }, ...p.map((q) => ({ key: q.key, unit: q.unit })), ...metrics.map((m) => ({ key: m, unit: LINK_METRICS[m].unit })), { key: 'error' }],
    rows: result.rows.map((row) => [
      row.run.label,
      ...row.run.values,
      ...metrics.map((m) => (row.outcome.ok ? (row.outcome.result.metrics.values[m] ?? null) : null)),
      row.outcome.ok ? null : row.outcome.error,
    ]),
  };
  const spreadTable: Table = {
    name: 'spread',
    columns: ['metric', 'count', 'min', 'p5', 'p25', 'median', 'p75', 'p95', 'max', 'mean', 'standardDeviation'].map((key) => ({ key })),
    rows: result.spreads.map(({ metric, spread: s }) =>
      s ? [metric, s.count, s.min, s.p5, s.p25, s.median, s.p75, s.p95, s.max, s.mean, s.standardDeviation] : [metric, 0, null, null, null, null, null, null, null, null, null],
    ),
  };
  const parametersTable: Table = {
    name: 'parameters',
    columns: [{ key: 'parameter' }, { key: 'unit' }, { key: 'nominal' }, { key: 'low' }, { key: 'high' }],
    rows: p.map((q) => [q.key, q.unit, q.nominal, q.low, q.high]),
  };

  const repeat = ['glowtalk', 'tolerance', file, '--runs', String(runs), '--seed', String(seed)];
  if (flags.corners) repeat.push('--corners');
  repeat.push('--resistors', String(spec.resistorPercent), '--capacitors', String(spec.capacitorPercent));
  if (spec.betaRange) repeat.push('--beta', spec.betaRange.join(':'));
  if (spec.photoBetaRange) repeat.push('--photo-beta', spec.photoBetaRange.join(':'));
  repeat.push('--led-vf', String(spec.ledForwardVolts), '--efficiency', String(spec.emitterEfficiencyPercent), '--distribution', spec.distribution);
  if (spec.fixed.length > 0) repeat.push('--fixed', spec.fixed.join(','));
  repeatSharedFlags(repeat, metrics, seconds, flags);
  const outDir = flags.out ?? defaultOutDir(file, 'tolerance');
  const report = {
    command: 'tolerance',
    repeat: repeat.map(shellWord).join(' '),
    settings: {
      scenarioFile: file,
      input: flags.input ?? null,
      runs,
      seed,
      corners: flags.corners === true,
      tolerances: spec,
      ledForwardVoltageMethod: 'saturation current scaled by exp(−ΔV/(n·VT)) at the circuit temperature',
      metrics: metrics.map((m) => ({ name: m, ...LINK_METRICS[m] })),
      excerptSeconds: seconds,
      levelOverrideDbSpl: flags.spl ?? null,
      toneHertz: flags.tone ?? null,
      scenario: settingsSummary(nominal),
    },
    parameters: p,
    spreadOver: 'Monte Carlo runs only (nominal and corners excluded)',
    worst: result.worst,
    sensitivities: result.sensitivities,
    failedRuns: result.failedRuns,
    workers: runner.size,
    wallSeconds,
  };
  const files = writeResults(outDir, 'tolerance', report, [runsTable, spreadTable, parametersTable], input.inputs);

  const lines: string[] = [];
  lines.push(
    `Tolerance run of ${nominal.title ?? file}: ${runs} Monte Carlo runs (seed ${seed}, ${spec.distribution})${flags.corners ? ' + corners' : ''}, ` +
      `${p.length} parameters varied, ${seconds === null ? 'whole source' : `${seconds} s renders`}.`,
  );
  lines.push(
    `Tolerances: resistors ±${spec.resistorPercent} %, capacitors ±${spec.capacitorPercent} %, ` +
      `transistor gain ${spec.betaRange ? spec.betaRange.join('–') : 'as modelled'}, phototransistor gain ${spec.photoBetaRange ? spec.photoBetaRange.join('–') : 'as modelled'}, ` +
      `LED forward voltage ±${spec.ledForwardVolts} V, emitter efficiency ±${spec.emitterEfficiencyPercent} %.`,
  );
  const nominalRow = result.rows[0];
  if (nominalRow.outcome.ok) {
    const values = nominalRow.outcome.result.metrics.values;
    lines.push(`Nominal: ${metrics.map((m) => `${m} ${values[m] === null ? '–' : formatNumber(values[m] as number)}`).join(', ')}.`);
  }
  if (runs > 0) lines.push(`Spread over the Monte Carlo runs:\n${toText({ ...spreadTable, columns: spreadTable.columns.slice(0, 9), rows: spreadTable.rows.map((r) => r.slice(0, 9)) }).trimEnd()}`);
  lines.push('Worst cases, with the parts that matter most (correlation r over the runs) where they were in their range (±1 = an end):');
  for (const w of result.worst) {
    const drivers = w.drivers.map((d) => `${d.key} at ${d.offset >= 0 ? '+' : ''}${d.offset.toFixed(2)}, r ${d.correlation.toFixed(2)}`).join('; ');
    const why = w.label === 'low' || w.label === 'high' ? ` (every part at its ${w.label} end)` : drivers ? ` (${drivers})` : '';
    lines.push(`  ${w.extreme} ${w.metric} ${formatNumber(w.value)} in ${w.label}${why}`);
  }
  if (result.failedRuns > 0) lines.push(`${result.failedRuns} runs failed; the error column of runs.csv says why.`);
  lines.push(`${result.rows.length} renders in ${wallSeconds.toFixed(1)} s on ${runner.size} worker${runner.size === 1 ? '' : 's'}.`);
  lines.push(`Files: ${files.join(', ')}`);
  write(`${lines.join('\n')}\n`);
}
