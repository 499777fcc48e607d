import type { DiodeModel, LedModel } from '../circuit/types.ts';
import { photonEnergyVolts, thermalVoltage } from '../units/constants.ts';
import type { Integrator } from '../solver/integrator.ts';
import type { KernelPart } from '../solver/kernel/plan.ts';
import { Capacitor } from './capacitor.ts';
import { JUNCTION_GMIN_SIEMENS, type Binder, type IterationContext, type TwoTerminal } from './device.ts';
import { JunctionPoint, criticalVolts, evaluateJunction, exponentialRemainder, junctionLinearisationError, limitJunctionStep } from './junction.ts';
import { Resistor, voltageAt } from './resistor.ts';

/**
 * Junction diode or LED [anode, cathode]: I = Is·(exp(v/(n·VT)) − 1) across the
 * junction (Shockley), an optional series resistance ahead of it (an internal
 * node), a constant junction capacitance, and gmin across the junction.
 * An LED's junction current becomes light: P = η·(hc/λq)·I.
 */
export class Diode implements TwoTerminal {
  readonly nonlinear = true;
  private readonly anode: number;
  private readonly cathode: number;
  /** The junction's p side (the anode, or the internal node behind Rs). */
  private readonly junction: number;
  private readonly series: Resistor | null;
  private readonly capacitance: Capacitor | null;
  private readonly jj: number;
  private readonly jk: number;
  private readonly kj: number;
  private readonly kk: number;
  private readonly rj: number;
  private readonly rk: number;
  private readonly saturationAmperes: number;
  private readonly emissionVolts: number;
  private readonly criticalVoltage: number;
  /** Optical watts per ampere of junction current (LED), 0 for a plain diode: η·hc/(λq). */
  readonly wattsPerAmpere: number;
  private junctionVolts = 0;
  private change = 0;
  private readonly point = new JunctionPoint();
  /** The last load's Is·e^(v/nVT) (kept apart: `junctionCurrent` reuses the point above). */
  private heldExponential = 0;

  constructor(
    readonly ref: string,
    pins: readonly string[],
    model: DiodeModel | LedModel,
    binder: Binder,
  ) {
    this.anode = binder.node(pins[0]);
    this.cathode = binder.node(pins[1]);
    if (model.seriesResistance > 0) {
      this.junction = binder.internalNode(`${ref}#junction`);
      this.series = new Resistor(`${ref}#rs`, this.anode, this.junction, model.seriesResistance, binder);
    } else {
      this.junction = this.anode;
      this.series = null;
    }
    this.capacitance =
      model.junctionCapacitance > 0
        ? new Capacitor(`${ref}#cj`, this.junction, this.cathode, model.junctionCapacitance, binder)
        : null;
    this.jj = binder.slot(this.junction, this.junction);
    this.jk = binder.slot(this.junction, this.cathode);
    this.kj = binder.slot(this.cathode, this.junction);
    this.kk = binder.slot(this.cathode, this.cathode);
    this.rj = binder.rhs(this.junction);
    this.rk = binder.rhs(this.cathode);
    this.saturationAmperes = model.saturationCurrent;
    this.emissionVolts = model.emissionCoefficient * thermalVoltage(binder.temperatureKelvin);
    this.criticalVoltage = criticalVolts(this.saturationAmperes, this.emissionVolts);
    this.wattsPerAmpere = model.kind === 'led' ? model.quantumEfficiency * photonEnergyVolts(model.wavelength) : 0;
  }

  stampConstant(m: Float64Array, integrator: Integrator): void {
    this.series?.stampConstant(m);
    this.capacitance?.stampConstant(m, integrator);
  }

  stampStep(rhs: Float64Array, integrator: Integrator): void {
    this.capacitance?.stampStep(rhs, integrator);
  }

  load(m: Float64Array, rhs: Float64Array, x: Float64Array, context: IterationContext): void {
    const proposed = context.initialiseJunctions
      ? this.criticalVoltage
      : voltageAt(x, this.junction) - voltageAt(x, this.cathode);
    const v = limitJunctionStep(proposed, this.junctionVolts, this.emissionVolts, this.criticalVoltage, context);
    this.change = Math.abs(v - this.junctionVolts);
    this.junctionVolts = v;
    evaluateJunction(v, this.saturationAmperes, this.emissionVolts, this.point);
    this.heldExponential = this.point.exponential;
    const g = this.point.siemens + JUNCTION_GMIN_SIEMENS;
    const i = this.point.amperes + JUNCTION_GMIN_SIEMENS * v;
    const equivalent = i - g * v;
    m[this.jj] += g;
    m[this.jk] -= g;
    m[this.kj] -= g;
    m[this.kk] += g;
    rhs[this.rj] -= equivalent;
    rhs[this.rk] += equivalent;
  }

  accept(x: Float64Array, integrator: Integrator): void {
    this.capacitance?.accept(x, integrator);
  }

  lastJunctionChange(): number {
    return this.change;
  }

  stampHeldRemainder(rhs: Float64Array, x: Float64Array): void {
    const x0 = (voltageAt(x, this.junction) - voltageAt(x, this.cathode) - this.junctionVolts) / this.emissionVolts;
    const remainder = this.heldExponential * exponentialRemainder(x0);
    rhs[this.rj] -= remainder;
    rhs[this.rk] += remainder;
  }

  linearisationError(x: Float64Array): number {
    return junctionLinearisationError(voltageAt(x, this.junction) - voltageAt(x, this.cathode), this.junctionVolts, this.emissionVolts);
  }

  breakpoints(): number[] {
    return [];
  }

  kernelParts(): KernelPart[] {
    return [
      {
        kind: 'diode',
        junction: this.junction,
        cathode: this.cathode,
        saturationAmperes: this.saturationAmperes,
        emissionVolts: this.emissionVolts,
        criticalVolts: this.criticalVoltage,
        state: {
          read: (into, at) => {
            into[at] = this.junctionVolts;
          },
          write: (from, at) => {
            this.junctionVolts = from[at];
          },
        },
      },
      ...(this.capacitance?.kernelParts() ?? []),
    ];
  }

  /**
   * Current through the junction alone (no capacitance), in amperes, at the solution in x, or
   * at the one that starts at x[offset] (a row of a block of solutions, read in place).
   */
  junctionCurrent(x: Float64Array, offset = 0): number {
    const volts = voltageAt(x, this.junction, offset) - voltageAt(x, this.cathode, offset);
    evaluateJunction(volts, this.saturationAmperes, this.emissionVolts, this.point);
    return this.point.amperes;
  }

  /** Current into the anode: junction, gmin and capacitance. */
  current(x: Float64Array): number {
    const v = voltageAt(x, this.junction) - voltageAt(x, this.cathode);
    return this.junctionCurrent(x) + JUNCTION_GMIN_SIEMENS * v + (this.capacitance?.current() ?? 0);
  }

  /** Emitted optical power (LED), in watts; zero for a plain diode or a reverse current. */
  opticalWatts(x: Float64Array): number {
    return Math.max(0, this.junctionCurrent(x)) * this.wattsPerAmpere;
  }

  get isLed(): boolean {
    return this.wattsPerAmpere > 0;
  }
}
