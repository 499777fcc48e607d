import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../src/circuit/index.ts';
import { runCli } from '../helpers/cli.ts';
import { transientTrace } from '../helpers/circuits.ts';

const dir = mkdtempSync(join(tmpdir(), 'glowtalk-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function parseCsv(text: string): { header: string[]; rows: number[][] } {
  const lines = text.trimEnd().split('\n');
  return { header: lines[0].split(','), rows: lines.slice(1).map((line) => line.split(',').map(Number)) };
}

describe('glowtalk transient', () => {
  it('writes a CSV with "time" and the probed node, part current and source current, one row per output point, to --csv', async () => {
    const csv = join(dir, 'nested', 'rc.csv');
    const input = 'samples/circuits/rc-low-pass.json';
    const { code, out, err } = await runCli(['transient', input, '--stop', '1m', '--step', '10u', '--probe', 'out', '--probe', 'R1', '--probe', 'VIN', '--csv', csv]);
    expect(err).toBe('');
    expect(code).toBe(0);
    expect(out).toBe('');
    const { header, rows } = parseCsv(readFileSync(csv, 'utf8'));
    expect(header).toEqual(['time', 'out', 'R1', 'VIN']);
    expect(rows.length).toBe(101);
    rows.forEach((row, k) => {
      expect(row.length).toBe(4);
      expect(row[0]).toBeCloseTo(k * 1e-5, 15);
      for (const value of row) expect(Number.isFinite(value)).toBe(true);
    });
    // The same numbers as the engine run directly with the CLI's defaults (trapezoidal, adaptive).
    const trace = transientTrace(parseCircuitText(readFileSync(input, 'utf8')), { stopSeconds: 1e-3, stepSeconds: 1e-5, mode: 'adaptive' }, ['out', 'R1', 'VIN'], {
      method: 'tr',
    });
    rows.forEach((row, k) => {
      expect(row[1]).toBe(trace.values.out[k]);
      expect(row[2]).toBe(trace.values.R1[k]);
      expect(row[3]).toBe(trace.values.VIN[k]);
    });
    // The series resistor carries what the source delivers.
    for (const row of rows) expect(row[2]).toBeCloseTo(-row[3], 12);
    // Only the CSV is left behind (the temporary file was renamed).
    expect(readdirSync(join(dir, 'nested'))).toEqual(['rc.csv']);
  });

  it('probes transistor pins as REF.PIN, LED current by ref, and a node; fixed steps and BDF2 on request', async () => {
    const csv = join(dir, 'link.csv');
    const { code, err } = await runCli([
      'transient',
      'samples/circuits/led-and-phototransistor.json',
      '--stop',
      '200u',
      '--step',
      '10u',
      '--steps',
      'fixed',
      '--method',
      'bdf2',
      '--probe',
      'rx',
      '--probe',
      'D1',
      '--probe',
      'Q1.collector',
      '--probe',
      'Q2.emitter',
      '--csv',
      csv,
    ]);
    expect(err).toBe('');
    expect(code).toBe(0);
    const { header, rows } = parseCsv(readFileSync(csv, 'utf8'));
    expect(header).toEqual(['time', 'rx', 'D1', 'Q1.collector', 'Q2.emitter']);
    expect(rows.length).toBe(21);
    // The LED is in series with Q1's collector: same current (≈ 9 mA by the sample's title).
    for (const row of rows) {
      expect(row[2]).toBeCloseTo(row[3], 9);
      expect(row[2]).toBeGreaterThan(5e-3);
      expect(row[2]).toBeLessThan(15e-3);
      // Current leaves the phototransistor at its emitter.
      expect(row[4]).toBeLessThan(0);
    }
  });

  it('without --csv writes every node to standard output', async () => {
    const { code, out } = await runCli(['transient', 'samples/circuits/diode-with-series-resistor.json', '--stop', '10u', '--step', '1u']);
    expect(code).toBe(0);
    const { header, rows } = parseCsv(out);
    expect(header).toEqual(['time', 'supply', 'anode']);
    expect(rows.length).toBe(11);
  });

  it('leaves no CSV or temporary file behind when the run fails after the output was opened (step longer than stop)', async () => {
    const target = join(dir, 'fails');
    mkdirSync(target);
    const csv = join(target, 'out.csv');
    const { code, err } = await runCli(['transient', 'samples/circuits/rc-low-pass.json', '--stop', '1u', '--step', '1m', '--csv', csv]);
    expect(code).toBe(2);
    expect(err.trimEnd().split('\n')).toHaveLength(1);
    expect(err).toMatch(/step/);
    expect(existsSync(csv)).toBe(false);
    expect(readdirSync(target)).toEqual([]);
  });
});
