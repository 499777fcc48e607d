import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { encodeWav } from '../../src/audio/wav-write.ts';
import { speechLike } from '../../src/audio/signals/speech-like.ts';
import { runCli } from '../helpers/cli.ts';
import { linkJson } from '../analysis/link-fixture.ts';

/** The analysis test link written as a real scenario file in a fresh folder. */
function writeScenario(name = 'link.json'): { dir: string; file: string } {
  const dir = mkdtempSync(join(tmpdir(), 'glowtalk-analysis-'));
  const file = join(dir, name);
  writeFileSync(file, JSON.stringify(linkJson(), null, 2));
  return { dir, file };
}

const csvRows = (file: string) => readFileSync(file, 'utf8').trimEnd().split('\r\n');

describe('glowtalk sweep', () => {
  it('steps the level on 2 workers, prints the table and writes sweep.csv and sweep.json with its settings', async () => {
    const { dir, file } = writeScenario();
    const out = join(dir, 'sweep');
    const run = await runCli(['sweep', file, '--set', 'source.level.dbSpl=80:100:2', '--metrics', 'thdPercent,cutoffFraction', '--seconds', '0.1', '--workers', '2', '--out', out]);
    expect(run.err).toBe('');
    expect(run.code).toBe(0);
    expect(run.out).toMatch(/2 points \(source\.level\.dbSpl 80 to 100, 2 linear steps\), 0\.1 s renders/);
    expect(run.out).toMatch(/2 renders in .* on 2 workers/);
    const rows = csvRows(join(out, 'sweep.csv'));
    expect(rows[0]).toBe('source.level.dbSpl,thdPercent,cutoffFraction,error');
    expect(rows.slice(1).map((r) => r.split(',')[0])).toEqual(['80', '100']);
    const report = JSON.parse(readFileSync(join(out, 'sweep.json'), 'utf8'));
    expect(report.repeat).toBe(`glowtalk sweep ${file} --set source.level.dbSpl=80:100:2:lin --metrics thdPercent,cutoffFraction --seconds 0.1`);
    expect(report.settings.scenario.title).toBe('analysis test link');
    expect(report.tables[0].rows[1].cutoffFraction).toBeGreaterThan(0);
  });

  it('refuses bad flags with one line naming the flag', async () => {
    const { file } = writeScenario();
    const cases: Array<[string[], RegExp]> = [
      [['sweep', file], /--set: none given; expected at least one PATH=FROM:TO:STEPS/],
      [['sweep', file, '--set', 'source.level.dbSpl=1:2:3', '--metrics', 'loudness'], /--metrics: got "loudness"; expected metric names among/],
      [['sweep', file, '--set', 'source.level.dbSpl=60:90:3', '--metrics', 'stoi'], /--metrics: got stoi; expected metrics that suit a tone source/],
      [['tolerance', file, '--beta', '300:100'], /--beta: got "300:100"; expected a current-gain range MIN:MAX/],
      [['tolerance', file, '--runs', '-1'], /--runs: got "-1"/],
      [['response', file, '--from', '0'], /--from: got "0"; expected a start frequency above 0 Hz/],
      [['headroom', file, '--tolerance', '0'], /--tolerance: got "0"/],
    ];
    for (const [args, message] of cases) {
      const run = await runCli(args);
      expect(run.code).toBe(2);
      expect(run.err).toMatch(message);
      expect(run.err.trim().split('\n')).toHaveLength(1);
    }
  });

  it('never overwrites an input: a report named like the scenario is refused', async () => {
    const { dir, file } = writeScenario('sweep.json');
    const before = readFileSync(file, 'utf8');
    const run = await runCli(['sweep', file, '--set', 'source.level.dbSpl=80:80:1', '--seconds', '0.1', '--workers', '0', '--out', dir]);
    expect(run.code).toBe(2);
    expect(run.err).toMatch(/it would overwrite an input/);
    expect(readFileSync(file, 'utf8')).toBe(before);
  });
});

