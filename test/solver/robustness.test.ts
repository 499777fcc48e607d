import { readdirSync, readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../src/circuit/index.ts';
import type { Circuit } from '../../src/circuit/types.ts';
import { ConvergenceError } from '../../src/errors.ts';
import { biasPoint } from '../../src/solver/bias-report.ts';
import { DenseLu } from '../../src/solver/dense-lu.ts';
import { SparseLu } from '../../src/solver/sparse-lu.ts';
import { circuitOf, transientTrace } from '../helpers/circuits.ts';
import { networkParts, networkSpec } from '../helpers/random-network.ts';

/*
 * The solver's fast paths against its plain references, and its behaviour on
 * circuits that are hard or impossible: they must end in an answer or in a
 * ConvergenceError that says where, never in NaN and never in a hang.
 */

const SAMPLES_DIR = new URL('../../samples/circuits/', import.meta.url);
const SAMPLES = readdirSync(SAMPLES_DIR).filter((f) => f.endsWith('.json'));

function sample(file: string): Circuit {
  return parseCircuitText(readFileSync(new URL(file, SAMPLES_DIR), 'utf8'), file);
}

function expectSameNodes(a: Record<string, number>, b: Record<string, number>, relative: number): void {
  expect(Object.keys(a).sort()).toEqual(Object.keys(b).sort());
  for (const [name, volts] of Object.entries(a)) expect(Math.abs(volts - b[name])).toBeLessThanOrEqual(relative * Math.max(1, Math.abs(volts)));
}

describe('sparse LU against the dense reference (Golub & Van Loan, Matrix Computations, alg. 3.4.1)', () => {
  it('solves random sparse systems (zero diagonals included, so pivoting matters) to the same answer within 1e-10, also when the order is replayed', () => {
    const system = fc.record({
      size: fc.integer({ min: 1, max: 12 }),
      entries: fc.array(fc.record({ row: fc.nat(), col: fc.nat(), value: fc.double({ min: -1, max: 1, noNaN: true }) }), { maxLength: 40 }),
      diagonal: fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 12, maxLength: 12 }),
      rhs: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
    });
    fc.assert(
      fc.property(system, fc.double({ min: 0.5, max: 2, noNaN: true }), ({ size, entries, diagonal, rhs }, rescale) => {
        const sparse = new SparseLu(size);
        const dense = new DenseLu(size);
        // Same stamp pattern in both: a permuted strong diagonal (as voltage-source rows give) plus random entries.
        const stamps = [
          ...Array.from({ length: size }, (_, i) => ({ row: i, col: (i + 1) % size, value: diagonal[i] >= 0 ? diagonal[i] + 3 : diagonal[i] - 3 })),
          ...entries.map((e) => ({ row: e.row % size, col: e.col % size, value: e.value })),
        ];
        const slotsSparse = stamps.map((s) => sparse.slot(s.row, s.col));
        const slotsDense = stamps.map((s) => dense.slot(s.row, s.col));
        sparse.finalise();
        dense.finalise();
        for (const scale of [1, rescale]) {
          sparse.values.fill(0);
          dense.values.fill(0);
          stamps.forEach((s, k) => {
            sparse.values[slotsSparse[k]] += s.value * (k % 2 === 0 ? scale : 1);
            dense.values[slotsDense[k]] += s.value * (k % 2 === 0 ? scale : 1);
          });
          const denseOk = dense.factor();
          const sparseOk = sparse.factor();
          expect(sparseOk).toBe(denseOk);
          if (!denseOk) continue;
          const b = Float64Array.from(rhs.slice(0, size));
          const xs = new Float64Array(size + 1);
          const xd = new Float64Array(size + 1);
          sparse.solve(new Float64Array(b), xs);
          dense.solve(new Float64Array(b), xd);
          const norm = Math.max(1, ...Array.from(xd.subarray(0, size), Math.abs));
          // The answer is only as good as the matrix's condition; skip the ill-conditioned few.
          if (norm > 1e4) continue;
          for (let i = 0; i < size; i++) expect(Math.abs(xs[i] - xd[i])).toBeLessThanOrEqual(1e-10 * norm);
        }
      }),
      { seed: 31_415, numRuns: 100 },
    );
  });

  for (const file of SAMPLES) {
    it(`${file}: bias point and a short transient agree between sparse and dense LU within 1e-10`, () => {
      const circuit = sample(file);
      expectSameNodes(biasPoint(circuit, { linearAlgebra: 'sparse' }).nodes, biasPoint(circuit, { linearAlgebra: 'dense' }).nodes, 1e-10);
      const probes = Object.keys(biasPoint(circuit).nodes);
      const request = { stopSeconds: 2e-4, stepSeconds: 1e-5, mode: 'fixed' as const };
      const sparse = transientTrace(circuit, request, probes, { linearAlgebra: 'sparse' });
      const dense = transientTrace(circuit, request, probes, { linearAlgebra: 'dense' });
      for (const p of probes) {
        sparse.values[p].forEach((v, i) => expect(Math.abs(v - dense.values[p][i])).toBeLessThanOrEqual(1e-10 * Math.max(1, Math.abs(v))));
      }
    });
  }

  it('random resistor/source/diode networks give the same bias point with sparse and dense LU within 1e-10', () => {
    fc.assert(
      fc.property(networkSpec, (spec) => {
        const { parts, models } = networkParts(spec);
        const circuit = circuitOf(parts, { models });
        expectSameNodes(biasPoint(circuit, { linearAlgebra: 'sparse' }).nodes, biasPoint(circuit, { linearAlgebra: 'dense' }).nodes, 1e-10);
      }),
      { seed: 2718, numRuns: 60 },
    );
  });
});

