import type { Integrator } from '../solver/integrator.ts';
import { StateHistory } from '../solver/integrator.ts';
import type { Binder, TwoTerminal } from './device.ts';

/**
 * A linear inductor with its current as an MNA unknown j:
 * v(a) − v(b) = dφ/dt with φ = L·j (a short circuit at DC).
 */
export class Inductor implements TwoTerminal {
  readonly nonlinear = false;
  private readonly j: number;
  private readonly aj: number;
  private readonly bj: number;
  private readonly ja: number;
  private readonly jb: number;
  private readonly jj: number;
  private readonly rj: number;
  private readonly flux = new StateHistory();

  constructor(
    readonly ref: string,
    pins: readonly string[],
    readonly henries: number,
    binder: Binder,
  ) {
    const a = binder.node(pins[0]);
    const b = binder.node(pins[1]);
    this.j = binder.branch(ref);
    this.aj = binder.slot(a, this.j);
    this.bj = binder.slot(b, this.j);
    this.ja = binder.slot(this.j, a);
    this.jb = binder.slot(this.j, b);
    this.jj = binder.slot(this.j, this.j);
    this.rj = binder.rhs(this.j);
  }

  stampConstant(m: Float64Array, integrator: Integrator): void {
    m[this.aj] += 1;
    m[this.bj] -= 1;
    m[this.ja] += 1;
    m[this.jb] -= 1;
    m[this.jj] -= integrator.a0 * this.henries;
  }

  stampStep(rhs: Float64Array, integrator: Integrator): void {
    const h = integrator.history(this.flux.s1, this.flux.s2, this.flux.d1);
    this.flux.pending = h;
    rhs[this.rj] += h;
  }

  load(): void {}

  accept(x: Float64Array, integrator: Integrator): void {
    this.flux.accept(this.henries * x[this.j], integrator);
  }

  lastJunctionChange(): number {
    return 0;
  }
  breakpoints(): number[] {
    return [];
  }

  current(x: Float64Array): number {
    return x[this.j];
  }
}
