/**
 * Test-only Binder that gives one device its own small dense matrix: node
 * names map to indices 0, 1, 2… in order of first request, internal nodes
 * and branches follow, and slot (r, c) is 1 + r·N + c (0 is the trash slot
 * for ground rows and columns, as in the engine).
 */
import type { Binder, Device, IterationContext } from '../../src/devices/device.ts';
import { Integrator } from '../../src/solver/integrator.ts';

export class DenseBinder implements Binder {
  static readonly N = 8;
  readonly names = new Map<string, number>();
  private next = 0;
  readonly matrix = new Float64Array(1 + DenseBinder.N * DenseBinder.N);
  readonly rhsVector = new Float64Array(DenseBinder.N + 1);
  readonly integrator = new Integrator();

  constructor(readonly temperatureKelvin = 300) {
    this.integrator.set('dc', 0, 0);
  }

  node(name: string): number {
    if (name === 'gnd') return -1;
    let index = this.names.get(name);
    if (index === undefined) {
      index = this.next++;
      this.names.set(name, index);
    }
    return index;
  }
  internalNode(label: string): number {
    return this.node(label);
  }
  branch(label: string): number {
    return this.node(label);
  }
  slot(row: number, col: number): number {
    return row < 0 || col < 0 ? 0 : 1 + row * DenseBinder.N + col;
  }
  rhs(index: number): number {
    return index < 0 ? DenseBinder.N : index;
  }

  /** Number of unknowns handed out. */
  get size(): number {
    return this.next;
  }

  /** Matrix entry (r, c) as stamped. */
  entry(row: number, col: number): number {
    return this.matrix[this.slot(row, col)];
  }

  /** A solution vector with the given node voltages (the extra last entry is ground). */
  vector(volts: Record<string, number>): Float64Array {
    const x = new Float64Array(DenseBinder.N + 1);
    for (const [name, v] of Object.entries(volts)) x[this.node(name)] = v;
    return x;
  }

  /**
   * Stamps the device at x with limiting out of the way: load() is repeated
   * until no junction step is limited, so the device's remembered junction
   * voltages equal those of x; then constant and load stamps are taken afresh.
   * Returns the linearised current into each unknown, I0 = G·x − rhs.
   */
  stampAt(device: Device, x: Float64Array): Float64Array {
    const context: IterationContext = { initialiseJunctions: false, limited: false };
    for (let i = 0; i < 200; i++) {
      context.limited = false;
      device.load(this.matrix, this.rhsVector, x, context);
      if (!context.limited) break;
    }
    if (context.limited) throw new Error('junction limiting did not settle');
    this.matrix.fill(0);
    this.rhsVector.fill(0);
    device.stampConstant(this.matrix, this.integrator);
    device.stampStep(this.rhsVector, this.integrator, 0, 1);
    context.limited = false;
    device.load(this.matrix, this.rhsVector, x, context);
    if (context.limited) throw new Error('limited at the settled point');
    const n = this.size;
    const currents = new Float64Array(n);
    for (let r = 0; r < n; r++) {
      let s = -this.rhsVector[r];
      for (let c = 0; c < n; c++) s += this.entry(r, c) * x[c];
      currents[r] = s;
    }
    return currents;
  }
}
