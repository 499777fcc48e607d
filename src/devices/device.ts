/**
 * What every device model implements. A device is stamped in three layers so
 * the solver redoes only what changes:
 *  - `stampConstant`: matrix entries fixed for a given integration step size
 *    (conductances, source incidence, companion conductances of linear C and L);
 *  - `stampStep`: right-hand side fixed over the Newton iterations of one step
 *    (source values at the new time, history terms of the integrator);
 *  - `load`: nonlinear devices, every Newton iteration (linearised currents).
 * Sign convention: row k of the MNA system sums the currents that leave node k
 * into devices; a device current I(v) ≈ I0 + g·(v − v0) stamps +g in the matrix
 * and g·v0 − I0 in the right-hand side.
 */
import type { Integrator } from '../solver/integrator.ts';
import type { KernelPart } from '../solver/kernel/plan.ts';

/** Hands out unknowns and matrix slots while the system is set up. */
export interface Binder {
  readonly temperatureKelvin: number;
  /** Index of a named circuit node; -1 for ground. */
  node(name: string): number;
  /** A node private to a device (e.g. behind a series resistance). */
  internalNode(label: string): number;
  /** A branch-current unknown (voltage sources, inductors). */
  branch(label: string): number;
  /** Matrix slot for (row, col); entries touching ground give the trash slot. */
  slot(row: number, col: number): number;
  /** Right-hand-side index for an unknown; ground gives the trash index. */
  rhs(index: number): number;
}

/** Per-iteration information handed to nonlinear devices. */
export interface IterationContext {
  /** First iteration from a cold start: junctions start at their initial guess, not from x. */
  initialiseJunctions: boolean;
  /** Set by a device when it limited a junction step (the iteration cannot count as converged). */
  limited: boolean;
}

/**
 * Conductance across every junction, in siemens: keeps the matrix regular when
 * a junction is far reverse-biased (common practice in circuit solvers, no source).
 */
export const JUNCTION_GMIN_SIEMENS = 1e-12;

export interface Device {
  readonly ref: string;
  stampConstant(matrix: Float64Array, integrator: Integrator): void;
  stampStep(rhs: Float64Array, integrator: Integrator, timeSeconds: number, sourceScale: number): void;
  /** True for devices that need `load` every iteration. */
  readonly nonlinear: boolean;
  /** True for devices with nothing to do per step (no `stampStep`, no history to `accept`). */
  readonly stepless?: boolean;
  load(matrix: Float64Array, rhs: Float64Array, x: Float64Array, context: IterationContext): void;
  /** A step converged at solution x: move the integrator history on. */
  accept(x: Float64Array, integrator: Integrator): void;
  /**
   * Nonlinear devices: how far the linearisation of the last `load` is off at solution x, as the
   * largest relative junction-current error ½(Δv/nVT)² (Taylor remainder of the exponential).
   */
  linearisationError?(x: Float64Array): number;
  /**
   * Nonlinear devices: adds to `rhs`, with the signs of `load`'s equivalent currents, what the
   * tangents of the last `load` leave out of the junction currents at x, from the exponentials
   * held at that load (`exponentialRemainder`, no exponential evaluated). One solve with the
   * last factors then corrects a step solved on that linearisation (`reuseAcceptance`).
   */
  stampHeldRemainder?(rhs: Float64Array, x: Float64Array): void;
  /** Size of this device's last junction-voltage update in volts (to blame a part when Newton fails). */
  lastJunctionChange(): number;
  /** Times where the device's drive has a corner, within (0, stopSeconds]. */
  breakpoints(stopSeconds: number): number[];
  /**
   * The device as the step-kernel generator sees it (linear conductances need no part:
   * they are in the constant matrix). A device without this method keeps its circuit
   * on the general step loop.
   */
  kernelParts?(): KernelPart[];
}

/** A two-terminal part: current into pins[0] through the part, in amperes. */
export interface TwoTerminal extends Device {
  current(x: Float64Array): number;
}

export interface PinCurrents {
  collector: number;
  base: number;
  emitter: number;
}

/** A transistor: currents into each pin, junction-capacitance currents included. */
export interface ThreeTerminal extends Device {
  pinCurrents(x: Float64Array): PinCurrents;
  region(x: Float64Array): 'active' | 'saturation' | 'cutoff' | 'reverse';
}
