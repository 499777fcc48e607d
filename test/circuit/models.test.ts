import { describe, expect, it } from 'vitest';
import { BUILT_IN_MODELS, MODEL_PARAMETERS, completeModel } from '../../src/circuit/models.ts';
import type { BjtModel, DiodeModel, LedModel, Model, PhototransistorModel } from '../../src/circuit/types.ts';
import { celsiusToKelvin, thermalVoltage } from '../../src/units/constants.ts';

const VT_27C = thermalVoltage(celsiusToKelvin(27));

/** Shockley diode equation with series resistance, solved for V: V = n·VT·ln(I/Is + 1) + I·Rs. */
function forwardVolts(model: DiodeModel | LedModel, amperes: number): number {
  return model.emissionCoefficient * VT_27C * Math.log(amperes / model.saturationCurrent + 1) + amperes * model.seriesResistance;
}

/** Forward-active VBE from the transport current Ic ≈ Is·exp(VBE/(n·VT)) (Ebers–Moll, Vbc ≪ 0, Early factor ≈ 1). */
function baseEmitterVolts(model: BjtModel | PhototransistorModel, collectorAmperes: number): number {
  return model.emissionCoefficient * VT_27C * Math.log(collectorAmperes / model.saturationCurrent + 1);
}

function model<K extends Model['kind']>(name: string, kind: K): Extract<Model, { kind: K }> {
  const found = BUILT_IN_MODELS[name];
  expect(found?.kind).toBe(kind);
  return found as Extract<Model, { kind: K }>;
}

