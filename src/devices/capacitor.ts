import type { Integrator } from '../solver/integrator.ts';
import { StateHistory } from '../solver/integrator.ts';
import type { KernelPart } from '../solver/kernel/plan.ts';
import type { Binder, TwoTerminal } from './device.ts';
import { voltageAt } from './resistor.ts';

/**
 * A linear capacitor, q = C·v, integrated by the circuit's integrator.
 * Also used inside devices for their constant junction capacitances.
 */
export class Capacitor implements TwoTerminal {
  readonly nonlinear = false;
  private readonly a: number;
  private readonly b: number;
  private readonly aa: number;
  private readonly ab: number;
  private readonly ba: number;
  private readonly bb: number;
  private readonly ra: number;
  private readonly rb: number;
  private readonly charge = new StateHistory();
  /** Current into pin a at the last accepted step, in amperes. */
  private lastCurrentAmperes = 0;

  constructor(
    readonly ref: string,
    a: number,
    b: number,
    readonly farads: number,
    binder: Binder,
  ) {
    this.a = a;
    this.b = b;
    this.aa = binder.slot(a, a);
    this.ab = binder.slot(a, b);
    this.ba = binder.slot(b, a);
    this.bb = binder.slot(b, b);
    this.ra = binder.rhs(a);
    this.rb = binder.rhs(b);
  }

  static fromPins(ref: string, pins: readonly string[], farads: number, binder: Binder): Capacitor {
    return new Capacitor(ref, binder.node(pins[0]), binder.node(pins[1]), farads, binder);
  }

  stampConstant(m: Float64Array, integrator: Integrator): void {
    const g = integrator.a0 * this.farads;
    m[this.aa] += g;
    m[this.ab] -= g;
    m[this.ba] -= g;
    m[this.bb] += g;
  }

  stampStep(rhs: Float64Array, integrator: Integrator): void {
    const h = integrator.history(this.charge.s1, this.charge.s2, this.charge.d1);
    this.charge.pending = h;
    rhs[this.ra] -= h;
    rhs[this.rb] += h;
  }

  load(): void {}

  accept(x: Float64Array, integrator: Integrator): void {
    const v = voltageAt(x, this.a) - voltageAt(x, this.b);
    this.lastCurrentAmperes = this.charge.accept(this.farads * v, integrator);
  }

  lastJunctionChange(): number {
    return 0;
  }
  breakpoints(): number[] {
    return [];
  }

  kernelParts(): KernelPart[] {
    const charge = this.charge;
    return [
      {
        kind: 'capacitor',
        a: this.a,
        b: this.b,
        farads: this.farads,
        state: {
          read: (into, at) => {
            into[at] = charge.s1;
            into[at + 1] = charge.s2;
            into[at + 2] = charge.d1;
          },
          write: (from, at) => {
            charge.s1 = from[at];
            charge.s2 = from[at + 1];
            charge.d1 = from[at + 2];
            this.lastCurrentAmperes = from[at + 2];
          },
        },
      },
    ];
  }

  current(): number {
    return this.lastCurrentAmperes;
  }
}
