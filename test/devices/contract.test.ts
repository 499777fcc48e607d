import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { BjtModel, DiodeModel, LedModel, PhototransistorModel } from '../../src/circuit/types.ts';
import { Bjt } from '../../src/devices/bjt.ts';
import { JUNCTION_GMIN_SIEMENS } from '../../src/devices/device.ts';
import { Diode } from '../../src/devices/diode.ts';
import { thermalVoltage } from '../../src/units/constants.ts';
import { DenseBinder } from '../helpers/dense-binder.ts';

/*
 * The contract every nonlinear device model keeps with the solver:
 *  - its stamped conductances are the derivatives of its own reported
 *    currents (finite-difference Jacobian check), and its stamped right-hand
 *    side reproduces those currents at the point;
 *  - current is conserved (pin currents and every stamp column sum to zero)
 *    and only voltage differences matter (stamp rows sum to zero);
 *  - currents are continuous where the model changes branch (vbc = 0, the
 *    conducting threshold, the exponent floor and the linear continuation);
 *  - a PNP is the mirror image of an NPN.
 */

const KELVIN = 300;
const VT = thermalVoltage(KELVIN);
const EPS = 2.220446049250313e-16;
const FD_STEP_VOLTS = 1e-6;

const DIODE: DiodeModel = { kind: 'diode', saturationCurrent: 1e-14, emissionCoefficient: 1.05, seriesResistance: 0, junctionCapacitance: 1e-12 };
const LED: LedModel = {
  kind: 'led',
  saturationCurrent: 1e-18,
  emissionCoefficient: 1.9,
  seriesResistance: 8,
  junctionCapacitance: 20e-12,
  wavelength: 630e-9,
  quantumEfficiency: 0.1,
};
const BJT_BASE = {
  saturationCurrent: 1e-14,
  forwardBeta: 150,
  reverseBeta: 2,
  earlyVoltage: 60,
  emissionCoefficient: 1,
  baseEmitterCapacitance: 10e-12,
  baseCollectorCapacitance: 3e-12,
  collectorResistance: 0,
};
const NPN: BjtModel = { kind: 'npn', ...BJT_BASE };
const PNP: BjtModel = { kind: 'pnp', ...BJT_BASE };
const PHOTO: PhototransistorModel = { kind: 'phototransistor', ...BJT_BASE, forwardBeta: 500, responsivity: 0.4 };

/** Central-difference Jacobian of `currents` (one value per unknown) at x. */
function finiteDifferenceJacobian(currents: (x: Float64Array) => Float64Array, x: Float64Array, n: number): number[][] {
  const jacobian: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    const plus = new Float64Array(x);
    const minus = new Float64Array(x);
    plus[j] += FD_STEP_VOLTS;
    minus[j] -= FD_STEP_VOLTS;
    const up = currents(plus);
    const down = currents(minus);
    for (let i = 0; i < n; i++) jacobian[i][j] = (up[i] - down[i]) / (2 * FD_STEP_VOLTS);
  }
  return jacobian;
}

/**
 * Compares stamps with the device's own currents at x: conductances within
 * 1e-5 relative (plus the rounding floor of a central difference), the
 * linearised current I0 = G·x − rhs within 1e-9 relative, and conservation.
 */
function checkContract(binder: DenseBinder, stampCurrents: Float64Array, currents: (x: Float64Array) => Float64Array, x: Float64Array): void {
  const n = binder.size;
  const reported = currents(x);
  const scale = Math.max(...reported.map(Math.abs), 1e-15);
  const floor = (100 * EPS * scale) / FD_STEP_VOLTS + 1e-16;
  const fd = finiteDifferenceJacobian(currents, x, n);
  for (let r = 0; r < n; r++) {
    // I0 = G·x − rhs cancels terms as large as |G|·|x|: allow their rounding.
    let magnitude = Math.abs(binder.rhsVector[r]);
    for (let c = 0; c < n; c++) magnitude += Math.abs(binder.entry(r, c) * x[c]);
    expect(Math.abs(stampCurrents[r] - reported[r])).toBeLessThanOrEqual(1e-9 * scale + 16 * EPS * magnitude);
    let rowSum = 0;
    let columnSum = 0;
    let rowScale = 0;
    for (let c = 0; c < n; c++) {
      const g = binder.entry(r, c);
      expect(Math.abs(g - fd[r][c])).toBeLessThanOrEqual(1e-5 * Math.abs(fd[r][c]) + floor);
      rowSum += g;
      columnSum += binder.entry(c, r);
      rowScale = Math.max(rowScale, Math.abs(g), Math.abs(binder.entry(c, r)));
    }
    expect(Math.abs(rowSum)).toBeLessThanOrEqual(1e-12 * rowScale + 1e-20);
    expect(Math.abs(columnSum)).toBeLessThanOrEqual(1e-12 * rowScale + 1e-20);
  }
  expect(Math.abs(reported.reduce((a, b) => a + b, 0))).toBeLessThanOrEqual(1e-12 * scale + 1e-20);
}

