import type { Circuit } from '../circuit/types.ts';
import { ConvergenceError } from '../errors.ts';
import type { IntegrationMethod } from './integrator.ts';
import { DEFAULT_TOLERANCES, HARD_STEP_ITERATIONS, Newton, type NewtonTolerances } from './newton.ts';
import { solveOperatingPoint, type OperatingPointMethod } from './operating-point.ts';
import { CircuitSystem, type LinearAlgebra } from './system.ts';
import type { DriveSignal } from '../devices/wave.ts';
import { StepKernel, type KernelBackend } from './kernel/step-kernel.ts';
import { SparseLu } from './sparse-lu.ts';

export interface SimulatorOptions {
  /** Integration rule after the first (backward-Euler) step: 'tr' (trapezoidal) or 'bdf2'. */
  method?: Extract<IntegrationMethod, 'tr' | 'bdf2'>;
  tolerances?: NewtonTolerances;
  linearAlgebra?: LinearAlgebra;
  /**
   * `runBlock` takes its trapezoidal steps in a kernel generated for the circuit where the
   * circuit allows (default true; needs the 'sparse' linear algebra). False keeps every step
   * on the general loop.
   */
  generatedSteps?: boolean;
  /** What the generated kernel runs on (default 'wasm', where the engine has WebAssembly). */
  kernelBackend?: KernelBackend;
}

/** How many times a fixed step may be halved to get through a hard spot. */
const MAX_SUBDIVISIONS = 12;

/**
 * A circuit being simulated: DC operating point, then time steps. Keeps the
 * solution `x` (node voltages then branch currents; x[size] is ground).
 */
export class Simulator {
  readonly system: CircuitSystem;
  readonly newton: Newton;
  readonly method: 'tr' | 'bdf2';
  /** Current solution. */
  readonly x: Float64Array;
  /** The two accepted solutions before x (for the predictor) and the steps between them. */
  private readonly previous: Float64Array;
  private readonly older: Float64Array;
  private olderStepSeconds = 0;
  /** Accepted points behind x usable by the predictor (0, 1 or 2). */
  private history = 0;
  private readonly trial: Float64Array;
  timeSeconds = 0;
  private lastStepSeconds = 0;
  /** The next step restarts the integrator with backward Euler (after DC or a breakpoint). */
  private restart = true;
  private predict = false;
  private pendingStep = 0;
  private pendingTarget = 0;
  /** Accepted steps and subdivided steps since construction (for the benchmark). */
  steps = 0;
  subdividedSteps = 0;
  /** Steps taken by the generated kernel (for the benchmark and the tests). */
  generatedSteps = 0;
  /** Steps solved on the previous step's linearisation and factors (`reuseAcceptance`), by either loop. */
  reusedSteps = 0;
  /**
   * The system's stamp counts after the last converged Newton time step: its factors, its devices'
   * part of the right-hand side and the devices' linearisation points still belong together while
   * they have not moved (null: nothing held, or the kernel has stepped since).
   */
  private held: { stamps: number; constantStamps: number } | null = null;
  private readonly scratch: Float64Array;
  /** `steps` when the kernel last handed back: its held linearisation is stale once the general loop has stepped. */
  private stepsAtKernelExit = -1;
  private readonly allowKernel: boolean;
  private readonly kernelBackend: KernelBackend;
  /** The generated kernel last used by `runBlock` (null: none yet, or the circuit has none). */
  kernel: StepKernel | null = null;
  /** The (step, drive, ordering) for which generation was refused, so it is not retried every step. */
  private refused: { stepSeconds: number; input: DriveSignal; ordering: number } | null = null;

