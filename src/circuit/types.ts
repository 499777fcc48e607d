/**
 * A circuit after parsing and validation: every value a number in SI units,
 * every model resolved to its full parameter set. The solver reads only this.
 * The file format (`glowtalk.circuit/1`) is described in docs/circuit-format.md.
 */

/** A time-dependent addition to a source's `dc` value. */
export type Wave =
  /** amplitude·sin(2π·frequency·(t − delay) + phase), zero before `delay`. */
  | { shape: 'sine'; amplitude: number; frequencyHertz: number; phaseDegrees: number; delaySeconds: number }
  /** Piecewise linear through (seconds, value) points, held at the ends. */
  | { shape: 'points'; points: ReadonlyArray<readonly [number, number]> }
  /** Driven sample by sample from the block upstream in a signal chain. */
  | { shape: 'upstream' };

export interface DiodeModel {
  kind: 'diode';
  saturationCurrent: number; // A
  emissionCoefficient: number; // 1
  seriesResistance: number; // Ω (0 = none)
  junctionCapacitance: number; // F, constant
}

export interface LedModel extends Omit<DiodeModel, 'kind'> {
  kind: 'led';
  wavelength: number; // m
  quantumEfficiency: number; // photons out per electron through the junction
}

/** Ebers–Moll transport form with a forward Early voltage (see docs/devices.md). */
export interface BjtModel {
  kind: 'npn' | 'pnp';
  saturationCurrent: number; // A
  forwardBeta: number;
  reverseBeta: number;
  earlyVoltage: number; // V; Infinity = no Early effect
  emissionCoefficient: number;
  baseEmitterCapacitance: number; // F, constant
  baseCollectorCapacitance: number; // F, constant
  /** Ohmic resistance in series with the collector, Ω (0 = none; an addition to the Ebers–Moll core). */
  collectorResistance: number;
}

export interface PhototransistorModel extends Omit<BjtModel, 'kind'> {
  kind: 'phototransistor';
  responsivity: number; // A/W of light reaching the part, injected collector→base
}

export type Model = DiodeModel | LedModel | BjtModel | PhototransistorModel;

/** A drive: steady value plus optional wave. */
export interface Drive {
  dc: number;
  wave?: Wave;
}

interface PartBase {
  ref: string;
  /** Node names; "gnd" is ground. */
  pins: readonly string[];
}

export type Part =
  | (PartBase & { kind: 'resistor' | 'capacitor' | 'inductor'; value: number })
  | (PartBase & { kind: 'voltage-source' | 'current-source' } & Drive)
  | (PartBase & { kind: 'diode'; modelName: string; model: DiodeModel })
  | (PartBase & { kind: 'led'; modelName: string; model: LedModel })
  | (PartBase & { kind: 'npn' | 'pnp'; modelName: string; model: BjtModel })
  /** pins [collector, emitter] (base internal) or [collector, base, emitter]; `light` in watts. */
  | (PartBase & { kind: 'phototransistor'; modelName: string; model: PhototransistorModel; light: Drive });

export type PartKind = Part['kind'];

export interface Circuit {
  title?: string;
  temperatureCelsius: number;
  parts: Part[];
}

export const GROUND = 'gnd';