/** Junction voltages to sample: reverse to well forward, plus the linear continuation above 80·n·VT. */
const junctionVolts = fc.oneof(
  fc.double({ min: -3, max: 0.85, noNaN: true }),
  fc.double({ min: -0.05, max: 0.05, noNaN: true }),
  fc.double({ min: 2.2, max: 3, noNaN: true }),
);
const offsetVolts = fc.double({ min: -5, max: 5, noNaN: true });
const RUNS = { seed: 20240611, numRuns: 100 };

/** Current vector [into pin a, into cathode, into the internal junction node] for a diode/LED built by the binder. */
function diodeCurrents(diode: Diode, series: number, a: number, k: number, j: number) {
  return (x: Float64Array): Float64Array => {
    const out = new Float64Array(series > 0 ? 3 : 2);
    const through = diode.current(x);
    if (series > 0) {
      const rs = (x[a] - x[j]) / series;
      out[a] = rs;
      out[j] = -rs + through;
    } else {
      out[a] = through;
    }
    out[k] = -through;
    return out;
  };
}

describe('device contract: diode and LED', () => {
  for (const model of [DIODE, LED]) {
    const label = model.kind === 'led' ? 'LED with series resistance' : 'diode';

    it(`${label}: stamped conductances equal central differences of current() within 1e-5 at random points; current conserved`, () => {
      fc.assert(
        fc.property(junctionVolts, offsetVolts, fc.double({ min: -2, max: 2, noNaN: true }), (v, offset, seriesDrop) => {
          const binder = new DenseBinder(KELVIN);
          const diode = new Diode('D1', ['a', 'k'], model, binder);
          const a = binder.node('a');
          const k = binder.node('k');
          const j = model.seriesResistance > 0 ? binder.node('D1#junction') : a;
          // The junction sits at v above the cathode; the series resistor carries an arbitrary drop (x need not be a solution).
          const volts: Record<string, number> = { k: offset, a: offset + v };
          if (j !== a) {
            volts['D1#junction'] = offset + v;
            volts.a = offset + v + seriesDrop;
          }
          const x = binder.vector(volts);
          const stamped = binder.stampAt(diode, x);
          checkContract(binder, stamped, diodeCurrents(diode, model.seriesResistance, a, k, j), x);
        }),
        RUNS,
      );
    });

    it(`${label}: current is continuous at v = 0, at the limiting threshold, at the exponent floor and at the start of the linear continuation`, () => {
      const binder = new DenseBinder(KELVIN);
      const diode = new Diode('D1', ['a', 'gnd'], { ...model, seriesResistance: 0 }, binder);
      const nvt = model.emissionCoefficient * VT;
      const critical = nvt * Math.log(nvt / (Math.SQRT2 * model.saturationCurrent));
      for (const v of [0, critical, -40 * nvt, 80 * nvt]) {
        const delta = 1e-9;
        const at = (volts: number) => diode.current(binder.vector({ a: volts }));
        const slope = (model.saturationCurrent / nvt) * Math.exp(Math.min(v / nvt, 80)) + JUNCTION_GMIN_SIEMENS;
        const jump = Math.abs(at(v + delta) - at(v - delta));
        expect(jump).toBeLessThanOrEqual(2 * delta * slope * 1.001 + 4 * EPS * Math.abs(at(v)));
      }
    });
  }
});

