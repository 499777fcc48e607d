import { describe, expect, it } from 'vitest';
import { biasPoint } from '../../src/solver/bias-report.ts';
import { celsiusToKelvin, thermalVoltage } from '../../src/units/constants.ts';
import { circuitOf, type PartEntry } from '../helpers/circuits.ts';

/*
 * Figures every analog designer carries in their head, checked on the
 * built-in generic models through the solver. These are rules of the trade:
 * common practice, no source (unless a check says otherwise).
 */

type TwoTerminalBias = { voltage: number; current: number };

describe('rules of the trade on the built-in models', () => {
  it('a small-signal NPN (generic-npn) at 1 mA emitter current has VBE ≈ 0.65 V ± 0.05 (common practice, no source)', () => {
    const report = biasPoint(
      circuitOf([
        { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 5 },
        { ref: 'VEE', kind: 'voltage-source', pins: ['vee', 'gnd'], dc: -5 },
        { ref: 'Q1', kind: 'npn', pins: ['vcc', 'gnd', 'e'], model: 'generic-npn' },
        { ref: 'IE', kind: 'current-source', pins: ['e', 'vee'], dc: 1e-3 },
      ]),
    );
    const vbe = 0 - report.nodes.e;
    expect(vbe).toBeGreaterThan(0.6);
    expect(vbe).toBeLessThan(0.7);
    expect((report.parts.Q1 as { region: string }).region).toBe('active');
  });

  /** Saturation with IC and IB = IC/10 forced by current sources (forced beta 10). */
  function saturation(model: string, models: Record<string, unknown> = {}, collectorAmperes = 1e-3) {
    const parts: PartEntry[] = [
      { ref: 'IC', kind: 'current-source', pins: ['gnd', 'c'], dc: collectorAmperes },
      { ref: 'IB', kind: 'current-source', pins: ['gnd', 'b'], dc: collectorAmperes / 10 },
      { ref: 'Q1', kind: 'npn', pins: ['c', 'b', 'gnd'], model },
    ];
    const report = biasPoint(circuitOf(parts, { models }));
    return { vce: report.nodes.c, region: (report.parts.Q1 as { region: string }).region };
  }

  // The Ebers–Moll core alone saturates near 50 mV at 1 mA; the rule's 0.2 V comes from the
  // ohmic collector resistance at a saturation test current of 10 mA (condition from memory).
  it('VCE(sat) ≈ 0.2 V ± 0.1 at 10 mA and forced beta 10 for generic-npn (common practice, no source)', () => {
    const { vce, region } = saturation('generic-npn', {}, 10e-3);
    expect(region).toBe('saturation');
    expect(vce).toBeGreaterThan(0.1);
    expect(vce).toBeLessThan(0.3);
  });

  it('VCE(sat) at forced beta 10 equals the Ebers–Moll value (Ebers & Moll, Proc. IRE 42, 1954) for a model without Early effect', () => {
    const saturationAmperes = 1e-14;
    const forwardBeta = 200;
    const reverseBeta = 2;
    const { vce, region } = saturation('q', { q: { kind: 'npn', saturationCurrent: saturationAmperes, forwardBeta, reverseBeta } });
    expect(region).toBe('saturation');
    // Ebers–Moll transport form with A = Is·e^(vbe/VT), B = Is·e^(vbc/VT) (the ±Is and gmin terms are 1e-10 of the currents):
    //   IC = A − B·(1 + 1/βR),  IB = A/βF + B/βR  ⇒  B = (βF·IB − IC)/(βF/βR + 1 + 1/βR),  VCE = VT·ln(A/B).
    const ic = 1e-3;
    const ib = 1e-4;
    const b = (forwardBeta * ib - ic) / (forwardBeta / reverseBeta + 1 + 1 / reverseBeta);
    const a = ic + b * (1 + 1 / reverseBeta);
    const want = thermalVoltage(celsiusToKelvin(27)) * Math.log(a / b);
    // Measured: 49.7407219 mV against 49.7407216 mV.
    expect(vce).toBeCloseTo(want, 8);
  });

  it('kT/q is 25.852 mV at 300 K from the exact SI 2019 constants (BIPM SI Brochure, 9th ed.) and ≈ 26 mV at room temperature (common practice, no source)', () => {
    const exact = (1.380649e-23 * 300) / 1.602176634e-19;
    expect(thermalVoltage(300)).toBeCloseTo(exact, 15);
    expect(thermalVoltage(300)).toBeCloseTo(0.025852, 6);
    for (const celsius of [20, 25, 27]) expect(Math.abs(thermalVoltage(celsiusToKelvin(celsius)) - 0.026)).toBeLessThan(0.001);
  });

  it('a blue LED (generic-blue-led) drops about 2.8 V ± 0.2 at 0.5 mA (common practice, no source)', () => {
    const report = biasPoint(
      circuitOf([
        { ref: 'I1', kind: 'current-source', pins: ['gnd', 'a'], dc: 0.5e-3 },
        { ref: 'D1', kind: 'led', pins: ['a', 'gnd'], model: 'generic-blue-led' },
      ]),
    );
    const led = report.parts.D1 as TwoTerminalBias;
    expect(led.current).toBeCloseTo(0.5e-3, 12);
    expect(Math.abs(led.voltage - 2.8)).toBeLessThan(0.2);
  });
});