  constructor(circuit: Circuit, options: SimulatorOptions = {}) {
    this.system = new CircuitSystem(circuit, options.linearAlgebra ?? 'sparse');
    this.newton = new Newton(this.system, options.tolerances ?? DEFAULT_TOLERANCES);
    this.method = options.method ?? 'tr';
    this.allowKernel = (options.generatedSteps ?? true) && (options.linearAlgebra ?? 'sparse') === 'sparse';
    this.kernelBackend = options.kernelBackend ?? 'wasm';
    this.x = new Float64Array(this.system.size + 1);
    this.previous = new Float64Array(this.system.size + 1);
    this.older = new Float64Array(this.system.size + 1);
    this.trial = new Float64Array(this.system.size + 1);
    this.scratch = new Float64Array(this.system.size + 1);
    // The dense reference stays the straightforward path: every step linearised afresh.
    this.system.keepLinearisation = this.system.canHoldLinearisation && (options.linearAlgebra ?? 'sparse') !== 'dense';
  }

  /** Finds the DC operating point and makes it the state at t = 0. */
  operatingPoint(): OperatingPointMethod {
    const how = solveOperatingPoint(this.system, this.newton, this.x);
    this.previous.set(this.x);
    this.timeSeconds = 0;
    this.restart = true;
    this.predict = false;
    this.lastStepSeconds = 0;
    return how;
  }

  /** The next step starts the integrator afresh (call at a corner of a drive). */
  markBreakpoint(): void {
    this.restart = true;
    this.predict = false;
  }

  /**
   * Advances by exactly `stepSeconds` to `targetSeconds` (pass the target so
   * time is computed from an integer index, not accumulated). Splits the step
   * in halves where Newton fails; throws a ConvergenceError if even the
   * smallest piece fails.
   */
  step(stepSeconds: number, targetSeconds = this.timeSeconds + stepSeconds): void {
    if (this.tryStep(stepSeconds, targetSeconds)) return;
    this.subdividedSteps++;
    this.subdivide(this.timeSeconds, targetSeconds, 1);
    // The pieces were short: start the integrator afresh rather than extrapolate from them.
    this.restart = true;
    this.predict = false;
  }

  private subdivide(fromSeconds: number, toSeconds: number, depth: number): void {
    const middle = 0.5 * (fromSeconds + toSeconds);
    for (const [a, b] of [
      [fromSeconds, middle],
      [middle, toSeconds],
    ]) {
      this.restart = true;
      if (this.tryStep(b - a, b)) continue;
      if (depth >= MAX_SUBDIVISIONS) this.fail(b);
      this.subdivide(a, b, depth + 1);
    }
  }

  /** One attempt at a step; on failure the state is left as it was. */
  tryStep(stepSeconds: number, targetSeconds: number): boolean {
    if (!this.solveStep(stepSeconds, targetSeconds)) return false;
    this.commitStep();
    return true;
  }

  /**
   * Solves the step ending at `targetSeconds` into `trial` without moving any
   * history on, so the caller may still reject it (error control).
   */
  solveStep(stepSeconds: number, targetSeconds: number): boolean {
    const system = this.system;
    const x = this.x;
    const method = this.restart ? 'be' : this.method;
    const previousStep = this.lastStepSeconds > 0 ? this.lastStepSeconds : stepSeconds;
    const integrator = system.integrator;
    if (integrator.method !== method || integrator.stepSeconds !== stepSeconds || (method === 'bdf2' && previousStep !== stepSeconds)) {
      integrator.set(method, stepSeconds, previousStep);
      system.stampConstants();
    }
    system.beginStep(targetSeconds, 1);
    const trial = this.trial;
    const n = system.size;
    this.pendingStep = stepSeconds;
    this.pendingTarget = targetSeconds;
    if (this.solveOnHeld()) return true;
    if (this.predict && this.history >= 2) {
      // Quadratic extrapolation through the last three accepted points (Lagrange form).
      const h = stepSeconds;
      const h1 = this.lastStepSeconds;
      const h2 = this.olderStepSeconds;
      const c0 = ((h + h1) * (h + h1 + h2)) / (h1 * (h1 + h2));
      const c1 = -(h * (h + h1 + h2)) / (h1 * h2);
      const c2 = (h * (h + h1)) / ((h1 + h2) * h2);
      const prev = this.previous;
      const older = this.older;
      for (let i = 0; i < n; i++) trial[i] = c0 * x[i] + c1 * prev[i] + c2 * older[i];
    } else if (this.predict && this.history >= 1) {
      // Linear extrapolation from the last two accepted points.
      const ratio = stepSeconds / this.lastStepSeconds;
      const prev = this.previous;
      for (let i = 0; i < n; i++) trial[i] = x[i] + (x[i] - prev[i]) * ratio;
    } else {
      trial.set(x);
    }
    const outcome = this.newton.solve(trial, false, true);
    this.held = outcome.converged && system.keepLinearisation ? { stamps: system.stamps, constantStamps: system.constantStamps } : null;
    return outcome.converged;
  }

