import { describe, expect, it } from 'vitest';
import { axisValues, parseSweepAxis, runSweep, sweepGrid, sweepPoints } from '../../src/analysis/sweep-run.ts';
import { InputError } from '../../src/errors.ts';
import { setScenarioValue } from '../../src/scenario/index.ts';
import { inProcessRunner } from '../../src/worker/jobs.ts';
import { NodePool } from '../../src/worker/node-pool.ts';
import { linkJson, NO_FILES } from './link-fixture.ts';

describe('sweep axes', () => {
  it('reads PATH=FROM:TO:STEPS with engineering notation and an optional :log or :lin', () => {
    expect(parseSweepAxis('transmitter.circuit.parts[R3].value=22k:100k:5', false)).toEqual({
      path: 'transmitter.circuit.parts[R3].value',
      from: 22000,
      to: 100000,
      steps: 5,
      log: false,
    });
    expect(parseSweepAxis('lightPath.channel.length=1:100:3:log', false).log).toBe(true);
    expect(parseSweepAxis('lightPath.channel.length=1:100:3:lin', true).log).toBe(false);
  });

  it('names the flag and what is wrong in a bad axis', () => {
    expect(() => parseSweepAxis('source.level.dbSpl', false)).toThrow(/--set source.level.dbSpl: no "=" after the path; expected PATH=FROM:TO:STEPS/);
    expect(() => parseSweepAxis('x=1:2:0', false)).toThrow(/STEPS.*at least 1/);
    expect(() => parseSweepAxis('x=1:2:two', false)).toThrow(InputError);
    expect(() => parseSweepAxis('x=0:10:3:log', false)).toThrow(/above 0 for a logarithmic axis/);
  });

  it('spaces values evenly from the step index: linear in value, or by a constant ratio on a log axis', () => {
    expect(axisValues({ path: 'x', from: 60, to: 100, steps: 5, log: false })).toEqual([60, 70, 80, 90, 100]);
    const log = axisValues({ path: 'x', from: 1, to: 1000, steps: 4, log: true });
    expect(log[0]).toBe(1);
    expect(log[3]).toBe(1000);
    expect(log[1]).toBeCloseTo(10, 12);
    expect(log[2]).toBeCloseTo(100, 12);
    expect(axisValues({ path: 'x', from: 3, to: 9, steps: 1, log: false })).toEqual([3]);
  });

  it('makes a grid with the first axis changing slowest', () => {
    const grid = sweepGrid([
      { path: 'a', from: 1, to: 2, steps: 2, log: false },
      { path: 'b', from: 10, to: 30, steps: 3, log: false },
    ]);
    expect(grid).toEqual([[1, 10], [1, 20], [1, 30], [2, 10], [2, 20], [2, 30]]);
  });

  it('takes "level" as the talker level in dB SPL, whatever form the file states it in', () => {
    const json = linkJson({ kind: 'tone', frequency: 1000, seconds: 0.1, level: { effort: 'normal', distance: 0.3 } });
    const points = sweepPoints(json, [parseSweepAxis('level=70:90:2', false)], NO_FILES, 'link.json', undefined, null);
    expect(points.map((p) => p.scenario.source.level)).toEqual([
      { kind: 'spl', dbSpl: 70 },
      { kind: 'spl', dbSpl: 90 },
    ]);
    expect(points.map((p) => p.levelDbSpl)).toEqual([70, 90]);
    // Without a level axis, each point reports the level the file gives: ANSI S3.5 normal effort 62.35 dB at 1 m, at 0.3 m.
    const byDistance = sweepPoints(json, [parseSweepAxis('source.level.distance=0.3:0.6:2', false)], NO_FILES, 'link.json', undefined, null);
    expect(byDistance[0].levelDbSpl).toBeCloseTo(62.35 - 20 * Math.log10(0.3), 9);
    expect(byDistance[0].levelDbSpl - byDistance[1].levelDbSpl).toBeCloseTo(20 * Math.log10(2), 9);
    expect(() => sweepPoints(json, [parseSweepAxis('level=100:200:2', false)], NO_FILES, 'link.json', undefined, null)).toThrow(/level: got 200/);
  });

  it('checks every point before rendering: a value out of range names the path, the value and the point', () => {
    const axes = [parseSweepAxis('lightPath.channel.attenuation=-1:1:3', false)];
    expect(() => sweepPoints(linkJson(), axes, NO_FILES, 'link.json', undefined, null)).toThrow(/attenuation.*at sweep point lightPath.channel.attenuation=-1/);
    const misspelt = [parseSweepAxis('lightPath.channel.lenght=1:2:2', false)];
    expect(() => sweepPoints(linkJson(), misspelt, NO_FILES, 'link.json', undefined, null)).toThrow(/no field "lenght"/);
  });
});

