/**
 * Tolerance runs: the link rendered with its parts drawn at random inside
 * their declared tolerances (Monte Carlo), or all at their low or high ends
 * (corners). What varies, per part of both circuits:
 *   - resistors and capacitors: value ± a percentage;
 *   - NPN/PNP transistors, and phototransistors separately: forward current
 *     gain anywhere in a stated range;
 *   - LEDs: forward voltage ± a spread in volts, made by scaling the
 *     saturation current. From the Shockley law V = n·VT·ln(I/Is) at a fixed
 *     current I, Is → k·Is shifts V by −n·VT·ln(k), so a shift ΔV is
 *     k = exp(−ΔV/(n·VT)), VT = kT/q at the circuit's temperature;
 *   - LEDs: emitter (external quantum) efficiency ± a percentage.
 * Run i draws from a generator seeded by (seed, i) alone, the parameters in a
 * fixed order, so a run's values do not depend on how many runs or workers
 * there are. "uniform" draws anywhere in the range; "normal" draws a normal
 * distribution with the range as ±3σ, redrawing values outside it.
 */
import type { Circuit, Part } from '../circuit/types.ts';
import { InputError } from '../errors.ts';
import { SeededRandom } from '../numeric/random.ts';
import type { Scenario } from '../scenario/types.ts';
import { celsiusToKelvin, thermalVoltage } from '../units/constants.ts';

export interface ToleranceSpec {
  resistorPercent: number;
  capacitorPercent: number;
  /** Forward current gain range of NPN and PNP transistors; null keeps each model's own. */
  betaRange: [number, number] | null;
  /** The same for phototransistors. */
  photoBetaRange: [number, number] | null;
  /** LED forward-voltage spread, ± volts at a given current. */
  ledForwardVolts: number;
  /** LED emitter efficiency, ± percent. */
  emitterEfficiencyPercent: number;
  distribution: 'uniform' | 'normal';
  /** Parts kept at their nominal values: "R3" (either circuit) or "transmitter.R3". */
  fixed: string[];
}

export type ToleranceQuantity = 'value' | 'forwardBeta' | 'forwardVoltageShift' | 'quantumEfficiency';

export interface ToleranceParameter {
  /** e.g. "transmitter.R3.value", "receiver.Q1.forwardBeta", "transmitter.D1.forwardVoltageShift". */
  key: string;
  circuit: 'transmitter' | 'receiver';
  ref: string;
  quantity: ToleranceQuantity;
  unit: string;
  nominal: number;
  low: number;
  high: number;
}

export interface ToleranceRun {
  /** "nominal", "low", "high" or "run 17". */
  label: string;
  /** Monte Carlo run index, null for nominal and corners. */
  index: number | null;
  /** One value per parameter, in parameter order. */
  values: number[];
}

export function checkToleranceSpec(spec: ToleranceSpec): void {
  const percent = (name: string, value: number) => {
    if (!(Number.isFinite(value) && value >= 0 && value < 100)) throw new InputError(name, 'a tolerance from 0 to below 100 %', `got ${value}`);
  };
  percent('--resistors', spec.resistorPercent);
  percent('--capacitors', spec.capacitorPercent);
  percent('--efficiency', spec.emitterEfficiencyPercent);
  if (!(Number.isFinite(spec.ledForwardVolts) && spec.ledForwardVolts >= 0 && spec.ledForwardVolts <= 1)) {
    throw new InputError('--led-vf', 'a forward-voltage spread from 0 to 1 V', `got ${spec.ledForwardVolts}`);
  }
  for (const [name, range] of [['--beta', spec.betaRange], ['--photo-beta', spec.photoBetaRange]] as const) {
    if (range && !(range[0] > 0 && range[1] >= range[0] && Number.isFinite(range[1]))) {
      throw new InputError(name, 'a current-gain range MIN:MAX with 0 < MIN <= MAX', `got ${range[0]}:${range[1]}`);
    }
  }
}

