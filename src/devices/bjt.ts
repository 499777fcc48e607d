import type { BjtModel, Drive, PhototransistorModel } from '../circuit/types.ts';
import { thermalVoltage } from '../units/constants.ts';
import type { Integrator } from '../solver/integrator.ts';
import type { KernelPart } from '../solver/kernel/plan.ts';
import { Capacitor } from './capacitor.ts';
import { JUNCTION_GMIN_SIEMENS, type Binder, type IterationContext, type PinCurrents, type ThreeTerminal } from './device.ts';
import { JunctionPoint, conductingVolts, criticalVolts, evaluateJunction, exponentialRemainder, junctionLinearisationError, limitJunctionStep } from './junction.ts';
import { Resistor, voltageAt } from './resistor.ts';
import { DriveSignal } from './wave.ts';

/**
 * Bipolar transistor [collector, base, emitter], Ebers–Moll transport form with
 * a forward Early voltage, as the circuit-file contract states (Ebers & Moll,
 * Proc. IRE 42, 1954; transport form as in Gray, Hurst, Lewis & Meyer,
 * "Analysis and Design of Analog Integrated Circuits", ch. 1):
 *   iF = Is(exp(vbe/nVT) − 1),  iR = Is(exp(vbc/nVT) − 1)
 *   iT = (iF − iR)(1 − vbc/VA)
 *   ic = iT − iR/βR,  ib = iF/βF + iR/βR
 * PNP is the mirror image (all junction voltages and currents negated).
 * Constant base–emitter and base–collector capacitances; gmin across each junction.
 * A phototransistor adds the photocurrent responsivity·P, injected across the
 * collector–base junction; with two pins its base is an internal node.
 */
export class Bjt implements ThreeTerminal {
  readonly nonlinear = true;
  /** +1 for NPN (and phototransistor), −1 for PNP. */
  private readonly polarity: number;
  private readonly c: number;
  private readonly b: number;
  private readonly e: number;
  private readonly slots: Int32Array;
  private readonly rc: number;
  private readonly rb: number;
  private readonly re: number;
  private readonly saturationAmperes: number;
  private readonly inverseForwardBeta: number;
  private readonly inverseReverseBeta: number;
  private readonly inverseEarlyVolts: number;
  private readonly emissionVolts: number;
  private readonly criticalVoltage: number;
  private readonly conductingVoltage: number;
  /** Ohmic collector resistance between the pin and the internal collector (null = none). */
  private readonly collectorOhmic: Resistor | null;
  private readonly baseEmitter: Capacitor | null;
  private readonly baseCollector: Capacitor | null;
  /** Light on a phototransistor, in watts. */
  readonly light: DriveSignal | null;
  private readonly responsivity: number;
  private photoAmperes = 0;
  private vbe = 0;
  private vbc = 0;
  private change = 0;
  private readonly forward = new JunctionPoint();
  private readonly reverse = new JunctionPoint();
  /** The last load's Is·e^(v/nVT) and conductance of each junction (kept apart: probes reuse the points above). */
  private heldForwardExponential = 0;
  private heldForwardSiemens = 0;
  private heldReverseExponential = 0;
  private heldReverseSiemens = 0;

  constructor(
    readonly ref: string,
    kind: 'npn' | 'pnp' | 'phototransistor',
    pins: readonly string[],
    model: BjtModel | PhototransistorModel,
    binder: Binder,
    light?: Drive,
  ) {
    this.polarity = kind === 'pnp' ? -1 : 1;
    const collectorPin = binder.node(pins[0]);
    if (model.collectorResistance > 0) {
      this.c = binder.internalNode(`${ref}#collector`);
      this.collectorOhmic = new Resistor(`${ref}#rc`, collectorPin, this.c, model.collectorResistance, binder);
    } else {
      this.c = collectorPin;
      this.collectorOhmic = null;
    }
    if (pins.length === 2) {
      this.b = binder.internalNode(`${ref}#base`);
      this.e = binder.node(pins[1]);
    } else {
      this.b = binder.node(pins[1]);
      this.e = binder.node(pins[2]);
    }
    const order = [this.c, this.b, this.e];
    this.slots = new Int32Array(9);
    for (let r = 0; r < 3; r++) for (let k = 0; k < 3; k++) this.slots[r * 3 + k] = binder.slot(order[r], order[k]);
    this.rc = binder.rhs(this.c);
    this.rb = binder.rhs(this.b);
    this.re = binder.rhs(this.e);
    this.saturationAmperes = model.saturationCurrent;
    this.inverseForwardBeta = 1 / model.forwardBeta;
    this.inverseReverseBeta = 1 / model.reverseBeta;
    this.inverseEarlyVolts = Number.isFinite(model.earlyVoltage) ? 1 / model.earlyVoltage : 0;
    this.emissionVolts = model.emissionCoefficient * thermalVoltage(binder.temperatureKelvin);
    this.criticalVoltage = criticalVolts(this.saturationAmperes, this.emissionVolts);
    this.conductingVoltage = conductingVolts(this.saturationAmperes, this.emissionVolts);
    this.baseEmitter =
      model.baseEmitterCapacitance > 0 ? new Capacitor(`${ref}#cbe`, this.b, this.e, model.baseEmitterCapacitance, binder) : null;
    this.baseCollector =
      model.baseCollectorCapacitance > 0 ? new Capacitor(`${ref}#cbc`, this.b, this.c, model.baseCollectorCapacitance, binder) : null;
    this.light = kind === 'phototransistor' ? new DriveSignal(light ?? { dc: 0 }) : null;
    this.responsivity = 'responsivity' in model ? model.responsivity : 0;
  }