/** Currents [collector, base, emitter] in the binder's unknown order. */
function bjtCurrents(bjt: Bjt, order: number[]) {
  return (x: Float64Array): Float64Array => {
    const p = bjt.pinCurrents(x);
    const out = new Float64Array(3);
    out[order[0]] = p.collector;
    out[order[1]] = p.base;
    out[order[2]] = p.emitter;
    return out;
  };
}

function makeBjt(kind: 'npn' | 'pnp' | 'phototransistor', model: BjtModel | PhototransistorModel, binder: DenseBinder, lightWatts = 0) {
  if (kind === 'phototransistor') {
    const bjt = new Bjt('Q1', kind, ['c', 'e'], model, binder, { dc: lightWatts });
    return { bjt, order: [binder.node('c'), binder.node('Q1#base'), binder.node('e')], base: 'Q1#base' };
  }
  const bjt = new Bjt('Q1', kind, ['c', 'b', 'e'], model, binder);
  return { bjt, order: [binder.node('c'), binder.node('b'), binder.node('e')], base: 'b' };
}

describe('device contract: NPN, PNP and phototransistor', () => {
  const cases = [
    { kind: 'npn', model: NPN, light: 0 },
    { kind: 'pnp', model: PNP, light: 0 },
    { kind: 'phototransistor', model: PHOTO, light: 5e-6 },
  ] as const;
  for (const { kind, model, light } of cases) {
    it(`${kind}: stamped conductances equal central differences of pinCurrents() within 1e-5 at random (vbe, vbc); current conserved`, () => {
      const p = kind === 'pnp' ? -1 : 1;
      fc.assert(
        fc.property(junctionVolts, junctionVolts, offsetVolts, (vbe, vbc, offset) => {
          const binder = new DenseBinder(KELVIN);
          const { bjt, order, base } = makeBjt(kind, model, binder, light);
          const vb = offset;
          const x = binder.vector({ [base]: vb, e: vb - p * vbe, c: vb - p * vbc });
          const stamped = binder.stampAt(bjt, x);
          checkContract(binder, stamped, bjtCurrents(bjt, order), x);
        }),
        RUNS,
      );
    });
  }

  it('NPN currents are continuous as vbc crosses 0 and the conducting threshold, and the region changes there', () => {
    const binder = new DenseBinder(KELVIN);
    const { bjt } = makeBjt('npn', NPN, binder);
    const threshold = bjt.conductingJunctionVolts;
    const at = (vbe: number, vbc: number) => binder.vector({ b: 0, e: -vbe, c: -vbc });
    const delta = 1e-9;
    for (const [vbe, vbc, which] of [
      [0.65, 0, 'vbc'],
      [0.65, threshold, 'vbc'],
      [threshold, -2, 'vbe'],
      [0.3, 0, 'vbc'],
      [80 * VT, -1, 'vbe'],
      [-40 * VT, -1, 'vbe'],
    ] as const) {
      const before = which === 'vbc' ? at(vbe, vbc - delta) : at(vbe - delta, vbc);
      const after = which === 'vbc' ? at(vbe, vbc + delta) : at(vbe + delta, vbc);
      const i0 = bjt.pinCurrents(before);
      const i1 = bjt.pinCurrents(after);
      // Largest conductance at the point bounds any change over 2δ.
      binder.stampAt(bjt, at(vbe, vbc));
      let gMax = 0;
      for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) gMax = Math.max(gMax, Math.abs(binder.entry(r, c)));
      for (const pin of ['collector', 'base', 'emitter'] as const) {
        expect(Math.abs(i1[pin] - i0[pin])).toBeLessThanOrEqual(2 * delta * gMax * 1.001 + 4 * EPS * Math.abs(i0[pin]));
      }
    }
    expect(bjt.region(at(threshold - 1e-6, -2))).toBe('cutoff');
    expect(bjt.region(at(threshold + 1e-6, -2))).toBe('active');
    expect(bjt.region(at(0.7, threshold + 1e-6))).toBe('saturation');
    expect(bjt.region(at(-1, threshold + 1e-6))).toBe('reverse');
  });

  it('a PNP at (−vbe, −vbc) carries exactly minus the NPN currents at (vbe, vbc), with the same conductances', () => {
    fc.assert(
      fc.property(junctionVolts, junctionVolts, (vbe, vbc) => {
        const nb = new DenseBinder(KELVIN);
        const pb = new DenseBinder(KELVIN);
        const npn = makeBjt('npn', NPN, nb).bjt;
        const pnp = makeBjt('pnp', PNP, pb).bjt;
        const xn = nb.vector({ b: 0, e: -vbe, c: -vbc });
        const xp = pb.vector({ b: 0, e: vbe, c: vbc });
        const a = npn.pinCurrents(xn);
        const b = pnp.pinCurrents(xp);
        for (const pin of ['collector', 'base', 'emitter'] as const) expect(b[pin] === -a[pin]).toBe(true);
        nb.stampAt(npn, xn);
        pb.stampAt(pnp, xp);
        for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) expect(pb.entry(r, c) === nb.entry(r, c)).toBe(true);
      }),
      RUNS,
    );
  });

  it('Ebers–Moll values at Is = 1e-14 A, βF = 100, βR = 1, Vbe = 0.65 V, Vbc = −5 V, no Early effect (Ebers & Moll, Proc. IRE 42, 1954)', () => {
    const model: BjtModel = { ...NPN, forwardBeta: 100, reverseBeta: 1, earlyVoltage: Infinity, baseEmitterCapacitance: 0, baseCollectorCapacitance: 0 };
    const binder = new DenseBinder(KELVIN);
    const { bjt } = makeBjt('npn', model, binder);
    const vbe = 0.65;
    const vbc = -5;
    const currents = bjt.pinCurrents(binder.vector({ b: 0, e: -vbe, c: -vbc }));
    // Transport form: iF = Is(e^(vbe/VT) − 1), iR = Is(e^(vbc/VT) − 1), ic = iF − iR − iR/βR,
    // ib = iF/βF + iR/βR; plus the contract's gmin (device.ts) across each junction.
    const is = 1e-14;
    const iF = is * (Math.exp(vbe / VT) - 1);
    const iR = is * (Math.exp(vbc / VT) - 1);
    const ic = iF - iR - iR / 1 - JUNCTION_GMIN_SIEMENS * vbc;
    const ib = iF / 100 + iR / 1 + JUNCTION_GMIN_SIEMENS * (vbe + vbc);
    expect(currents.collector / ic - 1).toBeCloseTo(0, 13);
    expect(currents.base / ib - 1).toBeCloseTo(0, 13);
    expect(currents.emitter).toBeCloseTo(-(ic + ib), 15);
    // Measured Ic = 0.83084 mA at 300 K; βF = Ic/Ib in forward activity.
    expect(ic).toBeGreaterThan(0.83e-3);
    expect(ic).toBeLessThan(0.832e-3);
    expect(currents.collector / currents.base).toBeCloseTo(100, 3);
  });
});

