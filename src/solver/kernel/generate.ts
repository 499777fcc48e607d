import type { DriveSignal } from '../../devices/wave.ts';
import { HARD_STEP_ITERATIONS, type NewtonTolerances } from '../newton.ts';
import type { EliminationProgram } from '../straight-line-lu.ts';
import {
  HELD_VALUES,
  bjtCorrection,
  bjtLinearisationError,
  bjtNewton,
  diodeCorrection,
  diodeLinearisationError,
  diodeNewton,
  type DeviceCodeContext,
  type JunctionDevice,
} from './device-code.ts';
import { eliminationCode } from './elimination-code.ts';
import { ConstantPool, int } from './literals.ts';
import type { BjtPart, CapacitorPart, DiodePart, KernelArray, KernelPart } from './plan.ts';

/** Everything the generator needs, as numbers and the parts' descriptions. */
export interface KernelSpec {
  size: number;
  nodeCount: number;
  stepSeconds: number;
  /** Constant matrix entries by slot (conductances and trapezoidal companions at this step). */
  constantValues: Float64Array;
  /** Slots in use, fill-in included (slot 0 is the trash slot). */
  slotCount: number;
  slotOf(row: number, col: number): number;
  program: EliminationProgram;
  pivotThreshold: number;
  parts: readonly KernelPart[];
  /** The drive whose value comes from the input array, one value per step. */
  input: DriveSignal;
  tolerances: NewtonTolerances;
}

/** Where each piece of state sits in the kernel's state array. */
export interface KernelLayout {
  /** x, then the previous and the older accepted solutions (size each). */
  solution: number;
  previous: number;
  older: number;
  /** Per part with state: its offset (parts without state get -1). */
  partState: number[];
  /** Accepted points behind x for the predictor (0, 1, 2); predictor on (1) or off (0); Newton iterations so far. */
  history: number;
  predict: number;
  iterations: number;
  /**
   * 1 when the held linearisation below belongs to the junction voltages in the part states
   * (the caller sets 0 after the general loop has stepped); steps taken on it so far.
   */
  reuse: number;
  reused: number;
  /** The last iteration's junction right-hand side, by stamped row, then its factor entries. */
  heldRhs: number;
  heldFactors: number;
  length: number;
}

/**
 * Runs steps `from` to `to` of the block; returns the index of the first step it could not
 * take (`to` when all went through). Accepted solutions go to `out`, `size` values per step.
 */
export type KernelRun = (state: KernelArray, constants: readonly number[], input: Float64Array, from: number, to: number, out: Float64Array) => number;

/** Thrown while generating when a part cannot be expressed (the caller keeps the general loop). */
export class KernelUnsupported extends Error {}

/**
 * Generates one circuit's whole trapezoidal time step as straight-line JavaScript:
 * right-hand side from the sources and capacitor histories, predictor, Newton with
 * junction limiting, LU on locals in the sparse matrix's fixed elimination order (fixed
 * parts folded), acceptance, capacitor updates. The solution lives in locals for the whole
 * block; what later steps need (earlier points, held factors) stays in the state array.
 * It does what `Simulator.step` does on the same circuit (same equations, same acceptance
 * rules, held linearisations included) minus the general machinery. (A chord step that
 * reuses the last factors but evaluates every junction afresh was tried and measured: +10 %
 * on the demo transmitter, −5 % on the receiver; the held linearisation pays because it
 * evaluates no exponential either.)
 *
 * Anything it cannot do (a stale pivot, Newton failing, a non-finite value) ends the block
 * at that step and the caller takes the step the general way. The code is built only
 * from integers and fixed identifiers; every number is read from the constants array.
 */