describe('built-in models', () => {
  it('are all generic (no brands or part numbers) and have exactly the parameters of their kind', () => {
    for (const [name, built] of Object.entries(BUILT_IN_MODELS)) {
      expect(name).toMatch(/^generic-[a-z-]+$/);
      const { kind, ...parameters } = built;
      expect(Object.keys(parameters).sort()).toEqual(Object.keys(MODEL_PARAMETERS[kind]).sort());
      expect(completeModel(kind, parameters)).toEqual({ ok: true, model: built });
      for (const value of Object.values(parameters)) expect(value).toBeGreaterThanOrEqual(0);
    }
  });

  it('include every generic model the format documents', () => {
    expect(Object.keys(BUILT_IN_MODELS).sort()).toEqual(
      [
        'generic-npn',
        'generic-pnp',
        'generic-power-npn',
        'generic-power-pnp',
        'generic-silicon-diode',
        'generic-red-led',
        'generic-amber-led',
        'generic-green-led',
        'generic-blue-led',
        'generic-infrared-led',
        'generic-phototransistor',
      ].sort(),
    );
  });

  // Small-signal silicon NPN/PNP near 1 mA: VBE ≈ 0.65 V (common practice, no source).
  for (const name of ['generic-npn', 'generic-pnp'] as const) {
    it(`${name} has |VBE| between 0.62 and 0.68 V at 1 mA and 27 °C`, () => {
      const bjt = BUILT_IN_MODELS[name] as BjtModel;
      const volts = baseEmitterVolts(bjt, 1e-3);
      expect(volts).toBeGreaterThan(0.62);
      expect(volts).toBeLessThan(0.68);
    });
  }

  // Power transistors: VBE about 0.6–0.7 V at 100 mA, 0.65–0.8 V at 1 A ignoring high injection (from memory).
  for (const name of ['generic-power-npn', 'generic-power-pnp'] as const) {
    it(`${name} has |VBE| of 0.6–0.7 V at 100 mA and 0.65–0.8 V at 1 A`, () => {
      const bjt = BUILT_IN_MODELS[name] as BjtModel;
      expect(baseEmitterVolts(bjt, 0.1)).toBeGreaterThan(0.6);
      expect(baseEmitterVolts(bjt, 0.1)).toBeLessThan(0.7);
      expect(baseEmitterVolts(bjt, 1)).toBeGreaterThan(0.65);
      expect(baseEmitterVolts(bjt, 1)).toBeLessThan(0.8);
    });
  }

  it('generic-phototransistor has VBE near 0.6 V at 1 mA and a base responsivity below the silicon limit', () => {
    const pt = model('generic-phototransistor', 'phototransistor');
    expect(baseEmitterVolts(pt, 1e-3)).toBeGreaterThan(0.58);
    expect(baseEmitterVolts(pt, 1e-3)).toBeLessThan(0.68);
    // Ideal responsivity λ/1239.84 nm·A/W at 850 nm is 0.686 A/W (R = η·qλ/(hc), quantum efficiency η ≤ 1).
    expect(pt.responsivity).toBeLessThan(850 / 1239.84198);
    // Collector current per watt = β·R: hundreds of A/W is the usual order (from memory).
    expect(pt.forwardBeta * pt.responsivity).toBeGreaterThan(50);
  });

  // Small-signal silicon diode: ≈ 0.6 V at 1 mA, ≈ 0.7 V at 10 mA (common practice, no source).
  it('generic-silicon-diode drops 0.55–0.65 V at 1 mA and 0.65–0.75 V at 10 mA', () => {
    const diode = model('generic-silicon-diode', 'diode');
    expect(forwardVolts(diode, 1e-3)).toBeGreaterThan(0.55);
    expect(forwardVolts(diode, 1e-3)).toBeLessThan(0.65);
    expect(forwardVolts(diode, 10e-3)).toBeGreaterThan(0.65);
    expect(forwardVolts(diode, 10e-3)).toBeLessThan(0.75);
  });

  // Indicator LEDs at 20 mA (common practice, no source): red ~630 nm 1.8–2.1 V, amber ~590 nm about 2.0–2.1 V,
  // InGaN green and blue 3.0–3.4 V; GaAlAs 850 nm infrared about 1.4–1.6 V (from memory).
  const LED_WINDOWS: ReadonlyArray<readonly [string, number, number, number, number]> = [
    // name, min V, max V at 20 mA, wavelength min, max (m)
    ['generic-red-led', 1.8, 2.1, 620e-9, 640e-9],
    ['generic-amber-led', 1.95, 2.2, 585e-9, 600e-9],
    ['generic-green-led', 3.0, 3.4, 515e-9, 535e-9],
    ['generic-blue-led', 3.0, 3.4, 450e-9, 470e-9],
    ['generic-infrared-led', 1.4, 1.6, 840e-9, 860e-9],
  ];
  for (const [name, low, high, shortest, longest] of LED_WINDOWS) {
    it(`${name} drops ${low}–${high} V at 20 mA and emits between ${shortest * 1e9} and ${longest * 1e9} nm`, () => {
      const led = model(name, 'led');
      const volts = forwardVolts(led, 20e-3);
      expect(volts).toBeGreaterThan(low);
      expect(volts).toBeLessThan(high);
      expect(led.wavelength).toBeGreaterThanOrEqual(shortest);
      expect(led.wavelength).toBeLessThanOrEqual(longest);
      expect(led.quantumEfficiency).toBeGreaterThan(0);
      expect(led.quantumEfficiency).toBeLessThanOrEqual(1);
    });
  }

  it('generic-blue-led drops about 2.8 V at half a milliamp (common practice, no source)', () => {
    const volts = forwardVolts(model('generic-blue-led', 'led'), 0.5e-3);
    expect(volts).toBeGreaterThan(2.65);
    expect(volts).toBeLessThan(2.95);
  });

  it('generic-red-led starts to conduct (1 mA) between 1.6 and 1.8 V (common practice, no source)', () => {
    const volts = forwardVolts(model('generic-red-led', 'led'), 1e-3);
    expect(volts).toBeGreaterThan(1.6);
    expect(volts).toBeLessThan(1.8);
  });
});

describe('completeModel', () => {
  it('fills documented defaults and treats an omitted Early voltage as none (Infinity)', () => {
    expect(completeModel('npn', { saturationCurrent: 1e-14, forwardBeta: 150 })).toEqual({
      ok: true,
      model: {
        kind: 'npn',
        saturationCurrent: 1e-14,
        forwardBeta: 150,
        reverseBeta: 1,
        earlyVoltage: Infinity,
        emissionCoefficient: 1,
        baseEmitterCapacitance: 0,
        baseCollectorCapacitance: 0,
        collectorResistance: 0,
      },
    });
  });

  it('names the first required parameter that is missing, and a parameter of another kind', () => {
    expect(completeModel('led', { saturationCurrent: 1e-18, wavelength: 630e-9 })).toEqual({ ok: false, parameter: 'quantumEfficiency', problem: 'missing' });
    expect(completeModel('diode', { saturationCurrent: 1e-9, forwardBeta: 100 })).toEqual({ ok: false, parameter: 'forwardBeta', problem: 'not-allowed' });
  });
});
