import type { Circuit } from '../circuit/types.ts';
import { GROUND } from '../circuit/types.ts';
import { createDevice, type Binder, type Device, type IterationContext } from '../devices/index.ts';
import { celsiusToKelvin } from '../units/constants.ts';
import { DenseLu } from './dense-lu.ts';
import { Integrator } from './integrator.ts';
import type { SlotMatrix } from './slot-matrix.ts';
import { SparseLu } from './sparse-lu.ts';

/**
 * How the linear system is solved: 'sparse' (generated straight-line code, the fast path),
 * 'sparse-loops' (the same elimination program run as loops) or 'dense' (the reference).
 */
export type LinearAlgebra = 'sparse' | 'sparse-loops' | 'dense';

/**
 * A circuit turned into modified nodal analysis (Ho, Ruehli & Brennan, IEEE
 * Trans. Circuits and Systems 22(6), 1975): unknowns are the node voltages
 * then the branch currents of voltage sources and inductors. Holds the
 * matrix, the right-hand sides and the devices, and assembles one Newton
 * iteration at a time without allocating.
 */
export class CircuitSystem {
  readonly size: number;
  /** Name of each unknown: node names, internal nodes `REF#...`, branches `REF#current`. */
  readonly unknownNames: string[];
  /** How many of the unknowns are node voltages (they come first). */
  readonly nodeCount: number;
  readonly devices: Device[];
  readonly devicesByRef: Map<string, Device>;
  readonly nonlinearDevices: Device[];
  /** Devices with per-step work (resistors, most of a circuit's parts, have none). */
  private readonly stepDevices: Device[];
  readonly matrix: SlotMatrix;
  readonly integrator = new Integrator();
  /** Right-hand side fixed over one step; trash entry at index `size`. */
  readonly stepRhs: Float64Array;
  /** Working right-hand side (overwritten by the solve). */
  readonly rhs: Float64Array;
  /** Matrix entries fixed for the current step size. */
  private constantValues: Float64Array;
  private readonly nodeDiagonalSlots: Int32Array;
  /** Conductance from every node to ground, used while stepping gmin at DC. */
  nodeShuntSiemens = 0;
  readonly iteration: IterationContext = { initialiseJunctions: false, limited: false };
  /** Every nonlinear device can correct a step taken on its held linearisation (`stampHeldRemainder`). */
  readonly canHoldLinearisation: boolean;
  /** Keep the devices' part of each iteration's right-hand side for `solveHeld` (set by the simulator). */
  keepLinearisation = false;
  /** Counts of `stamp` and `stampConstants` calls: a held linearisation is good while neither has moved. */
  stamps = 0;
  constantStamps = 0;
  /** The devices' part of the last iteration's right-hand side (their equivalent currents). */
  private readonly heldRhs: Float64Array;

  constructor(
    readonly circuit: Circuit,
    linearAlgebra: LinearAlgebra = 'sparse',
  ) {
    const nodeIndex = new Map<string, number>();
    const nodeNames: string[] = [];
    const branchNames: string[] = [];
    // Pass 1: count unknowns. Nodes come first, so branches get provisional negative ids.
    for (const part of circuit.parts) for (const pin of part.pins) if (pin !== GROUND && !nodeIndex.has(pin)) {
      nodeIndex.set(pin, nodeNames.length);
      nodeNames.push(pin);
    }
    const internalNodes: string[] = [];
    const probe: Binder = {
      temperatureKelvin: celsiusToKelvin(circuit.temperatureCelsius),
      node: (name) => (name === GROUND ? -1 : (nodeIndex.get(name) ?? -1)),
      internalNode: (label) => {
        internalNodes.push(label);
        return -1;
      },
      branch: (label) => {
        branchNames.push(`${label}#current`);
        return -1;
      },
      slot: () => 0,
      rhs: () => 0,
    };
    for (const part of circuit.parts) createDevice(part, probe);
    this.nodeCount = nodeNames.length + internalNodes.length;
    this.size = this.nodeCount + branchNames.length;
    this.unknownNames = [...nodeNames, ...internalNodes, ...branchNames];
    this.matrix = linearAlgebra === 'dense' ? new DenseLu(this.size) : new SparseLu(this.size, linearAlgebra === 'sparse');

    // Pass 2: the real devices, with unknowns handed out in the same order as pass 1.
    let nextInternal = nodeNames.length;
    let nextBranch = this.nodeCount;
    const size = this.size;
    const binder: Binder = {
      temperatureKelvin: probe.temperatureKelvin,
      node: probe.node,
      internalNode: () => nextInternal++,
      branch: () => nextBranch++,
      slot: (row, col) => this.matrix.slot(row, col),
      rhs: (index) => (index < 0 ? size : index),
    };
    this.devices = circuit.parts.map((part) => createDevice(part, binder));
    this.devicesByRef = new Map(this.devices.map((d) => [d.ref, d]));
    this.nonlinearDevices = this.devices.filter((d) => d.nonlinear);
    this.stepDevices = this.devices.filter((d) => !d.stepless);
    this.nodeDiagonalSlots = Int32Array.from({ length: this.nodeCount }, (_, i) => this.matrix.slot(i, i));
    this.matrix.finalise();
    this.constantValues = new Float64Array(this.matrix.stampedSlots);
    this.stepRhs = new Float64Array(size + 1);
    this.rhs = new Float64Array(size + 1);
    this.heldRhs = new Float64Array(size + 1);
    this.canHoldLinearisation = this.nonlinearDevices.every((d) => d.stampHeldRemainder !== undefined && d.linearisationError !== undefined);
  }

