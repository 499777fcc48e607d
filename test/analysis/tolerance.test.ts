import { describe, expect, it } from 'vitest';
import type { Circuit, LedModel } from '../../src/circuit/types.ts';
import { summariseTolerance, planRuns, runTolerance } from '../../src/analysis/tolerance-run.ts';
import { applyRun, cornerRuns, drawRun, toleranceParameters, type ToleranceSpec } from '../../src/analysis/tolerance.ts';
import { Simulator } from '../../src/solver/simulator.ts';
import type { MetricName } from '../../src/analysis/link-metrics.ts';
import { inProcessRunner } from '../../src/worker/jobs.ts';
import { NodePool } from '../../src/worker/node-pool.ts';
import { linkScenario } from './link-fixture.ts';

const SPEC: ToleranceSpec = {
  resistorPercent: 5,
  capacitorPercent: 10,
  betaRange: [100, 300],
  photoBetaRange: null,
  ledForwardVolts: 0.05,
  emitterEfficiencyPercent: 10,
  distribution: 'uniform',
  fixed: [],
};

describe('tolerance parameters and draws', () => {
  const scenario = linkScenario();
  const parameters = toleranceParameters(scenario, SPEC);

  it('lists every resistor, capacitor, transistor gain and LED of both circuits in a fixed order, except fixed parts', () => {
    const keys = parameters.map((p) => p.key);
    expect(keys.slice(0, 4)).toEqual(['transmitter.C1.value', 'transmitter.R1.value', 'transmitter.R2.value', 'transmitter.Q1.forwardBeta']);
    expect(keys).toContain('transmitter.D1.forwardVoltageShift');
    expect(keys).toContain('transmitter.D1.quantumEfficiency');
    expect(keys).toContain('receiver.RL.value');
    expect(keys).not.toContain('receiver.Q1.forwardBeta'); // phototransistor gain is a separate flag
    const r1 = parameters.find((p) => p.key === 'transmitter.R1.value')!;
    expect([r1.nominal, r1.low, r1.high]).toEqual([100e3, 95e3, 105e3]);
    const fixed = toleranceParameters(scenario, { ...SPEC, fixed: ['R1', 'receiver.RL'] }).map((p) => p.key);
    expect(fixed).not.toContain('transmitter.R1.value');
    expect(fixed).not.toContain('receiver.R1.value');
    expect(fixed).not.toContain('receiver.RL.value');
    expect(() => toleranceParameters(scenario, { ...SPEC, fixed: ['R99'] })).toThrow(/--fixed: no part "R99"/);
  });

  it('draws run i from (seed, i) alone: the same values whatever other runs there are', () => {
    const ten = planRuns(parameters, SPEC, { runs: 10, seed: 42, corners: false });
    const forty = planRuns(parameters, SPEC, { runs: 40, seed: 42, corners: true });
    expect(forty.find((r) => r.label === 'run 7')!.values).toEqual(ten.find((r) => r.label === 'run 7')!.values);
    expect(drawRun(parameters, 43, 7, 'uniform').values).not.toEqual(drawRun(parameters, 42, 7, 'uniform').values);
  });

  it('draws uniformly inside each range: mean (a+b)/2 and variance (b−a)²/12 of the uniform distribution', () => {
    // Uniform on [a, b]: mean (a+b)/2, variance (b−a)²/12 (textbook moments). 4000 runs: the mean of the
    // normalised draws u = (x − a)/(b − a) is 1/2 ± 3·√(1/12/4000) = ±0.0137.
    const n = 4000;
    let sum = 0;
    let squares = 0;
    let lowest = Infinity;
    let highest = -Infinity;
    for (let i = 0; i < n; i++) {
      const run = drawRun(parameters, 9, i, 'uniform');
      run.values.forEach((x, j) => {
        const p = parameters[j];
        const u = (x - p.low) / (p.high - p.low);
        lowest = Math.min(lowest, u);
        highest = Math.max(highest, u);
        if (j === 0) {
          sum += u;
          squares += u * u;
        }
      });
    }
    expect(lowest).toBeGreaterThanOrEqual(0);
    expect(highest).toBeLessThan(1);
    expect(Math.abs(sum / n - 0.5)).toBeLessThan(0.0137);
    expect(squares / n - (sum / n) ** 2).toBeCloseTo(1 / 12, 2);
  });

  it('with "normal", draws inside the range with σ = range/6, truncated at ±3σ', () => {
    // A normal truncated at ±3σ keeps a standard deviation of σ·√(1 − 6φ(3)/(2Φ(3) − 1)) = 0.98658σ
    // (moments of the truncated normal, Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions 1,
    // ch. 13; from memory). 4000 draws: standard error of the s.d. about σ/√8000 = 1.1 %.
    const p = parameters[1];
    const sigma = (p.high - p.low) / 6;
    const xs = Array.from({ length: 4000 }, (_, i) => drawRun(parameters, 5, i, 'normal').values[1]);
    expect(xs.every((x) => x >= p.low && x <= p.high)).toBe(true);
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1));
    expect(Math.abs(mean - p.nominal)).toBeLessThan(3 * (sigma / Math.sqrt(4000)));
    expect(Math.abs(sd / sigma - 0.98658)).toBeLessThan(0.035);
  });

  it('puts corners at the range ends and changes only the parts named, in a copy', () => {
    const [low, high] = cornerRuns(parameters);
    const changed = applyRun(scenario, parameters, high);
    const r3 = changed.transmitter.circuit.parts.find((p) => p.ref === 'R3') as { value: number };
    expect(r3.value).toBeCloseTo(47e3 * 1.05, 6);
    const q1 = changed.transmitter.circuit.parts.find((p) => p.ref === 'Q1') as { model: { forwardBeta: number } };
    const q2 = applyRun(scenario, parameters, low).transmitter.circuit.parts.find((p) => p.ref === 'Q2') as { model: { forwardBeta: number } };
    expect([q1.model.forwardBeta, q2.model.forwardBeta]).toEqual([300, 100]);
    // The nominal scenario and its shared built-in models are untouched.
    expect((scenario.transmitter.circuit.parts.find((p) => p.ref === 'R3') as { value: number }).value).toBe(47e3);
    expect((scenario.transmitter.circuit.parts.find((p) => p.ref === 'Q1') as { model: { forwardBeta: number } }).model.forwardBeta).toBe(200);
  });

  it('shifts the LED forward voltage by exactly ΔV at any current, as the solver finds it (Shockley: V = n·VT·ln(I/Is))', () => {
    // Scaling Is by k = exp(−ΔV/(n·VT)) adds ΔV to n·VT·ln(I/Is + 1) ≈ n·VT·ln(I/Is) (I ≫ Is), with the series-resistance drop unchanged.
    const shifted = applyRun(scenario, parameters, { label: 'x', index: null, values: parameters.map((p) => (p.quantity === 'forwardVoltageShift' ? 0.05 : p.nominal)) });
    const modelOf = (s: typeof scenario) => (s.transmitter.circuit.parts.find((p) => p.ref === 'D1') as { model: LedModel }).model;
    const forwardVolts = (model: LedModel, amperes: number): number => {
      const circuit: Circuit = {
        temperatureCelsius: scenario.transmitter.circuit.temperatureCelsius,
        parts: [
          { ref: 'I1', kind: 'current-source', pins: ['gnd', 'a'], dc: amperes },
          { ref: 'D1', kind: 'led', pins: ['a', 'gnd'], modelName: 'under-test', model },
        ],
      };
      const simulator = new Simulator(circuit);
      simulator.operatingPoint();
      return simulator.x[simulator.system.nodeIndex('a')!];
    };
    for (const amperes of [1e-3, 20e-3]) {
      expect(forwardVolts(modelOf(shifted), amperes) - forwardVolts(modelOf(scenario), amperes)).toBeCloseTo(0.05, 6);
    }
  });
});