describe('runSweep', () => {
  it('over the tone level: THD rises at every step below cut-off, and cut-off shows only at the top step', async () => {
    // THD_F per IEC 60050 IEV 551-20-13 (the colleague's thd()); the LED cuts off near 100 dB SPL in this link.
    const axes = [parseSweepAxis('source.level.dbSpl=70:102:5', false)];
    const points = sweepPoints(linkJson(), axes, NO_FILES, 'link.json', undefined, 0.1);
    expect(points.map((p) => p.values[0])).toEqual([70, 78, 86, 94, 102]);
    const rows = await runSweep(points, ['thdPercent', 'cutoffFraction'], inProcessRunner());
    const thd = rows.map((r) => (r.outcome.ok ? r.outcome.result.metrics.values.thdPercent : null));
    const cutoff = rows.map((r) => (r.outcome.ok ? r.outcome.result.metrics.values.cutoffFraction : null));
    for (let i = 1; i < 4; i++) expect(thd[i]!).toBeGreaterThan(thd[i - 1]!);
    expect(cutoff.slice(0, 4)).toEqual([0, 0, 0, 0]);
    expect(cutoff[4]!).toBeGreaterThan(0);
  });

  it('over the light-guide length: the far end falls by twice the optical loss in dB and the SNR falls with it; 1 and 2 workers agree', async () => {
    // The photocurrent is proportional to the optical power (responsivity in A/W), so a loss of L dB
    // (10·log10 of power) lowers the far-end voltage of a linear receiver by 2L dB (20·log10 of voltage).
    let json = setScenarioValue(linkJson({ kind: 'tone', frequency: 1000, seconds: 0.15, level: { dbSpl: 60 } }), 'lightPath.channel.couplingLoss', 30);
    json = { ...(json as Record<string, unknown>), lightPath: { ...(json as { lightPath: object }).lightPath, shotNoise: true } };
    const axes = [parseSweepAxis('lightPath.channel.length=0:20:3', false)]; // 0, 10, 20 m at 0.2 dB/m
    const points = sweepPoints(json, axes, NO_FILES, 'link.json', undefined, null);
    const pool = new NodePool(2);
    let rows;
    try {
      rows = await runSweep(points, ['farEndDbv', 'snrDb'], pool);
    } finally {
      await pool.close();
    }
    const values = rows.map((r) => (r.outcome.ok ? r.outcome.result.metrics.values : {}));
    for (let i = 1; i < 3; i++) {
      // 0.1 dB allowance: the phototransistor's Early effect raises its gain a little as the light (and its
      // collector drop) falls, about 0.05 dB per step here.
      expect(Math.abs(values[i].farEndDbv! - values[i - 1].farEndDbv! + 4)).toBeLessThan(0.1);
      expect(values[i].snrDb!).toBeLessThan(values[i - 1].snrDb!);
    }
    const single = await runSweep(points, ['farEndDbv', 'snrDb'], inProcessRunner());
    expect(single.map((r) => (r.outcome.ok ? r.outcome.result.metrics : null))).toEqual(rows.map((r) => (r.outcome.ok ? r.outcome.result.metrics : null)));
  });
});
