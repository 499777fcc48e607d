import { chainResponse, responseScenario, RESPONSE_DEFAULTS, type ResponseOptions } from '../analysis/response.ts';
import { renderScenario } from '../link/chain/chain.ts';
import { settingsSummary } from '../scenario/index.ts';
import { defaultOutDir, numberFlag, progressBar, readScenario, shellWord, writeResults } from './analysis-common.ts';
import { formatNumber, type Table } from './tables.ts';

export interface ResponseFlags {
  from?: string;
  to?: string;
  seconds?: string;
  harmonics?: string;
  spl?: string;
  pointsPerOctave?: string;
  out?: string;
  progress?: boolean;
}

/** `glowtalk response SCENARIO`: magnitude and harmonics vs frequency from one swept sine. */
export async function runResponseCommand(file: string, flags: ResponseFlags, write: (text: string) => void): Promise<void> {
  const input = readScenario(file);
  const d = RESPONSE_DEFAULTS;
  const options: ResponseOptions = {
    startHertz: numberFlag(flags.from, '--from', d.startHertz, (v) => v > 0, 'a start frequency above 0 Hz'),
    endHertz: numberFlag(flags.to, '--to', Math.min(d.endHertz, 0.45 * input.scenario.sampleRateHertz), (v) => v > 0, 'an end frequency above 0 Hz'),
    seconds: numberFlag(flags.seconds, '--seconds', d.seconds, (v) => v > 0 && v <= 60, 'a sweep length from above 0 to 60 s'),
    harmonicCount: numberFlag(flags.harmonics, '--harmonics', d.harmonicCount, (v) => Number.isInteger(v) && v >= 2 && v <= 9, 'a highest harmonic order from 2 to 9'),
    levelDbSpl: flags.spl === undefined ? null : numberFlag(flags.spl, '--spl', 0, (v) => v >= 0 && v <= 160, 'a level from 0 to 160 dB SPL'),
    pointsPerOctave: numberFlag(flags.pointsPerOctave, '--points-per-octave', d.pointsPerOctave, (v) => Number.isInteger(v) && v >= 1 && v <= 96, 'a whole number from 1 to 96'),
  };
  const scenario = responseScenario(input.scenario, options);
  const bar = progressBar(flags.progress, 'response');
  const startedMs = Date.now();
  let result;
  try {
    result = renderScenario(scenario, { onProgress: (fraction) => bar.update(Math.round(fraction * 100), 100) });
  } finally {
    bar.stop();
  }
  const response = chainResponse(scenario, result, options);
  const wallSeconds = (Date.now() - startedMs) / 1000;

  const orders = Array.from({ length: options.harmonicCount - 1 }, (_, i) => i + 2);
  const table: Table = {
    name: 'response',
    columns: [
      { key: 'hertz', unit: 'Hz' },
      { key: 'magnitudeDb', unit: 'dB re 1 V/Pa' },
      { key: 'relativeDb', unit: `dB re ${response.referenceHertz} Hz` },
      { key: 'reliable' },
      ...orders.map((n) => ({ key: `hd${n}Dbc`, unit: 'dBc' })),
    ],
    rows: response.points.map((p) => [p.hertz, p.magnitudeDb, p.relativeDb, p.reliable, ...p.harmonicsDbc]),
  };
  const repeat = ['glowtalk', 'response', file, '--from', String(options.startHertz), '--to', String(options.endHertz), '--seconds', String(options.seconds)];
  repeat.push('--harmonics', String(options.harmonicCount), '--spl', String(response.levelDbSpl), '--points-per-octave', String(options.pointsPerOctave));
  const outDir = flags.out ?? defaultOutDir(file, 'response');
  const report = {
    command: 'response',
    repeat: repeat.map(shellWord).join(' '),
    settings: { scenarioFile: file, options: { ...options, levelDbSpl: response.levelDbSpl }, scenario: settingsSummary(scenario) },
    method: 'exponential swept sine, deconvolved with its inverse filter (Farina 2000); harmonics in dB re the linear response at the excitation frequency',
    referenceHertz: response.referenceHertz,
    referenceDb: response.referenceDb,
    lowerCornerHertz: response.lowerCornerHertz,
    upperCornerHertz: response.upperCornerHertz,
    linearWindowSeconds: response.linearWindowSeconds,
    harmonicWindowSeconds: response.harmonicWindowSeconds,
    lowestReliableHertz: response.lowestReliableHertz,
    lowestReliableHarmonicHertz: response.lowestReliableHarmonicHertz,
    ledCutoff: { count: result.report.led.cutoff.count, fraction: result.report.led.cutoff.fraction },
    wallSeconds,
  };
  const files = writeResults(outDir, 'response', report, [table], input.inputs);

  const at = (hertz: number) => response.points.reduce((best, p) => (Math.abs(Math.log(p.hertz / hertz)) < Math.abs(Math.log(best.hertz / hertz)) ? p : best));
  const ref = at(response.referenceHertz);
  const lines = [
    `Response of ${input.scenario.title ?? file}, microphone pressure to speaker volts: ${options.seconds} s sweep ${options.startHertz}–${options.endHertz} Hz at ${response.levelDbSpl.toFixed(1)} dB SPL.`,
    `Gain at ${response.referenceHertz} Hz: ${response.referenceDb.toFixed(2)} dB re 1 V/Pa; −3 dB points: ${corner(response.lowerCornerHertz, 'below the reliable band')} and ${corner(response.upperCornerHertz, 'above the band')}.`,
    `Harmonics at ${response.referenceHertz} Hz: ${orders.map((n, i) => `HD${n} ${ref.harmonicsDbc[i] === null ? '–' : `${formatNumber(ref.harmonicsDbc[i] as number)} dBc`}`).join(', ')}.`,
  ];
  lines.push(
    `Reliable from ${formatNumber(response.lowestReliableHertz)} Hz (harmonics from ${formatNumber(response.lowestReliableHarmonicHertz)} Hz); ` +
      `a longer --seconds resolves lower frequencies.`,
  );
  for (const hertz of [100, 300, 3000, 10000]) {
    if (hertz > options.startHertz && hertz < options.endHertz) lines.push(`  ${hertz} Hz: ${at(hertz).relativeDb.toFixed(2)} dB re ${response.referenceHertz} Hz`);
  }
  if (result.report.led.cutoff.count > 0) lines.push(`Warning: the LED cut off ${result.report.led.cutoff.count} times during the sweep; lower --spl for a clean linear response.`);
  lines.push(`Rendered in ${wallSeconds.toFixed(1)} s. Files: ${files.join(', ')}`);
  write(`${lines.join('\n')}\n`);
}

function corner(hertz: number | null, otherwise: string): string {
  return hertz === null ? otherwise : `${formatNumber(hertz)} Hz`;
}
