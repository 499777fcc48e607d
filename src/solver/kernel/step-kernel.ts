import type { DriveSignal } from '../../devices/wave.ts';
import type { NewtonTolerances } from '../newton.ts';
import { SparseLu } from '../sparse-lu.ts';
import type { CircuitSystem } from '../system.ts';
import { PivotOrderUnfit } from './elimination-code.ts';
import { KernelUnsupported, doubles, generateStepKernel, type KernelLayout, type KernelRun } from './generate.ts';
import type { KernelArray, KernelPart, KernelState } from './plan.ts';
import { wasmKernel } from './wasm/wasm-kernel.ts';

/**
 * How a kernel runs: its generated JavaScript as a function, or that code translated to
 * WebAssembly (the default where the engine has it; the same answers to the bit).
 */
export type KernelBackend = 'wasm' | 'js';

/**
 * One circuit's generated trapezoidal step for one step size, input drive and
 * elimination order, with its state array. The simulator copies its state in
 * before a run and out after it, so the kernel and the general step loop can
 * take turns step by step.
 */
export class StepKernel {
  readonly state: KernelArray;
  /** Calls of `run` so far (the simulator makes the first ones one step long). */
  calls = 0;
  /** The parts that carry state, and where it sits in the state array. */
  private readonly stateful: { state: KernelState; at: number }[] = [];

  private constructor(
    readonly stepSeconds: number,
    readonly input: DriveSignal,
    /** The elimination order it was generated for (`SparseLu.orderings`). */
    readonly ordering: number,
    readonly layout: KernelLayout,
    readonly run: KernelRun,
    state: KernelArray,
    /** Which of the two it runs on (a WebAssembly kernel falls back to JavaScript where the engine refuses it). */
    readonly backend: KernelBackend,
    /** The generated source (for tests and for reading). */
    readonly code: string,
    /** The numbers the code reads (part values, step, tolerances). */
    readonly constants: readonly number[],
    parts: KernelPart[],
  ) {
    this.state = state;
    parts.forEach((part, i) => {
      if (part.kind !== 'voltage-source') this.stateful.push({ state: part.state, at: layout.partState[i] });
    });
  }

  /**
   * Generates the kernel for the system as it stands: the integrator set to the trapezoidal
   * rule at `stepSeconds` and the constants stamped, the sparse matrix ordered. Null when
   * the circuit has a part the generator does not know or a source with a wave of its own.
   */
  static compile(system: CircuitSystem, input: DriveSignal, stepSeconds: number, tolerances: NewtonTolerances, backend: KernelBackend = 'wasm'): StepKernel | null {
    const matrix = system.matrix;
    if (!(matrix instanceof SparseLu) || !matrix.isOrdered) return null;
    const parts: KernelPart[] = [];
    for (const device of system.devices) {
      if (!device.kernelParts) return null;
      parts.push(...device.kernelParts());
    }
    try {
      const { run, layout, code, constants } = generateStepKernel({
        size: system.size,
        nodeCount: system.nodeCount,
        stepSeconds,
        constantValues: system.constantMatrix,
        slotCount: matrix.values.length,
        slotOf: (row, col) => matrix.slot(row, col),
        program: matrix,
        pivotThreshold: SparseLu.PIVOT_THRESHOLD,
        parts,
        input,
        tolerances,
      });
      const wasm = backend === 'wasm' ? wasmKernel(code, layout.length, constants, system.size) : null;
      if (wasm) return new StepKernel(stepSeconds, input, matrix.orderings, layout, wasm.run, wasm.state, 'wasm', code, constants, parts);
      return new StepKernel(stepSeconds, input, matrix.orderings, layout, run, doubles(new Array<number>(layout.length).fill(0)), 'js', code, constants, parts);
    } catch (error) {
      if (error instanceof KernelUnsupported || error instanceof PivotOrderUnfit) return null;
      throw error;
    }
  }

  /** Copies the devices' state in (the solution arrays are the caller's). */
  loadParts(): void {
    for (const { state, at } of this.stateful) state.read(this.state, at);
  }

  /** Copies the devices' state out after a run. */
  storeParts(): void {
    for (const { state, at } of this.stateful) state.write(this.state, at);
  }
}
