import { checkMetricsApply, defaultMetrics, LINK_METRICS, parseMetricList, sourceSignal } from '../analysis/link-metrics.ts';
import { LEVEL_AXIS, parseSweepAxis, runSweep, sweepPoints, type SweepRow } from '../analysis/sweep-run.ts';
import { InputError } from '../errors.ts';
import { settingsSummary } from '../scenario/index.ts';
import type { Scenario } from '../scenario/types.ts';
import { createRunner, defaultOutDir, excerptFlag, progressBar, readScenario, shellWord, withLevelFlag, withToneFlag, writeResults, repeatSharedFlags } from './analysis-common.ts';
import { toText, type Table } from './tables.ts';

export interface SweepFlags {
  set?: string[];
  log?: boolean;
  metrics?: string;
  seconds?: string;
  spl?: string;
  tone?: string;
  input?: string;
  workers?: string;
  out?: string;
  progress?: boolean;
}

/** `glowtalk sweep SCENARIO --set PATH=FROM:TO:STEPS …`: one render per grid point, metrics per row. */
export async function runSweepCommand(file: string, flags: SweepFlags, write: (text: string) => void): Promise<void> {
  if (!flags.set || flags.set.length === 0) throw new InputError('--set', 'at least one PATH=FROM:TO:STEPS, e.g. --set source.level.dbSpl=60:100:9', 'none given');
  const axes = flags.set.map((text) => parseSweepAxis(text, flags.log === true));
  const input = readScenario(file, flags.input);
  const adjust = (s: Scenario) => withToneFlag(withLevelFlag(s, flags.spl), flags.tone);
  const nominal = adjust(input.scenario);
  const metrics = flags.metrics === undefined ? defaultMetrics(nominal) : parseMetricList(flags.metrics, '--metrics');
  checkMetricsApply(metrics, nominal, '--metrics');
  const seconds = excerptFlag(flags.seconds, sourceSignal(nominal) === 'speech' ? 1 : 0.3);
  const json = flags.input === undefined ? input.json : withRecordingJson(input.json, flags.input);
  const points = sweepPoints(json, axes, input.resolve, file, input.recording, seconds, adjust);

  const runner = createRunner(flags.workers, points.length);
  const bar = progressBar(flags.progress, 'sweep');
  const startedMs = Date.now();
  let rows: SweepRow[];
  try {
    rows = await runSweep(points, metrics, runner, (done, total) => bar.update(done, total));
  } finally {
    bar.stop();
    await runner.close();
  }
  const wallSeconds = (Date.now() - startedMs) / 1000;

  // The level each point ran at, unless it is the same everywhere or an axis shows it already.
  const levelIsAxis = axes.some((_, i) => rows.every((r) => r.values[i] === r.levelDbSpl));
  const levelColumn = !levelIsAxis && rows.some((r) => r.levelDbSpl !== rows[0].levelDbSpl);
  const table: Table = {
    name: 'sweep',
    columns: [
      ...axes.map((a) => ({ key: a.path, unit: a.path === LEVEL_AXIS ? 'dB SPL' : undefined })),
      ...(levelColumn ? [{ key: 'levelDbSpl', unit: 'dB SPL' }] : []),
      ...metrics.map((m) => ({ key: m, unit: LINK_METRICS[m].unit })),
      { key: 'error' },
    ],
    rows: rows.map((row) => [
      ...row.values,
      ...(levelColumn ? [row.levelDbSpl] : []),
      ...metrics.map((m) => (row.outcome.ok ? (row.outcome.result.metrics.values[m] ?? null) : null)),
      row.outcome.ok ? null : row.outcome.error,
    ]),
  };
  const failed = rows.filter((r) => !r.outcome.ok).length;
  const repeat = ['glowtalk', 'sweep', file, ...axes.flatMap((a) => ['--set', `${a.path}=${a.from}:${a.to}:${a.steps}:${a.log ? 'log' : 'lin'}`])];
  repeatSharedFlags(repeat, metrics, seconds, flags);
  const outDir = flags.out ?? defaultOutDir(file, 'sweep');
  const report = {
    command: 'sweep',
    repeat: repeat.map(shellWord).join(' '),
    settings: {
      scenarioFile: file,
      input: flags.input ?? null,
      axes,
      metrics: metrics.map((m) => ({ name: m, ...LINK_METRICS[m] })),
      excerptSeconds: seconds,
      levelOverrideDbSpl: flags.spl ?? null,
      toneHertz: flags.tone ?? null,
      scenario: settingsSummary(nominal),
    },
    points: rows.length,
    failedPoints: failed,
    notes: rows.flatMap((r, i) => (r.outcome.ok ? r.outcome.result.metrics.notes.map((n) => `point ${i}: ${n}`) : [])),
    workers: runner.size,
    wallSeconds,
  };
  const files = writeResults(outDir, 'sweep', report, [table], input.inputs);
  const lines = [
    `Sweep of ${nominal.title ?? file}: ${rows.length} points (${axes.map((a) => `${a.path} ${a.from} to ${a.to}, ${a.steps} ${a.log ? 'log' : 'linear'} steps`).join('; ')}), ` +
      `${seconds === null ? 'whole source' : `${seconds} s renders`}.`,
    toText({ ...table, columns: table.columns.slice(0, failed > 0 ? undefined : -1), rows: table.rows.map((r) => (failed > 0 ? r : r.slice(0, -1))) }, 30).trimEnd(),
  ];
  if (failed > 0) lines.push(`${failed} point${failed === 1 ? '' : 's'} failed; the error column says why.`);
  lines.push(`${rows.length} renders in ${wallSeconds.toFixed(1)} s on ${runner.size} worker${runner.size === 1 ? '' : 's'}.`);
  lines.push(`Files: ${files.join(', ')}`);
  write(`${lines.join('\n')}\n`);
}

/** The scenario JSON with its source replaced by the recording given with --input (same level). */
function withRecordingJson(json: unknown, wav: string): unknown {
  const object = json as { source: { level: unknown } };
  return { ...object, source: { kind: 'recording', file: wav, level: object.source.level } };
}