describe('the contract check itself', () => {
  it('rejects a stamp whose output conductance (the Early term) is off by 1e-4 relative', () => {
    const binder = new DenseBinder(KELVIN);
    const { bjt, order } = makeBjt('npn', NPN, binder);
    const x = binder.vector({ b: 0, e: -0.65, c: -5 });
    const stamped = binder.stampAt(bjt, x);
    checkContract(binder, stamped, bjtCurrents(bjt, order), x);
    // ∂ic/∂vc sits at (collector, collector); nudge it as a wrong Early derivative would.
    binder.matrix[binder.slot(order[0], order[0])] *= 1 + 1e-4;
    expect(() => checkContract(binder, stamped, bjtCurrents(bjt, order), x)).toThrow();
  });
});

/*
 * A step on a held linearisation (newton.ts, reuseAcceptance) corrects the tangent taken at the
 * held point with `stampHeldRemainder`: the exponentials' Taylor remainder e^x − 1 − x (A&S 4.2.1),
 * carried through the transistor's Early factor and betas. Tangent plus remainder must give the
 * model's own currents at the new point, to the series' truncation (x⁶/720, under 1e-13 here).
 */
describe('device contract: the held remainder', () => {
  /** The tangent at the last stampAt, plus the device's held remainder, as currents into each unknown at x. */
  function heldCurrents(binder: DenseBinder, device: { stampHeldRemainder(rhs: Float64Array, x: Float64Array): void }, x: Float64Array) {
    const n = binder.size;
    const remainder = new Float64Array(DenseBinder.N + 1);
    device.stampHeldRemainder(remainder, x);
    const tangent = new Float64Array(n);
    const corrected = new Float64Array(n);
    let magnitude = 0;
    for (let r = 0; r < n; r++) {
      let s = -binder.rhsVector[r];
      magnitude = Math.max(magnitude, Math.abs(binder.rhsVector[r]), Math.abs(remainder[r]));
      for (let c = 0; c < n; c++) {
        s += binder.entry(r, c) * x[c];
        magnitude = Math.max(magnitude, Math.abs(binder.entry(r, c) * x[c]));
      }
      tangent[r] = s;
      corrected[r] = s - remainder[r];
    }
    return { tangent, corrected, magnitude };
  }
  /** Up to ±1 mV from the held point: |x| ≤ 0.04 for n = 1. */
  const nudge = fc.double({ min: -1e-3, max: 1e-3, noNaN: true });

  for (const { kind, model, light } of [
    { kind: 'npn', model: NPN, light: 0 },
    { kind: 'pnp', model: PNP, light: 0 },
    { kind: 'phototransistor', model: PHOTO, light: 5e-6 },
  ] as const) {
    it(`${kind}: tangent at (vbe, vbc) plus the held remainder equals pinCurrents() 1 mV away within 1e-9 (the tangent alone does not)`, () => {
      const p = kind === 'pnp' ? -1 : 1;
      fc.assert(
        fc.property(junctionVolts, junctionVolts, nudge, nudge, (vbe, vbc, dbe, dbc) => {
          const binder = new DenseBinder(KELVIN);
          const { bjt, order, base } = makeBjt(kind, model, binder, light);
          binder.stampAt(bjt, binder.vector({ [base]: 0, e: -p * vbe, c: -p * vbc }));
          const x = binder.vector({ [base]: 0, e: -p * (vbe + dbe), c: -p * (vbc + dbc) });
          const exact = bjtCurrents(bjt, order)(x);
          const { corrected, magnitude } = heldCurrents(binder, bjt, x);
          const scale = Math.max(...exact.map(Math.abs), 1e-15);
          for (let r = 0; r < 3; r++) expect(Math.abs(corrected[r] - exact[r])).toBeLessThanOrEqual(1e-9 * scale + 64 * EPS * magnitude);
        }),
        RUNS,
      );
      // In forward activity, 1 mV on vbe: the tangent alone is off by about ½(1 mV / VT)² = 7e-4 of the collector current.
      const binder = new DenseBinder(KELVIN);
      const { bjt, order, base } = makeBjt(kind, model, binder, light);
      binder.stampAt(bjt, binder.vector({ [base]: 0, e: -p * 0.65, c: p * 2 }));
      const x = binder.vector({ [base]: 0, e: -p * 0.651, c: p * 2 });
      const exact = bjtCurrents(bjt, order)(x)[order[0]];
      const { tangent, corrected } = heldCurrents(binder, bjt, x);
      expect(Math.abs(tangent[order[0]] - exact) / Math.abs(exact)).toBeGreaterThan(5e-4);
      expect(Math.abs(corrected[order[0]] - exact) / Math.abs(exact)).toBeLessThan(1e-9);
    });
  }

  for (const model of [DIODE, LED]) {
    it(`${model.kind}: tangent at v plus the held remainder equals current() 1 mV away within 1e-9`, () => {
      fc.assert(
        fc.property(junctionVolts, nudge, (v, dv) => {
          const binder = new DenseBinder(KELVIN);
          const diode = new Diode('D1', ['a', 'gnd'], { ...model, seriesResistance: 0 }, binder);
          binder.stampAt(diode, binder.vector({ a: v }));
          const x = binder.vector({ a: v + dv });
          const exact = diode.current(x);
          const { corrected, magnitude } = heldCurrents(binder, diode, x);
          expect(Math.abs(corrected[0] - exact)).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(exact), 1e-15) + 64 * EPS * magnitude);
        }),
        RUNS,
      );
    });
  }
});
