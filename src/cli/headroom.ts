import { HEADROOM_DEFAULTS, findHeadroom, type CriterionResult, type HeadroomOptions, type HeadroomResult } from '../analysis/headroom.ts';
import { targetLevelDbSpl } from '../link/chain/source.ts';
import { settingsSummary } from '../scenario/index.ts';
import { createRunner, defaultOutDir, numberFlag, numberListFlag, progressBar, readScenario, shellWord, writeResults } from './analysis-common.ts';
import type { Table } from './tables.ts';

export interface HeadroomFlags {
  tolerance?: string;
  tone?: string;
  toneSeconds?: string;
  thd?: string;
  stoiBelow?: string;
  speech?: boolean;
  speechSeconds?: string;
  from?: string;
  input?: string;
  workers?: string;
  out?: string;
  progress?: boolean;
}

/** `glowtalk headroom SCENARIO`: levels at which the LED cuts off, THD reaches 1/3/10 %, STOI falls. */
export async function runHeadroom(file: string, flags: HeadroomFlags, write: (text: string) => void): Promise<void> {
  const input = readScenario(file, flags.input);
  const d = HEADROOM_DEFAULTS;
  const options: HeadroomOptions = {
    ...d,
    toleranceDb: numberFlag(flags.tolerance, '--tolerance', d.toleranceDb, (v) => v >= 0.01 && v <= 10, 'a tolerance from 0.01 to 10 dB'),
    toneHertz: numberFlag(flags.tone, '--tone', d.toneHertz, (v) => v >= 20 && v < input.scenario.sampleRateHertz / 2, 'a tone frequency from 20 Hz to below half the sample rate'),
    toneSeconds: numberFlag(flags.toneSeconds, '--tone-seconds', d.toneSeconds, (v) => v >= 0.05 && v <= 10, 'a tone length from 0.05 to 10 s'),
    thdPercents: flags.thd === undefined ? d.thdPercents : numberListFlag(flags.thd, '--thd', (v) => v > 0 && v < 1000, 'THD levels in percent, e.g. 1,3,10'),
    speech: flags.speech !== false,
    stoiThreshold: numberFlag(flags.stoiBelow, '--stoi-below', d.stoiThreshold ?? 0.8, (v) => v > 0 && v < 1, 'a STOI value between 0 and 1'),
    speechSeconds: numberFlag(flags.speechSeconds, '--speech-seconds', d.speechSeconds, (v) => v >= 0.5 && v <= 60, 'a speech length from 0.5 to 60 s'),
    startDbSpl: flags.from === undefined ? null : numberFlag(flags.from, '--from', 0, (v) => v >= d.minDbSpl && v <= d.maxDbSpl, `a level from ${d.minDbSpl} to ${d.maxDbSpl} dB SPL`),
  };
  const runner = createRunner(flags.workers, 4);
  const bar = progressBar(flags.progress, 'headroom');
  const startedMs = Date.now();
  let result: HeadroomResult;
  try {
    // The number of renders is not known ahead: about 4 per criterion plus the bracketing.
    const expected = 5 * (1 + options.thdPercents.length + (options.speech ? 2 : 0));
    result = await findHeadroom(input.scenario, input.recording, runner, options, (_probe, done) => bar.update(done, Math.max(expected, done + 1)));
  } finally {
    bar.stop();
    await runner.close();
  }
  const wallSeconds = (Date.now() - startedMs) / 1000;

  const levelsTable: Table = {
    name: 'headroom',
    columns: [
      { key: 'criterion' },
      { key: 'signal' },
      { key: 'levelDbSpl', unit: 'dB SPL' },
      { key: 'lastPassDbSpl', unit: 'dB SPL' },
      { key: 'firstFailDbSpl', unit: 'dB SPL' },
      { key: 'renders' },
      { key: 'normalTalkerMetres', unit: 'm' },
      { key: 'shoutingTalkerMetres', unit: 'm' },
      { key: 'note' },
    ],
    rows: result.criteria.map((c) => {
      const x = c.crossing;
      const note = x.found ? null : notFound(x);
      return [
        c.label,
        c.signal,
        x.found ? x.levelDb : null,
        x.found ? x.belowDb : null,
        x.found ? x.aboveDb : null,
        x.evaluations,
        c.talkerMetres?.normal ?? null,
        c.talkerMetres?.shout ?? null,
        note,
      ];
    }),
  };
  const metricKeys = [...new Set(result.probes.flatMap((p) => Object.keys(p.values)))];
  const probesTable: Table = {
    name: 'probes',
    columns: [{ key: 'signal' }, { key: 'levelDbSpl', unit: 'dB SPL' }, ...metricKeys.map((key) => ({ key }))],
    rows: result.probes.map((p) => [p.signal, p.levelDbSpl, ...metricKeys.map((k) => p.values[k] ?? null)]),
  };

  const scenarioDbSpl = targetLevelDbSpl(input.scenario.source.level);
  const repeat = ['glowtalk', 'headroom', file, '--tolerance', String(options.toleranceDb), '--tone', String(options.toneHertz), '--tone-seconds', String(options.toneSeconds), '--thd', options.thdPercents.join(',')];
  if (!options.speech) repeat.push('--no-speech');
  else repeat.push('--stoi-below', String(options.stoiThreshold), '--speech-seconds', String(options.speechSeconds));
  if (options.startDbSpl !== null) repeat.push('--from', String(options.startDbSpl));
  if (flags.input) repeat.push('--input', flags.input);
  const outDir = flags.out ?? defaultOutDir(file, 'headroom');
  const report = {
    command: 'headroom',
    repeat: repeat.map(shellWord).join(' '),
    settings: { scenarioFile: file, input: flags.input ?? null, options, speechSource: result.speechSource, scenario: settingsSummary(input.scenario) },
    scenarioLevelDbSpl: scenarioDbSpl,
    startDbSpl: result.startDbSpl,
    cutoffEstimateDbSpl: result.cutoffEstimateDbSpl,
    criteria: result.criteria,
    renders: result.probes.length,
    workers: runner.size,
    wallSeconds,
  };
  const files = writeResults(outDir, 'headroom', report, [levelsTable, probesTable], input.inputs);

  const lines: string[] = [];
  lines.push(`Headroom of ${input.scenario.title ?? file}: ${options.toneHertz} Hz tone (${options.toneSeconds} s renders)${options.speech ? `; speech: ${result.speechSource}` : ''}.`);
  lines.push(`Levels at the microphone, each within ±${options.toleranceDb} dB:`);
  for (const c of result.criteria) {
    const x = c.crossing;
    const name = c.label.padEnd(20);
    if (!x.found) {
      lines.push(`  ${name} ${notFound(x)}`);
      continue;
    }
    const talker = !c.talkerMetres
      ? ''
      : c.signal === 'speech'
        ? ` = a normal talker at ${distance(c.talkerMetres.normal)}, a shout at ${distance(c.talkerMetres.shout)}`
        : ` (rms of a normal talker at ${distance(c.talkerMetres.normal)}, a shout at ${distance(c.talkerMetres.shout)})`;
    lines.push(`  ${name} ${x.levelDb.toFixed(2)} dB SPL${talker}`);
  }
  const cutoff = result.criteria[0].crossing;
  if (cutoff.found) {
    const margin = cutoff.levelDb - scenarioDbSpl;
    lines.push(`The scenario's own level, ${scenarioDbSpl.toFixed(1)} dB SPL, is ${Math.abs(margin).toFixed(1)} dB ${margin >= 0 ? 'below' : 'above'} the LED cut-off of a steady tone.`);
  }
  const speechCutoff = result.criteria.find((c) => c.key === 'cutoffSpeech')?.crossing;
  if (speechCutoff?.found) {
    const margin = speechCutoff.levelDb - scenarioDbSpl;
    lines.push(`With speech the LED cuts off ${Math.abs(margin).toFixed(1)} dB ${margin >= 0 ? 'above' : 'below'} the scenario's level: that is its headroom for talk.`);
  }
  lines.push(`${result.probes.length} renders in ${wallSeconds.toFixed(1)} s on ${runner.size} worker${runner.size === 1 ? '' : 's'}.`);
  lines.push(`Files: ${files.join(', ')}`);
  write(`${lines.join('\n')}\n`);
}

/** Why a criterion has no level. */
function notFound(crossing: CriterionResult['crossing']): string {
  if (crossing.found) return '';
  if ('message' in crossing) return `failed: ${crossing.message}`;
  const d = HEADROOM_DEFAULTS;
  return crossing.reason === 'never' ? `not reached up to ${d.maxDbSpl} dB SPL` : `already met at ${d.minDbSpl} dB SPL`;
}

function distance(metres: number): string {
  return metres < 1 ? `${(metres * 100).toPrecision(2)} cm` : `${metres.toPrecision(3)} m`;
}