  /** An unknown in words, for messages: "node out", "the current through V2". */
  describeUnknown(index: number): string {
    const name = this.unknownNames[index];
    if (name === undefined) return 'an unknown';
    if (name.endsWith('#current')) return `the current through ${name.slice(0, -'#current'.length)}`;
    return name.includes('#') ? `internal node ${name}` : `node ${name}`;
  }

  /** Index of a named node (-1 for ground, undefined if there is no such node). */
  nodeIndex(name: string): number | undefined {
    if (name === GROUND) return -1;
    const i = this.unknownNames.indexOf(name);
    return i >= 0 && i < this.nodeCount ? i : undefined;
  }

  /** Matrix entries fixed for the current integrator coefficients, by slot (read only). */
  get constantMatrix(): Float64Array {
    return this.constantValues;
  }

  /** Re-stamps the parts of the matrix fixed for the current integrator coefficients. */
  stampConstants(): void {
    this.constantStamps++;
    const m = this.constantValues;
    m.fill(0);
    for (const d of this.devices) d.stampConstant(m, this.integrator);
    if (this.nodeShuntSiemens > 0) for (const s of this.nodeDiagonalSlots) m[s] += this.nodeShuntSiemens;
  }

  /** Assembles the right-hand side fixed over the step ending at `seconds`. */
  beginStep(seconds: number, sourceScale: number): void {
    const r = this.stepRhs;
    r.fill(0);
    for (const d of this.stepDevices) d.stampStep(r, this.integrator, seconds, sourceScale);
  }

  /**
   * One Newton iteration at iterate x: stamps, factors and solves into xNew.
   * Returns false if the matrix is singular.
   */
  iterate(x: Float64Array, xNew: Float64Array): boolean {
    this.stamp(x);
    if (!this.matrix.factor()) {
      if (!this.matrix.needsRestamp) return false;
      // The pivot order went stale on these values: stamp again and let the matrix re-order.
      this.stamp(x);
      if (!this.matrix.factor()) return false;
    }
    this.matrix.solve(this.rhs, xNew);
    xNew[this.size] = 0;
    return true;
  }

  private stamp(x: Float64Array): void {
    const values = this.matrix.values;
    values.set(this.constantValues);
    values.fill(0, this.constantValues.length);
    this.rhs.set(this.stepRhs);
    const context = this.iteration;
    context.limited = false;
    for (const d of this.nonlinearDevices) d.load(values, this.rhs, x, context);
    this.stamps++;
    if (this.keepLinearisation) {
      const rhs = this.rhs;
      const step = this.stepRhs;
      const held = this.heldRhs;
      for (let i = 0; i < this.size; i++) held[i] = rhs[i] - step[i];
    }
  }

  /**
   * Solves the step begun with `beginStep` on the last iteration's linearisation and factors
   * (nothing stamped, nothing factored) into xNew. Only while `stamps` and `constantStamps`
   * are where they were after that iteration, with `keepLinearisation` on.
   */
  solveHeld(xNew: Float64Array): void {
    const rhs = this.rhs;
    const step = this.stepRhs;
    const held = this.heldRhs;
    for (let i = 0; i < this.size; i++) rhs[i] = step[i] + held[i];
    this.matrix.solve(rhs, xNew);
    xNew[this.size] = 0;
  }

  /** One chord step at x on the held factors for what the junctions' tangents leave out; adds it to x. */
  correctHeld(x: Float64Array, scratch: Float64Array): void {
    const rhs = this.rhs;
    rhs.fill(0);
    for (const d of this.nonlinearDevices) d.stampHeldRemainder?.(rhs, x);
    this.matrix.solve(rhs, scratch);
    for (let i = 0; i < this.size; i++) x[i] += scratch[i];
  }

  /**
   * The largest relative junction-current error, ½(Δv/nVT)², if the devices' last
   * linearisation were used at x (Infinity if a device cannot tell).
   */
  linearisationError(x: Float64Array): number {
    let worst = 0;
    for (const d of this.nonlinearDevices) {
      const e = d.linearisationError ? d.linearisationError(x) : Infinity;
      if (e > worst) worst = e;
    }
    return worst;
  }

  /** Moves every device's history on after a converged step. */
  accept(x: Float64Array): void {
    for (const d of this.stepDevices) d.accept(x, this.integrator);
  }

  /** The part whose junction moved most in the last iteration (to blame when Newton fails). */
  mostActivePart(): string | null {
    let worst: Device | null = null;
    let worstChange = 0;
    for (const d of this.nonlinearDevices) {
      const c = d.lastJunctionChange();
      if (c > worstChange) {
        worst = d;
        worstChange = c;
      }
    }
    return worst?.ref ?? null;
  }

  /** All breakpoints of all drives within (0, stopSeconds], sorted and unique. */
  breakpoints(stopSeconds: number): number[] {
    const all = this.devices.flatMap((d) => d.breakpoints(stopSeconds)).sort((a, b) => a - b);
    return all.filter((t, i) => i === 0 || t - all[i - 1] > 1e-15 * Math.max(1, t));
  }
}