  /**
   * The step on the last step's linearisation and factors (`reuseAcceptance`), chord-corrected,
   * into `trial`: true when every junction stayed close enough to where it was linearised.
   * The generated kernel does the same (`kernel/generate.ts`).
   */
  private solveOnHeld(): boolean {
    const system = this.system;
    const tolerances = this.newton.tolerances;
    const held = this.held;
    if (tolerances.reuseAcceptance <= 0 || held === null || held.stamps !== system.stamps || held.constantStamps !== system.constantStamps) return false;
    const trial = this.trial;
    system.solveHeld(trial);
    if (!(system.linearisationError(trial) <= tolerances.reuseAcceptance)) return false;
    if (tolerances.reuseCorrection) system.correctHeld(trial, this.scratch);
    let sum = 0;
    for (let i = 0; i < system.size; i++) sum += trial[i];
    if (sum - sum !== 0) return false;
    const outcome = this.newton.outcome;
    outcome.converged = true;
    outcome.iterations = 0;
    outcome.worstUnknown = -1;
    outcome.singular = false;
    return true;
  }

  /** The solution of the last `solveStep`, not yet accepted. */
  get trialSolution(): Float64Array {
    return this.trial;
  }

  /** Accepts the last solved step. */
  commitStep(): void {
    const x = this.x;
    this.older.set(this.previous);
    this.previous.set(x);
    x.set(this.trial);
    this.olderStepSeconds = this.lastStepSeconds;
    this.history = this.restart ? 1 : Math.min(2, this.history + 1);
    this.system.accept(x);
    this.timeSeconds = this.pendingTarget;
    this.lastStepSeconds = this.pendingStep;
    this.restart = false;
    this.predict = this.newton.outcome.iterations <= HARD_STEP_ITERATIONS;
    if (!this.predict) this.history = 0;
    // No Newton iteration: the step was solved on the held linearisation.
    if (this.newton.outcome.iterations === 0) this.reusedSteps++;
    this.steps++;
  }

  /**
   * Takes steps `from` to `to` of `stepSeconds`, step k with the upstream `drive` at
   * `inputs[k]` (as `drive.upstreamValue`) and ending at (firstStep + k)·stepSeconds; writes
   * each accepted solution to row k of `solutions` (`system.size` values per row). Runs of
   * plain trapezoidal steps go through the generated kernel; start-ups, hard spots and
   * anything the kernel cannot take go through `step`.
   */
  runBlock(stepSeconds: number, drive: DriveSignal, inputs: Float64Array, from: number, to: number, firstStep: number, solutions: Float64Array): void {
    const n = this.system.size;
    let i = from;
    while (i < to) {
      const kernel = this.readyKernel(stepSeconds, drive);
      if (kernel) {
        // A new kernel's first calls take one step each, so that its way in and out has run, with
        // the engine recording what it meets, before the engine compiles it in mid-loop: else each
        // return from that code sends it back to the interpreter (the engine records nothing for a
        // function until it has run about eight times its own length).
        const end = kernel.calls < PRIMING_CALLS ? Math.min(to, i + 1) : to;
        i = this.runKernel(kernel, inputs, i, end, firstStep, solutions);
        if (i >= to) break;
        if (i === end) continue;
      }
      drive.upstreamValue = inputs[i];
      this.step(stepSeconds, (firstStep + i) * stepSeconds);
      copyInto(solutions, i * n, this.x, 0, n);
      i++;
    }
    if (to > from) drive.upstreamValue = inputs[to - 1];
  }