describe('glowtalk tolerance', () => {
  it('writes identical runs and spread tables on 1 and on 2 workers for the same seed', async () => {
    const { dir, file } = writeScenario();
    const args = (workers: string) => ['tolerance', file, '--runs', '2', '--seed', '11', '--corners', '--beta', '100:300', '--led-vf', '0.05', '--seconds', '0.1', '--workers', workers, '--out', join(dir, workers)];
    const one = await runCli(args('1'));
    const two = await runCli(args('2'));
    expect([one.code, two.code]).toEqual([0, 0]);
    expect(two.out).toMatch(/Tolerance run of analysis test link: 2 Monte Carlo runs \(seed 11, uniform\) \+ corners/);
    for (const table of ['runs.csv', 'spread.csv', 'parameters.csv']) {
      expect(readFileSync(join(dir, '2', table), 'utf8')).toBe(readFileSync(join(dir, '1', table), 'utf8'));
    }
    expect(csvRows(join(dir, '1', 'runs.csv')).map((r) => r.split(',')[0])).toEqual(['run', 'nominal', 'low', 'high', 'run 0', 'run 1']);
    const report = JSON.parse(readFileSync(join(dir, '1', 'tolerance.json'), 'utf8'));
    expect(report.settings.seed).toBe(11);
    expect(report.settings.tolerances.betaRange).toEqual([100, 300]);
  });
});

describe('glowtalk headroom, response and compare', () => {
  it('headroom prints the LED cut-off level in dB SPL and the THD level, and writes its tables', async () => {
    const { dir, file } = writeScenario();
    const run = await runCli(['headroom', file, '--no-speech', '--thd', '3', '--tone-seconds', '0.1', '--workers', '0', '--out', join(dir, 'h')]);
    expect(run.code).toBe(0);
    expect(run.out).toMatch(/LED cut-off\s+\d+\.\d\d dB SPL/);
    expect(run.out).toMatch(/THD 3 %\s+\d+\.\d\d dB SPL/);
    expect(readdirSync(join(dir, 'h')).sort()).toEqual(['headroom.csv', 'headroom.json', 'probes.csv']);
  });

  it('response writes magnitude and harmonics per frequency, 1 kHz among the rows', async () => {
    const { dir, file } = writeScenario();
    const run = await runCli(['response', file, '--spl', '60', '--seconds', '0.3', '--points-per-octave', '3', '--no-progress', '--out', join(dir, 'r')]);
    expect(run.code).toBe(0);
    expect(run.out).toMatch(/Gain at 1000 Hz: -?\d+\.\d\d dB re 1 V\/Pa/);
    const rows = csvRows(join(dir, 'r', 'response.csv'));
    expect(rows[0]).toBe('hertz,magnitudeDb,relativeDb,reliable,hd2Dbc,hd3Dbc');
    expect(rows.some((r) => r.startsWith('1000,'))).toBe(true);
  });

  it('compare aligns two real WAV files and reports delay, level, STOI and bands', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'glowtalk-compare-'));
    const speech = speechLike({ sampleRateHertz: 16000, seconds: 1.5, rmsAmplitude: 0.1, seed: 4 });
    const delayed = Float64Array.from({ length: speech.length }, (_, i) => (i >= 160 ? 0.25 * speech[i - 160] : 0));
    writeFileSync(join(dir, 'ref.wav'), encodeWav(speech, 16000, 'float32').bytes);
    writeFileSync(join(dir, 'other.wav'), encodeWav(delayed, 16000, 'float32').bytes);
    const run = await runCli(['compare', join(dir, 'ref.wav'), join(dir, 'other.wav'), '--out', join(dir, 'c')]);
    expect(run.code).toBe(0);
    expect(run.out).toMatch(/Delay 10\.00 ms; level -12\.0\d dB/);
    expect(run.out).toMatch(/STOI 0\.99\d*|STOI 1/);
    expect(csvRows(join(dir, 'c', 'bands.csv'))[0]).toBe('centreHertz,referenceDb,otherDb,differenceDb,matchedDifferenceDb');
  });
});

describe('the launcher bin/glowtalk.mjs', () => {
  it('runs a sweep on 2 worker threads in a separate Node process (workers load the TypeScript themselves)', () => {
    const { dir, file } = writeScenario();
    const out = execFileSync(process.execPath, ['bin/glowtalk.mjs', 'sweep', file, '--set', 'lightPath.channel.length=1:3:2', '--seconds', '0.1', '--workers', '2', '--out', join(dir, 's')], {
      encoding: 'utf8',
      timeout: 60_000,
    });
    expect(out).toMatch(/2 renders in .* on 2 workers/);
    expect(csvRows(join(dir, 's', 'sweep.csv'))).toHaveLength(3);
  });
});
