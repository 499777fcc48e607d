import type { KernelRun } from '../generate.ts';
import { compileKernelModule, kernelMemory } from './compile.ts';
import { SubsetError } from './subset-parser.ts';

/** Steps per call into the module: the room its memory keeps for inputs and solutions. */
export const WASM_BLOCK_STEPS = 2048;

/** A generated kernel running as WebAssembly: its `run`, and its state array (a view of its memory). */
export interface WasmKernel {
  run: KernelRun;
  state: Float64Array;
}

/**
 * Compiled modules by their code, as `generate.ts` keeps its functions: a circuit rendered again
 * instantiates the module it already has. Bounded; the oldest entry goes first.
 */
const MODULES = new Map<string, WebAssembly.Module>();
const MAX_MODULES = 32;

/**
 * The kernel `code` (from `generateStepKernel`) as a WebAssembly instance with its own memory,
 * or null where it cannot be: no WebAssembly in this engine, a construct the translator does
 * not take, a main browser thread that refuses to compile a module this size synchronously, or
 * an engine that refuses the memory or the instance. The caller keeps the JavaScript kernel
 * then; both give the same answers.
 */
export function wasmKernel(code: string, stateLength: number, constants: readonly number[], size: number): WasmKernel | null {
  if (typeof WebAssembly !== 'object') return null;
  const layout = kernelMemory(stateLength, constants.length, size, WASM_BLOCK_STEPS);
  const key = `${stateLength} ${constants.length} ${size}\n${code}`;
  let module = MODULES.get(key);
  let instance: WebAssembly.Instance;
  let memory: WebAssembly.Memory;
  try {
    if (!module) {
      module = new WebAssembly.Module(compileKernelModule(code, layout) as Uint8Array<ArrayBuffer>);
      if (MODULES.size >= MAX_MODULES) MODULES.delete(MODULES.keys().next().value as string);
      MODULES.set(key, module);
    }
    // A memory can be refused too (the engine reserves address space for each).
    memory = new WebAssembly.Memory({ initial: Math.ceil(layout.bytes / 65536) });
    instance = new WebAssembly.Instance(module, { m: { memory, exp: Math.exp, log: Math.log } });
  } catch (error) {
    if (error instanceof SubsetError || error instanceof WebAssembly.CompileError || error instanceof WebAssembly.LinkError || error instanceof RangeError) return null;
    throw error;
  }
  const step = instance.exports.run as (from: number, to: number) => number;
  const buffer = memory.buffer;
  const state = new Float64Array(buffer, layout.state, stateLength);
  new Float64Array(buffer, layout.constants, constants.length).set(constants);
  const inputs = new Float64Array(buffer, layout.input, WASM_BLOCK_STEPS);
  const solutions = new Float64Array(buffer, layout.out, WASM_BLOCK_STEPS * size);
  // The state and constants are already in the module's memory; steps are counted from each call's start.
  const run: KernelRun = (_state, _constants, input, from, to, out) => {
    let i = from;
    while (i < to) {
      const count = Math.min(to - i, WASM_BLOCK_STEPS);
      inputs.set(input.subarray(i, i + count));
      const done = step(0, count);
      out.set(solutions.subarray(0, done * size), i * size);
      i += done;
      if (done < count) break;
    }
    return i;
  };
  return { run, state };
}