export function generateStepKernel(spec: KernelSpec): { run: KernelRun; layout: KernelLayout; code: string; constants: readonly number[] } {
  const pool = new ConstantPool();
  const literal = (value: number): string => pool.ref(value);
  const n = spec.size;
  const h = spec.stepSeconds;
  const tol = spec.tolerances;
  const voltage = (prefix: string, k: number): string => (k < 0 ? '0' : `${prefix}${int(k)}`);
  const slot = (row: number, col: number): number => (row < 0 || col < 0 ? 0 : spec.slotOf(row, col));
  const all = (f: (k: number) => string): string => Array.from({ length: n }, (_, k) => f(k)).join(' ');
  /** One declaration list over the unknowns: `let a0 = …, a1 = …;`. */
  const declare = (f: (k: number) => string): string => `let ${Array.from({ length: n }, (_, k) => f(k)).join(', ')};`;
  /** The sum of a vector's locals, `a0 + a1 + …` (a NaN or infinity anywhere makes it one). */
  const sumOf = (prefix: string): string => Array.from({ length: n }, (_, k) => `${prefix}${k}`).join(' + ');

  const lines: string[] = [];
  let sink = lines;
  const emit = (line: string): void => {
    sink.push(line);
  };

  // State layout: solutions, part states, counters, then the stored linearisation and factors.
  let offset = 3 * n;
  const partState = spec.parts.map((p) => {
    if (p.kind === 'voltage-source') return -1;
    const at = offset;
    offset += p.kind === 'diode' ? 1 : 3;
    return at;
  });

  // Right-hand side terms fixed over a step, by row; the parts sorted by kind.
  const stepTerms: string[][] = Array.from({ length: n }, () => []);
  const addStep = (row: number, term: string): void => {
    if (row >= 0 && row < n) stepTerms[row].push(term);
  };
  const driveValue = (drive: DriveSignal): string => {
    if (drive === spec.input) return `(${literal(drive.dcValue)} + u)`;
    if (drive.isConstant) return literal(drive.dcValue);
    throw new KernelUnsupported('a source with a time-varying wave of its own');
  };
  const capacitors: { part: CapacitorPart; id: string; at: number }[] = [];
  const diodes: (JunctionDevice<DiodePart> & { at: number })[] = [];
  const bjts: (JunctionDevice<BjtPart> & { at: number })[] = [];
  const stepCode: string[] = [];
  spec.parts.forEach((part, i) => {
    const at = partState[i];
    switch (part.kind) {
      case 'voltage-source':
        addStep(part.branch, `+ ${driveValue(part.drive)}`);
        break;
      case 'capacitor': {
        const id = `q${capacitors.length}`;
        capacitors.push({ part, id, at });
        // Trapezoidal history current: i = a0·C·v + (a1·s₁ − d₁).
        stepCode.push(`const ${id}h = ${literal(-2 / h)} * ${id}s1 - ${id}d1;`);
        addStep(part.a, `- ${id}h`);
        addStep(part.b, `+ ${id}h`);
        break;
      }
      case 'diode':
        diodes.push({ part, id: `d${diodes.length}`, at, heldAt: -1 });
        break;
      case 'bjt': {
        const id = `t${bjts.length}`;
        bjts.push({ part, id, at, heldAt: -1 });
        if (part.light) {
          // The photocurrent flows collector → base inside the part, fixed over the step.
          stepCode.push(`{ const w = ${driveValue(part.light)}; ${id}ph = ${literal(part.responsivity)} * (w > 0 ? w : 0); }`);
          addStep(part.collector, `- ${id}ph`);
          addStep(part.base, `+ ${id}ph`);
        }
        break;
      }
    }
  });
  const junctions = diodes.length > 0 || bjts.length > 0;
  const early = tol.quadraticAcceptance > 0 && junctions;
  const reuse = tol.reuseAcceptance > 0 && junctions;
  if (reuse) {
    for (const d of diodes) {
      d.heldAt = offset;
      offset += HELD_VALUES.diode;
    }
    for (const t of bjts) {
      t.heldAt = offset;
      offset += HELD_VALUES.bjt;
    }
  }

  // The Newton iteration's stamps go aside first, to learn which matrix entries the junctions
  // stamp: those are locals starting from the constant part; every other entry is fixed.
  const constantOf = (sl: number): number => (sl < spec.constantValues.length ? spec.constantValues[sl] : 0);
  const stamped = new Set<number>();
  const stampedRows = new Set<number>();
  const context: DeviceCodeContext = {
    pool,
    emit,
    voltage,
    stampMatrix: (row, col, op, expr) => {
      const sl = slot(row, col);
      if (sl === 0) return;
      stamped.add(sl);
      emit(`v${sl} ${op} ${expr};`);
    },
    stampRhs: (row, op, expr) => {
      if (row < 0 || row >= n) return;
      stampedRows.add(row);
      emit(`w${row} ${op} ${expr};`);
    },
  };
  const newtonStamps: string[] = [];
  sink = newtonStamps;
  for (const d of diodes) diodeNewton(context, d);
  for (const t of bjts) bjtNewton(context, t);
  sink = lines;
  const elimination = eliminationCode(spec.program, stamped, constantOf, pool, spec.pivotThreshold, 'break steps;');
  const rhsRows = [...stampedRows].sort((a, b) => a - b);
  const layout: KernelLayout = {
    solution: 0,
    previous: n,
    older: 2 * n,
    partState,
    history: offset,
    predict: offset + 1,
    iterations: offset + 2,
    reuse: offset + 3,
    reused: offset + 4,
    heldRhs: offset + 5,
    heldFactors: offset + 5 + rhsRows.length,
    length: offset + 5 + rhsRows.length + elimination.held.length,
  };
  const heldRhs = new Map(rhsRows.map((row, i) => [row, layout.heldRhs + i]));
  /** Where held factor entry `index` sits in the state array. */
  const heldFactor = (index: number): string => `s[${int(layout.heldFactors + index)}]`;

  emit('"use strict";');
  // The solution lives in locals; the two points before it stay in the state array (only the predictor reads them).
  emit(declare((k) => `x${k} = s[${k}]`));
  emit(declare((k) => `t${k} = 0, n${k} = 0`));
  for (const { id, at } of capacitors) emit(`let ${id}s1 = s[${at}], ${id}d1 = s[${at + 2}];`);
  for (const { id, at } of diodes) emit(`let ${id}v = s[${at}];`);
  for (const { id, at } of bjts) emit(`let ${id}be = s[${at}], ${id}bc = s[${at + 1}], ${id}ph = s[${at + 2}];`);
  // Small integers held as such (| 0): a counter that arrives as a double would send the engine back to unoptimised code.
  emit(`let history = s[${layout.history}] | 0, predict = s[${layout.predict}] | 0, iterationsTotal = s[${layout.iterations}] | 0;`);
  emit(`let reuse = s[${layout.reuse}] | 0, reusedTotal = s[${layout.reused}] | 0;`);
  emit('let i = from;');
  emit('steps: for (; i < to; i++) {');
  emit('const u = input[i];');
  for (const line of stepCode) emit(line);
  for (let r = 0; r < n; r++) emit(`const r${r} = 0 ${stepTerms[r].join(' ')};`);
  emit('let converged = false, iterations = 0;');
  if (reuse) {
    // The last step's linearisation and factors first: no junction evaluated, nothing factored.
    // Kept when every junction stays as close to the voltage it was linearised at as the quadratic
    // acceptance below asks of a fresh linearisation.
    emit('if (reuse === 1) {');
    emit(declare((k) => (heldRhs.has(k) ? `w${k} = r${k} + s[${int(heldRhs.get(k) as number)}]` : `w${k} = r${k}`)));
    emit('{');
    for (const line of elimination.solveHeld(heldFactor)) emit(line);
    emit('}');
    emit('let worst = 0;');
    for (const d of diodes) diodeLinearisationError(context, d);
    for (const t of bjts) bjtLinearisationError(context, t);
    emit(`if (worst <= ${literal(tol.reuseAcceptance)}) {`);
    emit(all((k) => `t${k} = n${k};`));
    if (tol.reuseCorrection) {
      // One chord step on the held factors for what the tangents leave out.
      emit('{');
      emit(`let ${rhsRows.map((row) => `w${row} = 0`).join(', ')};`);
      for (const d of diodes) diodeCorrection(context, d);
      for (const t of bjts) bjtCorrection(context, t);
      const zeroRows = new Set(Array.from({ length: n }, (_, k) => k).filter((k) => !heldRhs.has(k)));
      for (const line of elimination.solveHeld(heldFactor, zeroRows)) emit(line);
      emit(all((k) => `t${k} += n${k};`));
      emit('}');
    }
    // A non-finite answer is left to a fresh linearisation (which ends the block if it persists).
    emit(`const sum = ${sumOf('t')};`);
    emit('if (sum - sum === 0) { converged = true; reusedTotal++; }');
    emit('}');
    emit('}');
  }
  emit('if (!converged) {');
  // Predictor: quadratic or linear extrapolation through the accepted points (equal steps), or none.
  // Chosen coefficients rather than three branches, every comparison made every time: code first
  // reached late (a branch, or the right side of a short-circuit) has no type feedback, and sends
  // the engine back to its unoptimised code when it is.
  emit('const on = predict === 1, two = on & (history >= 2), one = on & (history >= 1);');
  emit('const c0 = two ? 3 : one ? 2 : 1;');
  emit('const c1 = two ? -3 : one ? -1 : 0;');
  emit('const c2 = two ? 1 : 0;');
  emit(all((k) => `t${k} = c0 * x${k} + c1 * s[${n + k}] + c2 * s[${2 * n + k}];`));

  emit(`for (let it = 1; !converged && it <= ${int(tol.maxIterations)}; it++) {`);
  emit('iterations = it; iterationsTotal++;');
  emit('let limited = false;');
  emit(declare((k) => `w${k} = r${k}`));
  const stampedSlots = [...stamped].sort((a, b) => a - b);
  if (stampedSlots.length > 0) emit(`let ${stampedSlots.map((sl) => `v${sl} = ${literal(constantOf(sl))}`).join(', ')};`);
  for (const line of newtonStamps) emit(line);
  if (reuse) for (const [row, at] of heldRhs) emit(`s[${int(at)}] = w${row} - r${row};`);
  // Elimination in the sparse matrix's order, fixed parts folded; a pivot that has gone small ends the block.
  emit('{');
  for (const line of elimination.factor) emit(line);
  if (reuse) {
    elimination.held.forEach((f, index) => emit(`${heldFactor(index)} = ${f.inverse ? `1 / v${int(f.slot)}` : `v${int(f.slot)}`};`));
  }
  for (const line of elimination.solve) emit(line);
  emit('}');

  // Convergence as Newton.solve judges it.
  emit(`{ const sum = ${sumOf('n')}; if (sum - sum !== 0) break steps; }`);
  if (early) {
    // Quadratic acceptance first (it decides most steps and is the cheaper test).
    emit('let worst = 0;');
    for (const d of diodes) diodeLinearisationError(context, d);
    for (const t of bjts) bjtLinearisationError(context, t);
    emit(`if (!limited && worst <= ${literal(tol.quadraticAcceptance)}) { ${all((k) => `t${k} = n${k};`)} converged = true; break; }`);
  }
  // Every unknown moved less than its tolerance.
  emit('let within = true;');
  for (let k = 0; k < n; k++) {
    const absolute = literal(k < spec.nodeCount ? tol.volts : tol.amperes);
    emit(`if (!(Math.abs(n${k} - t${k}) <= ${literal(tol.relative)} * Math.max(Math.abs(n${k}), Math.abs(t${k})) + ${absolute})) within = false;`);
  }
  emit(all((k) => `t${k} = n${k};`));
  emit('if (limited) continue;');
  emit('if (within) converged = true;');
  emit('}'); // Newton
  emit('if (!converged) break;');
  if (reuse) emit('reuse = 1;');
  emit('}'); // a fresh linearisation
  // Accept: capacitor histories, predictor points, output.
  for (const { part, id, at } of capacitors) {
    emit(`{ const sq = ${literal(part.farads)} * (${voltage('t', part.a)} - ${voltage('t', part.b)}); const dq = ${literal(2 / h)} * sq + ${id}h; s[${at + 1}] = ${id}s1; ${id}s1 = sq; ${id}d1 = dq; }`);
  }
  emit(all((k) => `s[${2 * n + k}] = s[${n + k}]; s[${n + k}] = x${k}; x${k} = t${k};`));
  emit('history = history < 2 ? history + 1 : 2;');
  emit(`predict = iterations <= ${int(HARD_STEP_ITERATIONS)} ? 1 : 0; if (predict === 0) history = 0;`);
  emit(`{ const at = i * ${int(n)}; ${all((k) => `out[at + ${k}] = x${k};`)} }`);
  emit('}'); // steps
  // Write the state back.
  emit(all((k) => `s[${k}] = x${k};`));
  for (const { id, at } of capacitors) emit(`s[${at}] = ${id}s1; s[${at + 2}] = ${id}d1;`);
  for (const { id, at } of diodes) emit(`s[${at}] = ${id}v;`);
  for (const { id, at } of bjts) emit(`s[${at}] = ${id}be; s[${at + 1}] = ${id}bc; s[${at + 2}] = ${id}ph;`);
  emit(`s[${layout.history}] = history; s[${layout.predict}] = predict; s[${layout.iterations}] = iterationsTotal;`);
  emit(`s[${layout.reuse}] = reuse; s[${layout.reused}] = reusedTotal;`);
  emit('return i;');
  const code = lines.join('\n');
  return { run: compiled(code), layout, code, constants: doubles(pool.values) };
}

