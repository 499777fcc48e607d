import type { Drive } from '../circuit/types.ts';
import type { Integrator } from '../solver/integrator.ts';
import type { KernelPart } from '../solver/kernel/plan.ts';
import type { Binder, TwoTerminal } from './device.ts';
import { DriveSignal } from './wave.ts';

/** An ideal voltage source [plus, minus] with its current as an MNA unknown. */
export class VoltageSource implements TwoTerminal {
  readonly nonlinear = false;
  readonly drive: DriveSignal;
  private readonly j: number;
  private readonly pj: number;
  private readonly mj: number;
  private readonly jp: number;
  private readonly jm: number;
  private readonly rj: number;

  constructor(
    readonly ref: string,
    pins: readonly string[],
    drive: Drive,
    binder: Binder,
  ) {
    const p = binder.node(pins[0]);
    const m = binder.node(pins[1]);
    this.j = binder.branch(ref);
    this.pj = binder.slot(p, this.j);
    this.mj = binder.slot(m, this.j);
    this.jp = binder.slot(this.j, p);
    this.jm = binder.slot(this.j, m);
    this.rj = binder.rhs(this.j);
    this.drive = new DriveSignal(drive);
  }

  stampConstant(m: Float64Array): void {
    m[this.pj] += 1;
    m[this.mj] -= 1;
    m[this.jp] += 1;
    m[this.jm] -= 1;
  }

  stampStep(rhs: Float64Array, _integrator: Integrator, seconds: number, sourceScale: number): void {
    rhs[this.rj] += sourceScale * this.drive.valueAt(seconds);
  }

  load(): void {}
  accept(): void {}
  lastJunctionChange(): number {
    return 0;
  }
  breakpoints(stopSeconds: number): number[] {
    return this.drive.breakpoints(stopSeconds);
  }
  kernelParts(): KernelPart[] {
    return [{ kind: 'voltage-source', branch: this.j, drive: this.drive }];
  }

  /** Current into the plus pin through the source (negative when it delivers power). */
  current(x: Float64Array): number {
    return x[this.j];
  }
}

/** An ideal current source: the current flows through it from pins[0] to pins[1]. */
export class CurrentSource implements TwoTerminal {
  readonly nonlinear = false;
  readonly drive: DriveSignal;
  private readonly rFrom: number;
  private readonly rTo: number;
  private lastAmperes = 0;

  constructor(
    readonly ref: string,
    pins: readonly string[],
    drive: Drive,
    binder: Binder,
  ) {
    this.rFrom = binder.rhs(binder.node(pins[0]));
    this.rTo = binder.rhs(binder.node(pins[1]));
    this.drive = new DriveSignal(drive);
  }

  stampConstant(): void {}

  stampStep(rhs: Float64Array, _integrator: Integrator, seconds: number, sourceScale: number): void {
    const amperes = sourceScale * this.drive.valueAt(seconds);
    this.lastAmperes = amperes;
    rhs[this.rFrom] -= amperes;
    rhs[this.rTo] += amperes;
  }

  load(): void {}
  accept(): void {}
  lastJunctionChange(): number {
    return 0;
  }
  breakpoints(stopSeconds: number): number[] {
    return this.drive.breakpoints(stopSeconds);
  }

  current(): number {
    return this.lastAmperes;
  }
}