  stampConstant(m: Float64Array, integrator: Integrator): void {
    this.collectorOhmic?.stampConstant(m);
    this.baseEmitter?.stampConstant(m, integrator);
    this.baseCollector?.stampConstant(m, integrator);
  }

  stampStep(rhs: Float64Array, integrator: Integrator, seconds: number, sourceScale: number): void {
    this.baseEmitter?.stampStep(rhs, integrator);
    this.baseCollector?.stampStep(rhs, integrator);
    if (this.light) {
      // The photocurrent is a current source inside the part (collector → base): fixed over the step.
      this.photoAmperes = sourceScale * this.responsivity * Math.max(0, this.light.valueAt(seconds));
      rhs[this.rc] -= this.photoAmperes;
      rhs[this.rb] += this.photoAmperes;
    }
  }

  load(m: Float64Array, rhs: Float64Array, x: Float64Array, context: IterationContext): void {
    const p = this.polarity;
    let vbe: number;
    let vbc: number;
    if (context.initialiseJunctions) {
      vbe = this.criticalVoltage;
      vbc = 0;
    } else {
      const vb = voltageAt(x, this.b);
      vbe = limitJunctionStep(p * (vb - voltageAt(x, this.e)), this.vbe, this.emissionVolts, this.criticalVoltage, context);
      vbc = limitJunctionStep(p * (vb - voltageAt(x, this.c)), this.vbc, this.emissionVolts, this.criticalVoltage, context);
    }
    this.change = Math.max(Math.abs(vbe - this.vbe), Math.abs(vbc - this.vbc));
    this.vbe = vbe;
    this.vbc = vbc;

    const f = this.forward;
    const r = this.reverse;
    evaluateJunction(vbe, this.saturationAmperes, this.emissionVolts, f);
    evaluateJunction(vbc, this.saturationAmperes, this.emissionVolts, r);
    this.heldForwardExponential = f.exponential;
    this.heldForwardSiemens = f.siemens;
    this.heldReverseExponential = r.exponential;
    this.heldReverseSiemens = r.siemens;
    const early = 1 - vbc * this.inverseEarlyVolts;
    const transport = f.amperes - r.amperes;
    const gmin = JUNCTION_GMIN_SIEMENS;
    // NPN-frame currents and their partial derivatives.
    const ic = transport * early - r.amperes * this.inverseReverseBeta - gmin * vbc;
    const ib = f.amperes * this.inverseForwardBeta + r.amperes * this.inverseReverseBeta + gmin * (vbe + vbc);
    const dIcDvbe = f.siemens * early;
    const dIcDvbc = -r.siemens * early - transport * this.inverseEarlyVolts - r.siemens * this.inverseReverseBeta - gmin;
    const dIbDvbe = f.siemens * this.inverseForwardBeta + gmin;
    const dIbDvbc = r.siemens * this.inverseReverseBeta + gmin;

    // Rows c, b, e; columns c, b, e (vbe = vb − ve, vbc = vb − vc in the NPN frame).
    const s = this.slots;
    m[s[0]] -= dIcDvbc;
    m[s[1]] += dIcDvbe + dIcDvbc;
    m[s[2]] -= dIcDvbe;
    m[s[3]] -= dIbDvbc;
    m[s[4]] += dIbDvbe + dIbDvbc;
    m[s[5]] -= dIbDvbe;
    m[s[6]] += dIcDvbc + dIbDvbc;
    m[s[7]] -= dIcDvbe + dIcDvbc + dIbDvbe + dIbDvbc;
    m[s[8]] += dIcDvbe + dIbDvbe;
    const equivalentC = p * (ic - dIcDvbe * vbe - dIcDvbc * vbc);
    const equivalentB = p * (ib - dIbDvbe * vbe - dIbDvbc * vbc);
    rhs[this.rc] -= equivalentC;
    rhs[this.rb] -= equivalentB;
    rhs[this.re] += equivalentC + equivalentB;
  }

  accept(x: Float64Array, integrator: Integrator): void {
    this.baseEmitter?.accept(x, integrator);
    this.baseCollector?.accept(x, integrator);
  }

  lastJunctionChange(): number {
    return this.change;
  }

  linearisationError(x: Float64Array): number {
    const p = this.polarity;
    const vb = voltageAt(x, this.b);
    const n = this.emissionVolts;
    return Math.max(
      junctionLinearisationError(p * (vb - voltageAt(x, this.e)), this.vbe, n),
      junctionLinearisationError(p * (vb - voltageAt(x, this.c)), this.vbc, n),
    );
  }