describe('hard and impossible circuits', () => {
  it('four ideal diodes in series straight across 100 V need source stepping and still solve (25 V each, Kirchhoff holds)', () => {
    const parts = [
      { ref: 'V1', kind: 'voltage-source', pins: ['n0', 'gnd'], dc: 100 },
      ...[0, 1, 2, 3].map((i) => ({ ref: `D${i}`, kind: 'diode', pins: [`n${i}`, i === 3 ? 'gnd' : `n${i + 1}`], model: 'd' })),
    ];
    const report = biasPoint(circuitOf(parts, { models: { d: { saturationCurrent: 1e-14 } } }));
    // Plain Newton fails here today (measured); the ladders are what get through.
    expect(['gmin-stepping', 'source-stepping']).toContain(report.method);
    for (let i = 0; i < 4; i++) expect((report.parts[`D${i}`] as { voltage: number }).voltage).toBeCloseTo(25, 9);
    const currents = [0, 1, 2, 3].map((i) => (report.parts[`D${i}`] as { current: number }).current);
    for (const c of currents) expect(c / currents[0]).toBeCloseTo(1, 12);
    expect((report.parts.V1 as { current: number }).current / currents[0]).toBeCloseTo(-1, 12);
  });

  it('two voltage sources of different values in parallel (built past the topology check) end in a ConvergenceError, quickly and without NaN', () => {
    const circuit: Circuit = {
      temperatureCelsius: 27,
      parts: [
        { ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 1 },
        { ref: 'V2', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 2 },
        { ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: 1000 },
      ],
    };
    const started = performance.now();
    expect(() => biasPoint(circuit)).toThrow(ConvergenceError);
    expect(performance.now() - started).toBeLessThan(2000);
  });

  // A singular matrix at DC names where elimination broke down.
  it('the parallel-sources error names the unknown or part where the matrix is singular', () => {
    const circuit: Circuit = {
      temperatureCelsius: 27,
      parts: [
        { ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 1 },
        { ref: 'V2', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 2 },
        { ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: 1000 },
      ],
    };
    try {
      biasPoint(circuit);
    } catch (error) {
      expect(error).toBeInstanceOf(ConvergenceError);
      expect((error as ConvergenceError).message).toMatch(/V1|V2|\ba\b|singular/);
      return;
    }
    expect.unreachable('no error');
  });

  it('a NaN resistance (built past the parser) ends in a ConvergenceError at DC, not in NaN', () => {
    const circuit: Circuit = {
      temperatureCelsius: 27,
      parts: [
        { ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 1 },
        { ref: 'R1', kind: 'resistor', pins: ['a', 'b'], value: Number.NaN },
        { ref: 'R2', kind: 'resistor', pins: ['b', 'gnd'], value: 1000 },
      ],
    };
    expect(() => biasPoint(circuit)).toThrow(ConvergenceError);
  });

  it('an absurd diode model (Is = 1e-300 A, n = 0.001) never gives NaN: either a finite answer that obeys the model or a ConvergenceError naming the diode', () => {
    const circuit = circuitOf(
      [
        { ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 5 },
        { ref: 'R1', kind: 'resistor', pins: ['a', 'b'], value: 1 },
        { ref: 'D1', kind: 'diode', pins: ['b', 'gnd'], model: 'm' },
      ],
      { models: { m: { saturationCurrent: 1e-300, emissionCoefficient: 1e-3 } } },
    );
    try {
      const report = biasPoint(circuit);
      // Solved: at 5 V this junction carries about 1e-260 A, so only gmin (1e-12 S) conducts.
      const diode = report.parts.D1 as { voltage: number; current: number };
      expect(diode.voltage).toBeCloseTo(5, 9);
      expect(diode.current).toBeCloseTo(5e-12, 20);
    } catch (error) {
      expect(error).toBeInstanceOf(ConvergenceError);
      expect((error as ConvergenceError).message).toContain('D1');
    }
  });

  it('a drive that turns NaN after t = 0 (built past the parser) fails the transient with a ConvergenceError naming the time and the node, quickly', () => {
    const circuit: Circuit = {
      temperatureCelsius: 27,
      parts: [
        { ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 0, wave: { shape: 'points', points: [[0, 0], [1e-3, Number.NaN]] } },
        { ref: 'R1', kind: 'resistor', pins: ['a', 'b'], value: 1000 },
        { ref: 'D1', kind: 'diode', pins: ['b', 'gnd'], modelName: 'd', model: { kind: 'diode', saturationCurrent: 1e-14, emissionCoefficient: 1, seriesResistance: 0, junctionCapacitance: 0 } },
      ],
    };
    let caught: unknown = null;
    const started = performance.now();
    try {
      transientTrace(circuit, { stopSeconds: 1e-3, stepSeconds: 1e-5, mode: 'fixed' }, ['b']);
    } catch (error) {
      caught = error;
    }
    expect(performance.now() - started).toBeLessThan(5000);
    expect(caught).toBeInstanceOf(ConvergenceError);
    const error = caught as ConvergenceError;
    expect(error.seconds).toBeGreaterThan(0);
    expect(error.seconds).toBeLessThanOrEqual(1e-5);
    expect(error.node).toBe('a');
    expect(error.message).toMatch(/t = [0-9.e-]+ s/);
    expect(error.message).toContain('node a');
  });
});
