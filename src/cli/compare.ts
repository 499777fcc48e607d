import * as path from 'node:path';
import { COMPARE_DEFAULTS, compareRecordings } from '../analysis/compare.ts';
import { decodeWav } from '../audio/wav-read.ts';
import { defaultOutDir, numberFlag, shellWord, writeResults } from './analysis-common.ts';
import { readFileBytes } from './files.ts';
import { formatNumber, toText, type Table } from './tables.ts';

export interface CompareFlags {
  maxLag?: string;
  out?: string;
}

/** `glowtalk compare REFERENCE.wav OTHER.wav`: align, then STOI, SNRs, levels and third-octave differences. */
export function runCompareCommand(referenceFile: string, otherFile: string, flags: CompareFlags, write: (text: string) => void): void {
  const maxLagSeconds = numberFlag(flags.maxLag, '--max-lag', COMPARE_DEFAULTS.maxLagSeconds, (v) => v >= 0 && v <= 10, 'a largest delay from 0 to 10 s');
  const reference = decodeWav(readFileBytes(referenceFile, 'WAV'), referenceFile);
  const other = decodeWav(readFileBytes(otherFile, 'WAV'), otherFile);
  const result = compareRecordings(
    { samples: reference.mono, rateHertz: reference.sampleRateHertz },
    { samples: other.mono, rateHertz: other.sampleRateHertz },
    { ...COMPARE_DEFAULTS, maxLagSeconds },
  );
  const table: Table = {
    name: 'bands',
    columns: [
      { key: 'centreHertz', unit: 'Hz' },
      { key: 'referenceDb', unit: 'dBFS' },
      { key: 'otherDb', unit: 'dBFS' },
      { key: 'differenceDb', unit: 'dB' },
      { key: 'matchedDifferenceDb', unit: 'dB' },
    ],
    rows: result.bands.map((b) => [b.centreHertz, b.referenceDb, b.otherDb, b.differenceDb, b.matchedDifferenceDb]),
  };
  const outDir = flags.out ?? defaultOutDir(otherFile, 'compare');
  const report = {
    command: 'compare',
    repeat: ['glowtalk', 'compare', referenceFile, otherFile, '--max-lag', String(maxLagSeconds)].map(shellWord).join(' '),
    settings: {
      referenceFile,
      otherFile,
      maxLagSeconds,
      bands: 'one-third octave, IEC 61260-1 base-ten mid-band frequencies 1000·10^(x/10) Hz',
      stoi: 'Taal et al. 2011, on the aligned, level-matched other',
      segmentalSnr: '20 ms frames, clamped to [−10, 35] dB, active frames only',
    },
    result: { ...result, bands: undefined },
  };
  const files = writeResults(outDir, 'compare', report, [table], [referenceFile, otherFile]);
  const value = (v: number | null, unit: string) => (v === null ? '–' : `${formatNumber(v)}${unit}`);
  // Only bands within 40 dB of the reference's loudest count: near-empty bands hold noise, not a change of shape.
  const loudest = Math.max(...result.bands.map((b) => b.referenceDb));
  const worst = result.bands.filter((b) => b.referenceDb > loudest - 40).sort((a, b) => Math.abs(b.matchedDifferenceDb) - Math.abs(a.matchedDifferenceDb))[0];
  const lines = [
    `Comparing ${path.basename(otherFile)} with ${path.basename(referenceFile)} at ${result.rateHertz} Hz${result.otherResampledFromHertz ? ` (resampled from ${result.otherResampledFromHertz} Hz)` : ''}.`,
    `Delay ${(result.lagSeconds * 1000).toFixed(2)} ms; level ${result.levelDifferenceDb >= 0 ? '+' : ''}${result.levelDifferenceDb.toFixed(2)} dB (rms, ` +
      `${result.referenceRmsDb.toFixed(1)} → ${result.otherRmsDb.toFixed(1)} dBFS); matched with ${result.matchGainDb.toFixed(2)} dB${result.inverted ? ', polarity inverted' : ''}.`,
    `STOI ${value(result.stoi, '')}; segmental SNR ${value(result.segmentalSnrDb, ' dB')}; SNR by coherence ${value(result.snrDb, ' dB')}.`,
  ];
  if (worst) lines.push(`Largest third-octave change once level-matched (bands within 40 dB of the loudest): ${worst.matchedDifferenceDb.toFixed(2)} dB at ${formatNumber(worst.centreHertz)} Hz.`);
  lines.push(toText({ ...table, rows: table.rows.filter((_, i) => i % 3 === 0) }).trimEnd().replace(/\n… .*$/, ''));
  lines.push('(every third band shown; all in bands.csv)');
  for (const note of result.notes) lines.push(`Note: ${note}`);
  lines.push(`Files: ${files.join(', ')}`);
  write(`${lines.join('\n')}\n`);
}