  /** The junction currents' remainders carried through the Early factor and the betas (the terms of ic and ib the tangent plane leaves out). */
  stampHeldRemainder(rhs: Float64Array, x: Float64Array): void {
    const p = this.polarity;
    const n = this.emissionVolts;
    const vb = voltageAt(x, this.b);
    const vbc = p * (vb - voltageAt(x, this.c));
    const dbe = p * (vb - voltageAt(x, this.e)) - this.vbe;
    const dbc = vbc - this.vbc;
    const dF = this.heldForwardExponential * exponentialRemainder(dbe / n);
    const dR = this.heldReverseExponential * exponentialRemainder(dbc / n);
    const dIc =
      (dF - dR) * (1 - vbc * this.inverseEarlyVolts) - (this.heldForwardSiemens * dbe - this.heldReverseSiemens * dbc) * dbc * this.inverseEarlyVolts - dR * this.inverseReverseBeta;
    const dIb = dF * this.inverseForwardBeta + dR * this.inverseReverseBeta;
    const equivalentC = p * dIc;
    const equivalentB = p * dIb;
    rhs[this.rc] -= equivalentC;
    rhs[this.rb] -= equivalentB;
    rhs[this.re] += equivalentC + equivalentB;
  }

  breakpoints(stopSeconds: number): number[] {
    return this.light?.breakpoints(stopSeconds) ?? [];
  }

  kernelParts(): KernelPart[] {
    return [
      {
        kind: 'bjt',
        collector: this.c,
        base: this.b,
        emitter: this.e,
        polarity: this.polarity,
        saturationAmperes: this.saturationAmperes,
        emissionVolts: this.emissionVolts,
        criticalVolts: this.criticalVoltage,
        inverseForwardBeta: this.inverseForwardBeta,
        inverseReverseBeta: this.inverseReverseBeta,
        inverseEarlyVolts: this.inverseEarlyVolts,
        light: this.light,
        responsivity: this.responsivity,
        state: {
          read: (into, at) => {
            into[at] = this.vbe;
            into[at + 1] = this.vbc;
            into[at + 2] = this.photoAmperes;
          },
          write: (from, at) => {
            this.vbe = from[at];
            this.vbc = from[at + 1];
            this.photoAmperes = from[at + 2];
          },
        },
      },
      ...(this.baseEmitter?.kernelParts() ?? []),
      ...(this.baseCollector?.kernelParts() ?? []),
    ];
  }

  /** NPN-frame junction voltages (vbe, vbc) at solution x. */
  junctionVolts(x: Float64Array): [number, number] {
    const vb = voltageAt(x, this.b);
    return [this.polarity * (vb - voltageAt(x, this.e)), this.polarity * (vb - voltageAt(x, this.c))];
  }

  /** Currents into each pin, junction-capacitance currents included, at solution x. */
  pinCurrents(x: Float64Array): PinCurrents {
    const [vbe, vbc] = this.junctionVolts(x);
    evaluateJunction(vbe, this.saturationAmperes, this.emissionVolts, this.forward);
    evaluateJunction(vbc, this.saturationAmperes, this.emissionVolts, this.reverse);
    const iF = this.forward.amperes;
    const iR = this.reverse.amperes;
    const gmin = JUNCTION_GMIN_SIEMENS;
    const p = this.polarity;
    const cbe = this.baseEmitter?.current() ?? 0;
    const cbc = this.baseCollector?.current() ?? 0;
    const collector =
      p * ((iF - iR) * (1 - vbc * this.inverseEarlyVolts) - iR * this.inverseReverseBeta - gmin * vbc + this.photoAmperes) - cbc;
    const base = p * (iF * this.inverseForwardBeta + iR * this.inverseReverseBeta + gmin * (vbe + vbc) - this.photoAmperes) + cbe + cbc;
    return { collector, base, emitter: -(collector + base) };
  }

  /**
   * Operating region from which junctions conduct (carry more than
   * CONDUCTING_AMPERES forward): active (BE only), saturation (both),
   * reverse (BC only), cutoff (neither).
   */
  region(x: Float64Array): 'active' | 'saturation' | 'cutoff' | 'reverse' {
    const [vbe, vbc] = this.junctionVolts(x);
    return classifyRegion(vbe > this.conductingVoltage, vbc > this.conductingVoltage);
  }

  /** Unknown indices of the (internal) collector, base and emitter (-1 = ground), and the polarity. */
  get terminals(): { collector: number; base: number; emitter: number; polarity: number } {
    return { collector: this.c, base: this.b, emitter: this.e, polarity: this.polarity };
  }

  /** The junction voltage above which this transistor's junctions count as conducting. */
  get conductingJunctionVolts(): number {
    return this.conductingVoltage;
  }
}

export function classifyRegion(baseEmitterOn: boolean, baseCollectorOn: boolean): 'active' | 'saturation' | 'cutoff' | 'reverse' {
  if (baseEmitterOn) return baseCollectorOn ? 'saturation' : 'active';
  return baseCollectorOn ? 'reverse' : 'cutoff';
}