describe('runTolerance', () => {
  it('gives identical tables in this thread and on 2 workers for a fixed seed, and names the worst runs with their values', async () => {
    const scenario = linkScenario({ kind: 'tone', frequency: 1000, seconds: 0.1, level: { dbSpl: 95 } });
    const plan = { runs: 4, seed: 2024, corners: true };
    const metrics: MetricName[] = ['minLedMilliamperes', 'thdPercent'];
    const one = await runTolerance(scenario, undefined, SPEC, plan, metrics, inProcessRunner());
    const pool = new NodePool(2);
    let two: typeof one;
    try {
      two = await runTolerance(scenario, undefined, SPEC, plan, metrics, pool);
    } finally {
      await pool.close();
    }
    const table = (r: typeof one) => r.rows.map((row) => [row.run.label, ...row.run.values, row.outcome.ok ? row.outcome.result.metrics.values : row.outcome.error]);
    expect(table(two)).toEqual(table(one));
    expect(two.spreads).toEqual(one.spreads);
    expect(two.worst).toEqual(one.worst);
    expect(one.rows.map((r) => r.run.label)).toEqual(['nominal', 'low', 'high', 'run 0', 'run 1', 'run 2', 'run 3']);
    const lowest = one.worst.find((w) => w.metric === 'minLedMilliamperes')!;
    const values = one.rows.filter((r) => r.run.label !== 'nominal').map((r) => (r.outcome.ok ? r.outcome.result.metrics.values.minLedMilliamperes! : Infinity));
    expect(lowest.value).toBe(Math.min(...values));
    expect(one.spreads[0].spread!.count).toBe(4);
  });

  it('ranks the parts by their correlation with a metric and names them at the worst run', () => {
    // Pearson's r is ±1 for an exact linear relation and 0 for none (definition of the correlation coefficient).
    const parameters = toleranceParameters(linkScenario(), SPEC);
    const j = parameters.findIndex((p) => p.key === 'transmitter.RE2.value');
    const rows = planRuns(parameters, SPEC, { runs: 50, seed: 3, corners: false }).map((run) => ({
      run,
      outcome: { ok: true as const, result: { metrics: { values: { minLedMilliamperes: 10 - 0.01 * run.values[j] }, notes: [] }, summary: {} as never } },
    }));
    const result = summariseTolerance(parameters, rows, ['minLedMilliamperes']);
    const top = result.sensitivities[0].correlations[0];
    expect(top.key).toBe('transmitter.RE2.value');
    expect(top.correlation).toBeCloseTo(-1, 12);
    const worst = result.worst[0];
    expect(worst.extreme).toBe('lowest');
    expect(worst.drivers[0]).toMatchObject({ key: 'transmitter.RE2.value' });
    expect(worst.drivers[0].value).toBe(Math.max(...rows.map((r) => r.run.values[j])));
  });

  it('skips a worst case for a metric every run agrees on', () => {
    const parameters = toleranceParameters(linkScenario(), SPEC);
    const rows = planRuns(parameters, SPEC, { runs: 3, seed: 1, corners: false }).map((run) => ({
      run,
      outcome: { ok: true as const, result: { metrics: { values: { cutoffFraction: 0 }, notes: [] }, summary: {} as never } },
    }));
    expect(summariseTolerance(parameters, rows, ['cutoffFraction']).worst).toEqual([]);
  });
});
