import type { KernelPart } from '../solver/kernel/plan.ts';
import type { Binder, TwoTerminal } from './device.ts';

/** Ohm's law between pins a and b. */
export class Resistor implements TwoTerminal {
  readonly nonlinear = false;
  readonly stepless = true;
  private readonly a: number;
  private readonly b: number;
  private readonly aa: number;
  private readonly ab: number;
  private readonly ba: number;
  private readonly bb: number;
  private readonly conductanceSiemens: number;

  constructor(
    readonly ref: string,
    a: number,
    b: number,
    ohms: number,
    binder: Binder,
  ) {
    this.a = a;
    this.b = b;
    this.aa = binder.slot(this.a, this.a);
    this.ab = binder.slot(this.a, this.b);
    this.ba = binder.slot(this.b, this.a);
    this.bb = binder.slot(this.b, this.b);
    this.conductanceSiemens = 1 / ohms;
  }

  static fromPins(ref: string, pins: readonly string[], ohms: number, binder: Binder): Resistor {
    return new Resistor(ref, binder.node(pins[0]), binder.node(pins[1]), ohms, binder);
  }

  stampConstant(m: Float64Array): void {
    const g = this.conductanceSiemens;
    m[this.aa] += g;
    m[this.ab] -= g;
    m[this.ba] -= g;
    m[this.bb] += g;
  }

  stampStep(): void {}
  load(): void {}
  accept(): void {}
  lastJunctionChange(): number {
    return 0;
  }
  breakpoints(): number[] {
    return [];
  }
  kernelParts(): KernelPart[] {
    return [];
  }

  current(x: Float64Array): number {
    return (voltageAt(x, this.a) - voltageAt(x, this.b)) * this.conductanceSiemens;
  }
}

/** Node voltage from the solution vector, or from the row of a block of solutions that starts at `offset` (ground, index -1, is 0 V). */
export function voltageAt(x: Float64Array, index: number, offset = 0): number {
  return index < 0 ? 0 : x[offset + index];
}