/** The parameters a spec varies in a scenario, in a fixed order (transmitter then receiver, part order). */
export function toleranceParameters(scenario: Scenario, spec: ToleranceSpec): ToleranceParameter[] {
  checkToleranceSpec(spec);
  const parameters: ToleranceParameter[] = [];
  const known = new Set<string>();
  for (const circuitName of ['transmitter', 'receiver'] as const) {
    for (const part of scenario[circuitName].circuit.parts) {
      known.add(part.ref);
      known.add(`${circuitName}.${part.ref}`);
      if (spec.fixed.includes(part.ref) || spec.fixed.includes(`${circuitName}.${part.ref}`)) continue;
      const add = (quantity: ToleranceQuantity, unit: string, nominal: number, low: number, high: number) => {
        if (high > low) parameters.push({ key: `${circuitName}.${part.ref}.${quantity}`, circuit: circuitName, ref: part.ref, quantity, unit, nominal, low, high });
      };
      const relative = (nominal: number, percent: number): [number, number] => [nominal * (1 - percent / 100), nominal * (1 + percent / 100)];
      if (part.kind === 'resistor') add('value', 'ohm', part.value, ...relative(part.value, spec.resistorPercent));
      else if (part.kind === 'capacitor') add('value', 'F', part.value, ...relative(part.value, spec.capacitorPercent));
      else if ((part.kind === 'npn' || part.kind === 'pnp') && spec.betaRange) add('forwardBeta', '1', part.model.forwardBeta, ...spec.betaRange);
      else if (part.kind === 'phototransistor' && spec.photoBetaRange) add('forwardBeta', '1', part.model.forwardBeta, ...spec.photoBetaRange);
      else if (part.kind === 'led') {
        add('forwardVoltageShift', 'V', 0, -spec.ledForwardVolts, spec.ledForwardVolts);
        add('quantumEfficiency', '1', part.model.quantumEfficiency, ...relative(part.model.quantumEfficiency, spec.emitterEfficiencyPercent));
      }
    }
  }
  for (const ref of spec.fixed) {
    if (!known.has(ref)) throw new InputError('--fixed', 'refs of parts in the circuits, e.g. R3 or transmitter.R3', `no part "${ref}"`);
  }
  return parameters;
}

/** 32-bit integer hash (the splitmix32 output mix), to seed each run from (seed, index). */
function mix32(x: number): number {
  x = Math.imul(x ^ (x >>> 16), 0x85ebca6b);
  x = Math.imul(x ^ (x >>> 13), 0xc2b2ae35);
  return (x ^ (x >>> 16)) >>> 0;
}

export function runSeed(seed: number, index: number): number {
  return mix32((seed >>> 0) ^ mix32((index + 0x9e3779b9) >>> 0));
}

/** Monte Carlo run `index`: one draw per parameter, from (seed, index) only. */
export function drawRun(parameters: readonly ToleranceParameter[], seed: number, index: number, distribution: ToleranceSpec['distribution']): ToleranceRun {
  const random = new SeededRandom(runSeed(seed, index));
  const values = parameters.map((p) => {
    if (distribution === 'uniform') return p.low + (p.high - p.low) * random.uniform();
    const mean = (p.low + p.high) / 2;
    const sigma = (p.high - p.low) / 6;
    for (let attempt = 0; attempt < 100; attempt++) {
      const value = mean + sigma * random.normal();
      if (value >= p.low && value <= p.high) return value;
    }
    return mean; // 100 draws beyond 3σ in a row: practically never (about 0.27 %^100)
  });
  return { label: `run ${index}`, index, values };
}

export function nominalRun(parameters: readonly ToleranceParameter[]): ToleranceRun {
  return { label: 'nominal', index: null, values: parameters.map((p) => p.nominal) };
}

/** Every parameter at the low end of its range, or every one at the high end. */
export function cornerRuns(parameters: readonly ToleranceParameter[]): ToleranceRun[] {
  return [
    { label: 'low', index: null, values: parameters.map((p) => p.low) },
    { label: 'high', index: null, values: parameters.map((p) => p.high) },
  ];
}

/** The scenario with a run's values in its parts (a copy; models are copied per part, never shared). */
export function applyRun(scenario: Scenario, parameters: readonly ToleranceParameter[], run: ToleranceRun): Scenario {
  const change = (circuitName: 'transmitter' | 'receiver', circuit: Circuit): Circuit => {
    const kelvin = celsiusToKelvin(circuit.temperatureCelsius);
    const parts = circuit.parts.map((part): Part => {
      let copy: Part | null = null;
      parameters.forEach((p, i) => {
        if (p.circuit !== circuitName || p.ref !== part.ref) return;
        copy ??= 'model' in part ? ({ ...part, model: { ...part.model } } as Part) : { ...part };
        const value = run.values[i];
        const target = copy as Part & { value?: number; model?: Record<string, number | string> };
        if (p.quantity === 'value') target.value = value;
        else if (p.quantity === 'forwardBeta') target.model!.forwardBeta = value;
        else if (p.quantity === 'quantumEfficiency') target.model!.quantumEfficiency = value;
        else {
          const model = target.model as { saturationCurrent: number; emissionCoefficient: number };
          model.saturationCurrent *= Math.exp(-value / (model.emissionCoefficient * thermalVoltage(kelvin)));
        }
      });
      return copy ?? part;
    });
    return { ...circuit, parts };
  };
  return {
    ...scenario,
    transmitter: { ...scenario.transmitter, circuit: change('transmitter', scenario.transmitter.circuit) },
    receiver: { ...scenario.receiver, circuit: change('receiver', scenario.receiver.circuit) },
  };
}
