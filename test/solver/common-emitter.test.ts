import { describe, expect, it } from 'vitest';
import { biasPoint } from '../../src/solver/bias-report.ts';
import { celsiusToKelvin, thermalVoltage } from '../../src/units/constants.ts';
import { circuitOf, transientTrace } from '../helpers/circuits.ts';
import { harmonicPhasor } from '../helpers/dft.ts';

/*
 * Small-signal voltage gain of a common-emitter stage (ideal source on the
 * base, emitter grounded, collector load RC) against −gm·(RC ‖ ro) with
 * gm = IC/VT (Sedra & Smith, Microelectronic Circuits, the CE amplifier with
 * the hybrid-π model).
 *
 * ro for this model's Early form. The contract is
 *   ic = (iF − iR)·(1 − vbc/VA) − iR/βR,  iF = Is(e^(vbe/VT) − 1), iR = Is(e^(vbc/VT) − 1).
 * In forward activity vbc ≪ 0, so iR ≈ −Is is constant. At fixed vbe,
 * vbc = vbe − vce, hence
 *   1/ro = ∂ic/∂vce = −∂ic/∂vbc = (iF − iR)/VA,
 * and since IC = (iF − iR)(1 − VBC/VA) (dropping Is/βR),
 *   ro = VA·(1 − VBC/VA)/IC = (VA − VBC)/IC   exactly.
 * (Also ∂ic/∂vbe at fixed vce is IC/VT − 1/ro, because vbc moves with vbe;
 * the textbook gm = IC/VT overstates it by VT/(VA − VBC), about 0.05 % here.)
 */

const CELSIUS = 27;
const VT = thermalVoltage(celsiusToKelvin(CELSIUS));
const EARLY_VOLTS = 50;
const LOAD_OHMS = 4700;
const SIGNAL_VOLTS = 50e-6;
const SAMPLES = 32;

describe('common-emitter stage, small-signal gain', () => {
  const circuit = circuitOf(
    [
      { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 10 },
      { ref: 'RC', kind: 'resistor', pins: ['vcc', 'c'], value: LOAD_OHMS },
      { ref: 'VB', kind: 'voltage-source', pins: ['b', 'gnd'], dc: 0.655, wave: { shape: 'sine', amplitude: SIGNAL_VOLTS, frequency: 1000 } },
      { ref: 'Q1', kind: 'npn', pins: ['c', 'b', 'gnd'], model: 'q' },
    ],
    { temperature: CELSIUS, models: { q: { kind: 'npn', saturationCurrent: 1e-14, forwardBeta: 100, earlyVoltage: EARLY_VOLTS } } },
  );

  it('equals −gm·(RC ‖ ro) with gm = IC/VT and ro = (VA − VBC)/IC within 0.5 %', () => {
    const bias = biasPoint(circuit);
    const q = bias.parts.Q1 as { currents: { collector: number }; region: string };
    expect(q.region).toBe('active');
    const collectorAmperes = q.currents.collector;
    const vbc = bias.nodes.b - bias.nodes.c;
    const gm = collectorAmperes / VT;
    const ro = (EARLY_VOLTS - vbc) / collectorAmperes;
    const parallel = (LOAD_OHMS * ro) / (LOAD_OHMS + ro);

    const trace = transientTrace(circuit, { stopSeconds: 1e-3, stepSeconds: 1e-3 / SAMPLES, mode: 'fixed' }, ['b', 'c']);
    const vin = harmonicPhasor(trace.values.b.slice(1), 1);
    const vout = harmonicPhasor(trace.values.c.slice(1), 1);
    // Complex ratio vout/vin: real and negative (an inverting stage, no reactances).
    const norm = vin.re * vin.re + vin.im * vin.im;
    const gainRe = (vout.re * vin.re + vout.im * vin.im) / norm;
    const gainIm = (vout.im * vin.re - vout.re * vin.im) / norm;
    expect(Math.abs(gainIm)).toBeLessThan(1e-6 * Math.abs(gainRe));

    const textbook = -gm * parallel;
    // Measured: gain −179.44, relative difference −4.8e-4 (the feed-forward 1/ro term above).
    expect(Math.abs(gainRe / textbook - 1)).toBeLessThan(0.005);
    // With ∂ic/∂vbe|vce = gm − 1/ro the small-signal result is exact up to the O(v²) compression of a 50 µV drive (measured 2.4e-7).
    expect(Math.abs(gainRe / (-(gm - 1 / ro) * parallel) - 1)).toBeLessThan(1e-4);
  });
});