/**
 * A plain array of doubles (the engine's packed-double kind) with these values, for the kernels'
 * constants and state. Not a Float64Array: once any ArrayBuffer in the process has been detached
 * (a transfer to a worker, the module loader's own messages), the engine guards every typed-array
 * access against detachment, and the kernels make about a hundred such accesses a step; plain
 * arrays are not affected. Measured on demo (a) with the pipeline module loaded: 20 % faster.
 */
export function doubles(values: readonly number[]): number[] {
  const out: number[] = [];
  // A non-integer first, so the array is of doubles from the start rather than changing kind later.
  for (let i = 0; i < values.length; i++) out.push(0.5);
  for (let i = 0; i < values.length; i++) out[i] = values[i];
  return out;
}

/**
 * Generated functions by their code: a circuit rendered again (a slider moved back, a
 * level search, the next file) reuses the function the engine has already optimised
 * instead of warming a new one up. Bounded; the oldest entry goes first.
 */
const FUNCTIONS = new Map<string, KernelRun>();
const MAX_FUNCTIONS = 32;

function compiled(code: string): KernelRun {
  let run = FUNCTIONS.get(code);
  if (!run) {
    run = new Function('s', 'k', 'input', 'from', 'to', 'out', code) as KernelRun;
    if (FUNCTIONS.size >= MAX_FUNCTIONS) FUNCTIONS.delete(FUNCTIONS.keys().next().value as string);
    FUNCTIONS.set(code, run);
  }
  return run;
}