  /** The kernel for this step and drive if the next step is a plain trapezoidal one, else null. */
  private readyKernel(stepSeconds: number, drive: DriveSignal): StepKernel | null {
    if (!this.allowKernel || this.restart || this.method !== 'tr' || this.lastStepSeconds !== stepSeconds) return null;
    const integrator = this.system.integrator;
    if (integrator.method !== 'tr' || integrator.stepSeconds !== stepSeconds) return null;
    const matrix = this.system.matrix;
    if (!(matrix instanceof SparseLu)) return null;
    const ordering = matrix.orderings;
    const k = this.kernel;
    if (k && k.stepSeconds === stepSeconds && k.input === drive && k.ordering === ordering) return k;
    const r = this.refused;
    if (r && r.stepSeconds === stepSeconds && r.input === drive && r.ordering === ordering) return null;
    this.kernel = StepKernel.compile(this.system, drive, stepSeconds, this.newton.tolerances, this.kernelBackend);
    if (!this.kernel) this.refused = { stepSeconds, input: drive, ordering };
    return this.kernel;
  }

  /** Runs the kernel from step `from`; returns the first step it did not take. */
  private runKernel(kernel: StepKernel, inputs: Float64Array, from: number, to: number, firstStep: number, solutions: Float64Array): number {
    const n = this.system.size;
    const s = kernel.state;
    const layout = kernel.layout;
    copyInto(s, layout.solution, this.x, 0, n);
    copyInto(s, layout.previous, this.previous, 0, n);
    copyInto(s, layout.older, this.older, 0, n);
    // The kernel extrapolates over equal steps only.
    s[layout.history] = this.olderStepSeconds === kernel.stepSeconds ? this.history : Math.min(this.history, 1);
    s[layout.predict] = this.predict ? 1 : 0;
    s[layout.iterations] = 0;
    s[layout.reused] = 0;
    if (this.steps !== this.stepsAtKernelExit) s[layout.reuse] = 0;
    kernel.loadParts();
    // The kernel moves the devices' linearisation points on: what the general loop holds is stale.
    this.held = null;
    kernel.calls++;
    const done = kernel.run(s, kernel.constants, inputs, from, to, solutions);
    kernel.storeParts();
    this.newton.totalIterations += s[layout.iterations];
    this.reusedSteps += s[layout.reused];
    // At a step it gave up on (the general loop takes it next, which drops what the kernel holds).
    if (done === from) return done;
    copyInto(this.x, 0, s, layout.solution, n);
    copyInto(this.previous, 0, s, layout.previous, n);
    copyInto(this.older, 0, s, layout.older, n);
    this.history = s[layout.history];
    this.predict = s[layout.predict] === 1;
    this.olderStepSeconds = this.lastStepSeconds = kernel.stepSeconds;
    this.timeSeconds = (firstStep + done - 1) * kernel.stepSeconds;
    this.steps += done - from;
    this.generatedSteps += done - from;
    this.stepsAtKernelExit = this.steps;
    return done;
  }

  private fail(seconds: number): never {
    const outcome = this.newton.outcome;
    const node = outcome.worstUnknown >= 0 ? this.system.unknownNames[outcome.worstUnknown] : null;
    const part = this.system.mostActivePart();
    const what = outcome.singular ? 'the circuit matrix became singular' : 'Newton iteration did not converge';
    throw new ConvergenceError(
      `${what} at t = ${seconds.toPrecision(6)} s even with the step cut ${2 ** MAX_SUBDIVISIONS}-fold` +
        `${node ? `; node ${node} moved most` : ''}${part ? `, part ${part} most at fault` : ''}`,
      seconds,
      node,
      part,
    );
  }
}

/** One-step kernel calls before the long ones (see `runBlock`). */
const PRIMING_CALLS = 32;

/** Copies `count` values from `from[at…]` to `to[offset…]` without making a view (this runs once per step on the general loop). */
function copyInto(to: Float64Array | number[], offset: number, from: Float64Array | readonly number[], at: number, count: number): void {
  for (let k = 0; k < count; k++) to[offset + k] = from[at + k];
}
