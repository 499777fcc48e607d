/**
 * Device model parameters: what each model kind accepts, defaults, and the
 * built-in generic models a part may name without defining them.
 *
 * Every built-in value below is from memory / common practice, no source:
 * chosen so the Shockley equation V = n·VT·ln(I/Is + 1) + I·Rs at 27 °C lands
 * in the usual ranges (small-signal NPN about 0.65 V at 1 mA, red LED about
 * 2.0 V at 20 mA, blue LED about 2.8 V at 0.5 mA and 3.2 V at 20 mA). The test
 * test/circuit/models.test.ts checks those figures.
 */
import type { BjtModel, DiodeModel, LedModel, Model, PhototransistorModel } from './types.ts';

export type ModelKind = Model['kind'];
export const MODEL_KINDS = ['diode', 'led', 'npn', 'pnp', 'phototransistor'] as const satisfies readonly ModelKind[];

export type ModelParameterName =
  | Exclude<keyof DiodeModel | keyof LedModel | keyof BjtModel | keyof PhototransistorModel, 'kind'>;

/** Parameters each kind accepts; `null` = required, a number = default when omitted. */
const DIODE_PARAMETERS = {
  saturationCurrent: null,
  emissionCoefficient: 1,
  seriesResistance: 0,
  junctionCapacitance: 0,
} as const;
const BJT_PARAMETERS = {
  saturationCurrent: null,
  forwardBeta: null,
  reverseBeta: 1,
  // Omitted = no Early effect.
  earlyVoltage: Infinity,
  emissionCoefficient: 1,
  baseEmitterCapacitance: 0,
  baseCollectorCapacitance: 0,
  collectorResistance: 0,
} as const;

export const MODEL_PARAMETERS: Readonly<Record<ModelKind, Readonly<Partial<Record<ModelParameterName, number | null>>>>> = {
  diode: DIODE_PARAMETERS,
  led: { ...DIODE_PARAMETERS, wavelength: null, quantumEfficiency: null },
  npn: BJT_PARAMETERS,
  pnp: BJT_PARAMETERS,
  phototransistor: { ...BJT_PARAMETERS, responsivity: null },
};

/**
 * Builds a full model of `kind` from the parameters given in a file. Returns
 * the model, or the name of the first parameter that is missing or not
 * allowed for this kind (the caller turns that into an InputError).
 */
export function completeModel(
  kind: ModelKind,
  given: Readonly<Partial<Record<ModelParameterName, number>>>,
): { ok: true; model: Model } | { ok: false; parameter: string; problem: 'missing' | 'not-allowed' } {
  const allowed = MODEL_PARAMETERS[kind];
  for (const name of Object.keys(given)) {
    if (!(name in allowed)) return { ok: false, parameter: name, problem: 'not-allowed' };
  }
  const model: Record<string, number | string> = { kind };
  for (const [name, fallback] of Object.entries(allowed)) {
    const value = given[name as ModelParameterName] ?? fallback;
    if (value === null || value === undefined) return { ok: false, parameter: name, problem: 'missing' };
    model[name] = value;
  }
  return { ok: true, model: model as unknown as Model };
}

const smallSignalNpn: BjtModel = {
  kind: 'npn',
  saturationCurrent: 1e-14, // VBE ≈ 0.655 V at 1 mA
  forwardBeta: 200,
  reverseBeta: 2,
  earlyVoltage: 100,
  emissionCoefficient: 1,
  baseEmitterCapacitance: 20e-12, // junction plus diffusion near 1 mA, held constant
  baseCollectorCapacitance: 4e-12,
  collectorResistance: 12, // bulk collector: VCE(sat) near 0.2 V at 10 mA, forced beta 10
};

const powerNpn: BjtModel = {
  kind: 'npn',
  saturationCurrent: 1e-12, // VBE ≈ 0.65 V at 100 mA, ≈ 0.71 V at 1 A
  forwardBeta: 60,
  reverseBeta: 3,
  earlyVoltage: 80,
  emissionCoefficient: 1,
  baseEmitterCapacitance: 300e-12,
  baseCollectorCapacitance: 80e-12,
  collectorResistance: 0.3,
};

const redLed: LedModel = {
  kind: 'led',
  saturationCurrent: 1e-18, // V ≈ 2.0 V at 20 mA, ≈ 1.7 V at 1 mA
  emissionCoefficient: 1.9,
  seriesResistance: 8,
  junctionCapacitance: 20e-12,
  wavelength: 630e-9,
  quantumEfficiency: 0.1,
};

/** Built-in generic models, by name. A file's own "models" entry of the same name wins for that file. */
export const BUILT_IN_MODELS: Readonly<Record<string, Model>> = {
  'generic-npn': smallSignalNpn,
  'generic-pnp': { ...smallSignalNpn, kind: 'pnp', forwardBeta: 180, earlyVoltage: 60, baseCollectorCapacitance: 6e-12 },
  'generic-power-npn': powerNpn,
  'generic-power-pnp': { ...powerNpn, kind: 'pnp', forwardBeta: 50, earlyVoltage: 60, baseCollectorCapacitance: 120e-12 },
  'generic-silicon-diode': {
    kind: 'diode',
    saturationCurrent: 3e-9, // small-signal switching diode: ≈ 0.59 V at 1 mA, ≈ 0.70 V at 10 mA
    emissionCoefficient: 1.8,
    seriesResistance: 0.5,
    junctionCapacitance: 2e-12,
  },
  'generic-red-led': redLed,
  // AlGaInP amber: ≈ 2.08 V at 20 mA.
  'generic-amber-led': { ...redLed, saturationCurrent: 1e-19, seriesResistance: 6, wavelength: 590e-9, quantumEfficiency: 0.08 },
  // InGaN green: ≈ 2.8 V at 0.5 mA, ≈ 3.27 V at 20 mA; green InGaN is the least efficient colour.
  'generic-green-led': {
    kind: 'led',
    saturationCurrent: 1e-18,
    emissionCoefficient: 3.2,
    seriesResistance: 8,
    junctionCapacitance: 30e-12,
    wavelength: 525e-9,
    quantumEfficiency: 0.1,
  },
  // InGaN blue: ≈ 2.81 V at 0.5 mA, ≈ 3.21 V at 20 mA.
  'generic-blue-led': {
    kind: 'led',
    saturationCurrent: 1e-19,
    emissionCoefficient: 3,
    seriesResistance: 6,
    junctionCapacitance: 30e-12,
    wavelength: 460e-9,
    quantumEfficiency: 0.2,
  },
  // GaAlAs infrared: ≈ 1.49 V at 20 mA, ≈ 1.68 V at 100 mA.
  'generic-infrared-led': {
    kind: 'led',
    saturationCurrent: 1e-17,
    emissionCoefficient: 1.6,
    seriesResistance: 1.5,
    junctionCapacitance: 50e-12,
    wavelength: 850e-9,
    quantumEfficiency: 0.2,
  },
  'generic-phototransistor': {
    kind: 'phototransistor',
    saturationCurrent: 2e-14,
    forwardBeta: 500,
    reverseBeta: 2,
    earlyVoltage: 50,
    emissionCoefficient: 1,
    baseEmitterCapacitance: 25e-12,
    baseCollectorCapacitance: 12e-12, // large collector-base photodiode area
    collectorResistance: 20,
    responsivity: 0.4, // base photocurrent per watt near the silicon peak (~850 nm, quantum efficiency ≈ 0.6)
  },
};

export function builtInModelNames(kind: ModelKind): string[] {
  return Object.entries(BUILT_IN_MODELS)
    .filter(([, model]) => model.kind === kind)
    .map(([name]) => name);
}
