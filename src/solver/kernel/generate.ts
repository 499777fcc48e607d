import type { DriveSignal } from '../../devices/wave.ts';
import { JUNCTION_GMIN_SIEMENS } from '../../devices/device.ts';
import { HARD_STEP_ITERATIONS, type NewtonTolerances } from '../newton.ts';
import type { EliminationProgram } from '../straight-line-lu.ts';
import { eliminationCode, PivotOrderUnfit } from './elimination-code.ts';
import { junctionCode, limitCode } from './junction-code.ts';
import { ConstantPool, int } from './literals.ts';
import type { BjtPart, CapacitorPart, DiodePart, KernelPart } from './plan.ts';

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
  length: number;
}

/**
 * Runs steps `from` to `to` of the block; returns the index of the first step it could not
 * take (`to` when all went through). Accepted solutions go to `out`, `size` values per step.
 */
export type KernelRun = (state: Float64Array, constants: Float64Array, input: Float64Array, from: number, to: number, out: Float64Array) => number;

/** Thrown while generating when a part cannot be expressed (the caller keeps the general loop). */
export class KernelUnsupported extends Error {}


/**
 * Generates one circuit's whole trapezoidal time step as straight-line JavaScript:
 * right-hand side from the sources and capacitor histories, predictor, Newton with
 * junction limiting, LU on locals in the sparse matrix's fixed elimination order,
 * convergence and quadratic acceptance, capacitor updates. Every state variable is
 * a local for the whole block. It does what `Simulator.step` does on the same
 * circuit (same equations, same acceptance rules) minus the general machinery;
 * anything it cannot do (a stale pivot, Newton failing, a non-finite value) ends
 * the block at that step and the caller takes the step the general way.
 * The code is built only from numbers and fixed identifiers.
 */
