import type { EliminationProgram } from '../straight-line-lu.ts';
import { int, type ConstantPool } from './literals.ts';

/**
 * Straight-line LU factorisation and solve, with every operation whose operands
 * are fixed for the whole run (resistors, capacitor companions, source
 * incidence, and whatever elimination makes of them alone) done once here
 * instead of at every Newton iteration. Only the entries the junctions stamp,
 * and what they spread to, stay variables. The folded operations are the same
 * floating-point operations in the same order, so the answer is bit for bit the
 * one the unfolded code gives.
 *
 * Matrix entries are the locals `v<slot>`, the right-hand side `w<row>`, the
 * solution `n<col>`. `variable` holds the slots the caller has declared as
 * locals (stamped every iteration); `constantOf(slot)` gives the others' values.
 * `fail` is the statement that gives up when a pivot has gone too small.
 */
export function eliminationCode(
  program: EliminationProgram,
  variable: ReadonlySet<number>,
  constantOf: (slot: number) => number,
  pool: ConstantPool,
  pivotThreshold: number,
  fail: string,
): EliminationCode {
  const out: string[] = [];
  /** Fixed value of each slot not (yet) a variable. */
  const fixed = new Map<number, number>();
  const isVariable = new Set(variable);
  const value = (slot: number): number => {
    let v = fixed.get(slot);
    if (v === undefined) {
      v = constantOf(slot);
      fixed.set(slot, v);
    }
    return v;
  };
  /** The slot's value in code: its local, or the folded number. */
  const ref = (slot: number): string => (isVariable.has(slot) ? `v${int(slot)}` : pool.ref(value(slot)));
  /** Makes a fixed slot a variable from here on, starting at its folded value. */
  const declare = (slot: number): void => {
    if (isVariable.has(slot)) return;
    out.push(`let v${int(slot)} = ${pool.ref(value(slot))};`);
    isVariable.add(slot);
  };

  out.push('let pv = 0, c = 0, m = 0;');
  let target = 0;
  for (let k = 0; k < program.size; k++) {
    const l0 = program.lowerStart[k];
    const l1 = program.lowerStart[k + 1];
    const u0 = program.upperStart[k];
    const u1 = program.upperStart[k + 1];
    const ps = program.pivotSlot[k];
    const lowers = Array.from(program.lowerSlot.subarray(l0, l1));
    const pivotFixed = !isVariable.has(ps);
    const lowersFixed = lowers.every((s) => !isVariable.has(s));
    // Pivot check: at run time unless everything it looks at is fixed.
    if (pivotFixed && lowersFixed) {
      const c = Math.abs(value(ps));
      const m = lowers.reduce((a, s) => Math.max(a, Math.abs(value(s))), 0);
      if (lowers.length > 0 ? !(c > pivotThreshold * m) || c === 0 : c === 0 || c !== c) throw new PivotOrderUnfit();
    } else {
      out.push(`c = Math.abs(${ref(ps)});`);
      if (lowers.length > 0) {
        // The largest fixed entry below the pivot is known now; only the variable ones are looked at.
        const fixedMax = lowers.reduce((a, s) => (isVariable.has(s) ? a : Math.max(a, Math.abs(value(s)))), 0);
        out.push(`m = ${pool.ref(fixedMax)};`);
        for (const s of lowers) if (isVariable.has(s)) out.push(`m = Math.max(m, Math.abs(v${int(s)}));`);
        out.push(`if (!(c > ${pool.ref(pivotThreshold)} * m) || c === 0) ${fail}`);
      } else {
        out.push(`if (c === 0 || c !== c) ${fail}`);
      }
    }
    if (lowers.length === 0) continue;
    const inverse = pivotFixed ? 1 / value(ps) : NaN;
    if (!pivotFixed) out.push(`pv = 1 / v${int(ps)};`);
    for (let q = l0; q < l1; q++) {
      const ls = program.lowerSlot[q];
      // The multiplier m = v[ls] · (1 / pivot), stored back in place of v[ls].
      const multiplierFixed = pivotFixed && !isVariable.has(ls);
      if (multiplierFixed) {
        fixed.set(ls, value(ls) * inverse);
      } else if (isVariable.has(ls)) {
        out.push(`v${int(ls)} *= ${pivotFixed ? pool.ref(inverse) : 'pv'};`);
      } else {
        out.push(`let v${int(ls)} = ${pool.ref(value(ls))} * pv;`);
        isVariable.add(ls);
      }
      for (let up = u0; up < u1; up++) {
        const t = program.updateTarget[target++];
        const us = program.upperSlot[up];
        if (multiplierFixed && !isVariable.has(us)) {
          const product = value(ls) * value(us);
          if (!isVariable.has(t)) fixed.set(t, value(t) - product);
          else out.push(`v${int(t)} -= ${pool.ref(product)};`);
        } else {
          declare(t);
          out.push(`v${int(t)} -= ${ref(ls)} * ${ref(us)};`);
        }
      }
    }
  }
  /**
   * Forward and back substitution with entry `entry(slot)` and `divide(pivotSlot)` (the division by a
   * pivot). Rows in `zeroRows` start at zero: operations on values known to be zero are left out.
   */
  const substitution = (entry: (slot: number) => string, divide: (slot: number) => string, zeroRows: ReadonlySet<number> = new Set()): string[] => {
    const lines: string[] = ['let bk = 0;'];
    const zeroRow = new Set(zeroRows);
    // Forward substitution (unit lower triangle), then back substitution.
    for (let k = 0; k < program.size; k++) {
      const l0 = program.lowerStart[k];
      const l1 = program.lowerStart[k + 1];
      if (l1 === l0 || zeroRow.has(program.pivotRow[k])) continue;
      lines.push(`bk = w${int(program.pivotRow[k])};`);
      for (let q = l0; q < l1; q++) {
        const row = program.lowerRow[q];
        lines.push(zeroRow.delete(row) ? `let w${int(row)} = -${entry(program.lowerSlot[q])} * bk;` : `w${int(row)} -= ${entry(program.lowerSlot[q])} * bk;`);
      }
    }
    const zeroCol = new Set<number>();
    for (let k = program.size - 1; k >= 0; k--) {
      const terms: string[] = [];
      for (let up = program.upperStart[k]; up < program.upperStart[k + 1]; up++) {
        const col = program.upperCol[up];
        if (!zeroCol.has(col)) terms.push(` - ${entry(program.upperSlot[up])} * n${int(col)}`);
      }
      const row = program.pivotRow[k];
      const col = program.pivotCol[k];
      if (zeroRow.has(row) && terms.length === 0) {
        zeroCol.add(col);
        lines.push(`n${int(col)} = 0;`);
      } else {
        lines.push(`n${int(col)} = (${zeroRow.has(row) ? '0' : `w${int(row)}`}${terms.join('')})${divide(program.pivotSlot[k])};`);
      }
    }
    return lines;
  };
  // The variable entries the substitution reads: the factors a later step may solve with again.
  const read = new Set<number>();
  const reading = (slot: number): string => {
    if (isVariable.has(slot)) read.add(slot);
    return ref(slot);
  };
  const solve = substitution(reading, (slot) => ` / ${reading(slot)}`);
  const pivots = new Set(program.pivotSlot);
  const held: HeldFactor[] = [...read].sort((a, b) => a - b).map((slot) => ({ slot, inverse: pivots.has(slot) }));
  const heldIndex = new Map(held.map((f, i) => [f.slot, i]));
  const solveHeld = (place: (index: number) => string, zeroRows?: ReadonlySet<number>): string[] =>
    substitution(
      (slot) => (heldIndex.has(slot) ? place(heldIndex.get(slot) as number) : pool.ref(value(slot))),
      (slot) => ` * ${heldIndex.has(slot) ? place(heldIndex.get(slot) as number) : pool.ref(1 / value(slot))}`,
      zeroRows,
    );
  return { factor: out, solve, held, solveHeld };
}

/** A factor entry kept for later solves: its slot, and whether it is a pivot (kept as its inverse). */
export interface HeldFactor {
  slot: number;
  inverse: boolean;
}

/** The elimination as code: the factorisation, then forward and back substitution. */
export interface EliminationCode {
  factor: string[];
  solve: string[];
  /** The variable factor entries the substitution reads, in the order a held copy keeps them. */
  held: HeldFactor[];
  /**
   * The substitution again, reading held entry i (a pivot as its inverse) from `place(i)`:
   * solves a later step on factors kept from an earlier one. Rows in `zeroRows` are not
   * declared by the caller and start at zero.
   */
  solveHeld(place: (index: number) => string, zeroRows?: ReadonlySet<number>): string[];
}

/** The elimination order does not suit the fixed entries (a fixed pivot too small): no kernel. */
export class PivotOrderUnfit extends Error {
  constructor() {
    super('the elimination order has a pivot below the threshold on the fixed entries');
  }
}
