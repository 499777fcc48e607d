import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runSweep } from '../../src/analysis/sweep-run.ts';
import { runTolerance } from '../../src/analysis/tolerance-run.ts';
import { inProcessRunner } from '../../src/worker/jobs.ts';
import { histogram, levelSweepPoints, loadForMargins, PAGE_TOLERANCES, SWEEP_METRICS, toleranceInputs } from '../../components/support/margin-runs.ts';
import { linkJson } from '../analysis/link-fixture.ts';
import { runCli } from '../helpers/cli.ts';

function writeScenario(): { dir: string; file: string } {
  const dir = mkdtempSync(join(tmpdir(), 'glowtalk-margins-'));
  const file = join(dir, 'link.json');
  writeFileSync(file, JSON.stringify(linkJson(), null, 2));
  return { dir, file };
}

/** CSV rows split into fields (the tables here have no quoted fields). */
const csv = (file: string) => readFileSync(file, 'utf8').trimEnd().split('\r\n').map((line) => line.split(','));

describe('the Margins tab runs what the command line runs', () => {
  it('a tolerance run of 3 runs, seed 1, gives the same figures as glowtalk tolerance --runs 3 --seed 1 --beta 100:300', async () => {
    const { dir, file } = writeScenario();
    const cli = await runCli(['tolerance', file, '--runs', '3', '--seed', '1', '--beta', '100:300', '--workers', '0', '--out', join(dir, 'cli')]);
    expect(cli.code).toBe(0);
    const [header, ...rows] = csv(join(dir, 'cli', 'runs.csv'));

    const input = toleranceInputs(loadForMargins(linkJson(), 'link.json'), undefined);
    const page = await runTolerance(input.scenario, input.recording, PAGE_TOLERANCES, { runs: 3, seed: 1, corners: false }, input.metrics, inProcessRunner());
    expect(page.rows.map((r) => r.run.label)).toEqual(rows.map((r) => r[0]));
    for (const [i, row] of page.rows.entries()) {
      expect(row.outcome.ok).toBe(true);
      if (!row.outcome.ok) continue;
      for (const metric of input.metrics) {
        const column = header.indexOf(metric);
        expect(column).toBeGreaterThan(0);
        // Bit-identical: the CSV holds the full double (String(number)).
        expect(String(row.outcome.result.metrics.values[metric] ?? '')).toBe(rows[i][column]);
      }
    }
  }, 60_000);

  it('a level sweep of a 1 kHz tone gives the same THD and cut-off as glowtalk sweep --set level=80:100:2 --tone 1000', async () => {
    const { dir, file } = writeScenario();
    const out = join(dir, 'sweep');
    const cli = await runCli(['sweep', file, '--set', 'level=80:100:2', '--tone', '1000', '--seconds', '0.1', '--metrics', SWEEP_METRICS.join(','), '--workers', '0', '--out', out]);
    expect(cli.code).toBe(0);
    const [header, ...rows] = csv(join(out, 'sweep.csv'));

    const points = levelSweepPoints(linkJson(), 'link.json', { fromDbSpl: 80, toDbSpl: 100, steps: 2, seconds: 0.1 });
    expect(points.map((p) => p.scenario.source.kind)).toEqual(['tone', 'tone']);
    const page = await runSweep(points, SWEEP_METRICS, inProcessRunner());
    expect(page.map((r) => String(r.levelDbSpl))).toEqual(rows.map((r) => r[header.indexOf('level')]));
    for (const [i, row] of page.entries()) {
      if (!row.outcome.ok) throw new Error(row.outcome.error);
      for (const metric of SWEEP_METRICS) expect(String(row.outcome.result.metrics.values[metric] ?? '')).toBe(rows[i][header.indexOf(metric)]);
    }
  }, 60_000);

  it('refuses a sweep of 0 levels naming the field', () => {
    expect(() => levelSweepPoints(linkJson(), 'link.json', { fromDbSpl: 80, toDbSpl: 100, steps: 0, seconds: 0.1 })).toThrow(/steps: .*got 0/);
  });
});

describe('histogram', () => {
  it('puts 0…9 into ⌈log2 10⌉ + 1 = 5 equal bins of two values each (Sturges 1926), the top edge closed', () => {
    const h = histogram([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(Array.from(h.counts)).toEqual([2, 2, 2, 2, 2]);
    expect(Array.from(h.edges)).toEqual([0, 1.8, 3.6, 5.4, 7.2, 9]);
  });

  it('uses 7 bins for 50 values and counts every value once; equal values make one bin', () => {
    const values = Array.from({ length: 50 }, (_, i) => Math.sin(i) * 3);
    const h = histogram(values);
    expect(h.counts.length).toBe(7);
    expect(h.counts.reduce((a, b) => a + b, 0)).toBe(50);
    expect(Array.from(histogram([4, 4, 4]).counts)).toEqual([3]);
    expect(histogram([]).counts.length).toBe(0);
  });
});