export function generateStepKernel(spec: KernelSpec): { run: KernelRun; layout: KernelLayout; code: string; constants: Float64Array } {
  const pool = new ConstantPool();
  const literal = (value: number): string => pool.ref(value);
  const n = spec.size;
  const h = spec.stepSeconds;
  const a0 = 2 / h;
  const a1 = -2 / h;
  const tol = spec.tolerances;
  const program = spec.program;
  const x = (prefix: string, k: number): string => (k < 0 ? '0' : `${prefix}${int(k)}`);
  const slot = (row: number, col: number): number => (row < 0 || col < 0 ? 0 : spec.slotOf(row, col));

  // Layout of the state array.
  let offset = 3 * n;
  const partState = spec.parts.map((p) => {
    if (p.kind === 'voltage-source') return -1;
    const at = offset;
    offset += p.kind === 'diode' ? 1 : 3;
    return at;
  });
  const layout: KernelLayout = { solution: 0, previous: n, older: 2 * n, partState, history: offset, predict: offset + 1, iterations: offset + 2, length: offset + 3 };

  const lines: string[] = [];
  let sink = lines;
  const emit = (line: string): void => {
    sink.push(line);
  };
  const all = (f: (k: number) => string): string => Array.from({ length: n }, (_, k) => f(k)).join(' ');

  // Right-hand side terms fixed over a step, by row.
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
  const diodes: { part: DiodePart; id: string; at: number }[] = [];
  const bjts: { part: BjtPart; id: string; at: number }[] = [];
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
        stepCode.push(`const ${id}h = ${literal(a1)} * ${id}s1 - ${id}d1;`);
        addStep(part.a, `- ${id}h`);
        addStep(part.b, `+ ${id}h`);
        break;
      }
      case 'diode':
        diodes.push({ part, id: `d${diodes.length}`, at });
        break;
      case 'bjt': {
        const id = `t${bjts.length}`;
        bjts.push({ part, id, at });
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

  emit('"use strict";');
  // The solution lives in locals; the two points before it stay in the state array (only the predictor reads them).
  emit(`let ${all((k) => `x${k} = s[${k}],`)} dummy = 0;`);
  emit(`let ${all((k) => `t${k} = 0, n${k} = 0,`)} v = 0, ex = 0, e = 0, arg = 0, lim = 0;`);
  for (const { id, at } of capacitors) emit(`let ${id}s1 = s[${at}], ${id}d1 = s[${at + 2}];`);
  for (const { id, at } of diodes) emit(`let ${id}v = s[${at}];`);
  for (const { id, at } of bjts) emit(`let ${id}be = s[${at}], ${id}bc = s[${at + 1}], ${id}ph = s[${at + 2}];`);
  emit(`let history = s[${layout.history}], predict = s[${layout.predict}], iterationsTotal = s[${layout.iterations}];`);
  emit('let i = from;');
  emit('steps: for (; i < to; i++) {');
  emit('const u = input[i];');
  for (const line of stepCode) emit(line);
  for (let r = 0; r < n; r++) emit(`const r${r} = 0 ${stepTerms[r].join(' ')};`);
  // Predictor: quadratic or linear extrapolation through the accepted points (equal steps), or none.
  // One line with chosen coefficients rather than three branches: a branch first taken late would
  // send the engine back to its unoptimised code.
  emit('const c0 = predict === 1 ? (history >= 2 ? 3 : history >= 1 ? 2 : 1) : 1;');
  emit('const c1 = predict === 1 ? (history >= 2 ? -3 : history >= 1 ? -1 : 0) : 0;');
  emit('const c2 = predict === 1 && history >= 2 ? 1 : 0;');
  emit(all((k) => `t${k} = c0 * x${k} + c1 * s[${n + k}] + c2 * s[${2 * n + k}];`));
  emit('let converged = false, iterations = 0;');
  emit(`newton: for (let it = 1; it <= ${int(tol.maxIterations)}; it++) {`);
  emit('iterations = it; iterationsTotal++;');
  emit('let limited = false;');
  emit(`let ${all((k) => `w${k} = r${k},`)} dummy2 = 0;`);
  // The junctions' code goes aside first, to learn which matrix entries they stamp: those become
  // locals starting from the constant part; every other entry is fixed for the run.
  const constantOf = (sl: number): number => (sl < spec.constantValues.length ? spec.constantValues[sl] : 0);
  const stamped = new Set<number>();
  const deviceLines: string[] = [];
  sink = deviceLines;
  const stampMatrix = (row: number, col: number, op: '+=' | '-=', expr: string): void => {
    const sl = slot(row, col);
    if (sl === 0) return;
    stamped.add(sl);
    emit(`v${sl} ${op} ${expr};`);
  };
  const stampRhs = (row: number, op: '+=' | '-=', expr: string): void => {
    if (row >= 0 && row < n) emit(`w${row} ${op} ${expr};`);
  };
  const gmin = literal(JUNCTION_GMIN_SIEMENS);

  for (const { part, id } of diodes) {
    emit('{');
    emit(`let v = ${x('t', part.junction)} - ${x('t', part.cathode)};`);
    emit(limitCode(pool, 'v', `${id}v`, part));
    emit(`${id}v = v;`);
    emit(junctionCode(pool, 'v', 'I', 'G', part));
    emit(`const g = G + ${gmin}; const eq = I + ${gmin} * v - g * v;`);
    stampMatrix(part.junction, part.junction, '+=', 'g');
    stampMatrix(part.junction, part.cathode, '-=', 'g');
    stampMatrix(part.cathode, part.junction, '-=', 'g');
    stampMatrix(part.cathode, part.cathode, '+=', 'g');
    stampRhs(part.junction, '-=', 'eq');
    stampRhs(part.cathode, '+=', 'eq');
    emit('}');
  }
  for (const { part, id } of bjts) {
    const p = literal(part.polarity);
    const c = part.collector;
    const b = part.base;
    const e = part.emitter;
    emit('{');
    emit(`const vb = ${x('t', b)};`);
    emit(`let vbe = ${p} * (vb - ${x('t', e)}); let vbc = ${p} * (vb - ${x('t', c)});`);
    emit(limitCode(pool, 'vbe', `${id}be`, part));
    emit(limitCode(pool, 'vbc', `${id}bc`, part));
    emit(`${id}be = vbe; ${id}bc = vbc;`);
    emit(junctionCode(pool, 'vbe', 'fI', 'fG', part));
    emit(junctionCode(pool, 'vbc', 'rI', 'rG', part));
    const invEarly = literal(part.inverseEarlyVolts);
    const invBf = literal(part.inverseForwardBeta);
    const invBr = literal(part.inverseReverseBeta);
    emit(`const early = 1 - vbc * ${invEarly}; const transport = fI - rI;`);
    emit(`const ic = transport * early - rI * ${invBr} - ${gmin} * vbc;`);
    emit(`const ib = fI * ${invBf} + rI * ${invBr} + ${gmin} * (vbe + vbc);`);
    emit(`const dIcDvbe = fG * early;`);
    emit(`const dIcDvbc = -rG * early - transport * ${invEarly} - rG * ${invBr} - ${gmin};`);
    emit(`const dIbDvbe = fG * ${invBf} + ${gmin};`);
    emit(`const dIbDvbc = rG * ${invBr} + ${gmin};`);
    stampMatrix(c, c, '-=', 'dIcDvbc');
    stampMatrix(c, b, '+=', 'dIcDvbe + dIcDvbc');
    stampMatrix(c, e, '-=', 'dIcDvbe');
    stampMatrix(b, c, '-=', 'dIbDvbc');
    stampMatrix(b, b, '+=', 'dIbDvbe + dIbDvbc');
    stampMatrix(b, e, '-=', 'dIbDvbe');
    stampMatrix(e, c, '+=', 'dIcDvbc + dIbDvbc');
    stampMatrix(e, b, '-=', '(dIcDvbe + dIcDvbc + dIbDvbe + dIbDvbc)');
    stampMatrix(e, e, '+=', 'dIcDvbe + dIbDvbe');
    emit(`const eqC = ${p} * (ic - dIcDvbe * vbe - dIcDvbc * vbc);`);
    emit(`const eqB = ${p} * (ib - dIbDvbe * vbe - dIbDvbc * vbc);`);
    stampRhs(c, '-=', 'eqC');
    stampRhs(b, '-=', 'eqB');
    stampRhs(e, '+=', '(eqC + eqB)');
    emit('}');
  }

  sink = lines;
  const stampedSlots = [...stamped].sort((a, b) => a - b);
  if (stampedSlots.length > 0) emit(`let ${stampedSlots.map((sl) => `v${sl} = ${literal(constantOf(sl))}`).join(', ')};`);
  for (const line of deviceLines) emit(line);

  // Elimination in the sparse matrix's order, fixed parts folded; a pivot that has gone small ends the block.
  emit('{');
  for (const line of eliminationCode(program, stamped, constantOf, pool, spec.pivotThreshold, 'break steps;')) emit(line);
  emit('}');

  // Convergence as Newton.solve judges it.
  emit(`{ const sum = ${all((k) => `n${k}`).split(' ').join(' + ')}; if (sum - sum !== 0) break steps; }`);
  const tolerance = (k: number): string => literal(k < spec.nodeCount ? tol.volts : tol.amperes);
  const toleranceCheck = (): void => {
    // Every unknown moved less than its tolerance (as Newton.solve judges it).
    emit('let within = true;');
    for (let k = 0; k < n; k++) {
      emit(`if (within && !(Math.abs(n${k} - t${k}) <= ${literal(tol.relative)} * Math.max(Math.abs(n${k}), Math.abs(t${k})) + ${tolerance(k)})) within = false;`);
    }
  };
  // Accepted when, on a time step, every junction's linearisation is within the quadratic-acceptance
  // bound at the new iterate (½(Δv/nVT)² against its linearisation point: it decides most steps and
  // is the cheaper test), or else when every unknown moved less than its tolerance.
  const quadratic = tol.quadraticAcceptance > 0 && (diodes.length > 0 || bjts.length > 0);
  if (quadratic) {
    emit('let worst = 0;');
    for (const { part, id } of diodes) {
      emit(`{ const d = (${x('n', part.junction)} - ${x('n', part.cathode)} - ${id}v) / ${literal(part.emissionVolts)}; const r = 0.5 * (d * d); if (r > worst) worst = r; }`);
    }
    for (const { part, id } of bjts) {
      const p = literal(part.polarity);
      emit(`{ const vb = ${x('n', part.base)};`);
      emit(`const be = (${p} * (vb - ${x('n', part.emitter)}) - ${id}be) / ${literal(part.emissionVolts)};`);
      emit(`const bc = (${p} * (vb - ${x('n', part.collector)}) - ${id}bc) / ${literal(part.emissionVolts)};`);
      emit('const r = 0.5 * (be * be > bc * bc ? be * be : bc * bc); if (r > worst) worst = r; }');
    }
    emit(`if (!limited && worst <= ${literal(tol.quadraticAcceptance)}) { ${all((k) => `t${k} = n${k};`)} converged = true; break; }`);
  }
  toleranceCheck();
  emit(all((k) => `t${k} = n${k};`));
  emit('if (limited) continue;');
  emit('if (within) { converged = true; break; }');
  emit('}'); // newton
  emit('if (!converged) break;');
  // Accept: capacitor histories, predictor points, output.
  for (const { part, id, at } of capacitors) {
    emit(`{ const sq = ${literal(part.farads)} * (${x('t', part.a)} - ${x('t', part.b)}); const dq = ${literal(a0)} * sq + ${id}h; s[${at + 1}] = ${id}s1; ${id}s1 = sq; ${id}d1 = dq; }`);
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
  emit('return i;');
  const code = lines.join('\n');
  return { run: compiled(code), layout, code, constants: Float64Array.from(pool.values) };
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
