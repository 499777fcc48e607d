/**
 * Turns a sparse elimination program into straight-line JavaScript: every
 * index is a literal, so the engine's inner loop is a fixed list of
 * multiply-adds with no index arrays to chase. The code is built only from
 * integers of the program and the pivot threshold, never from user text.
 */
import { int } from './kernel/literals.ts';

export interface EliminationProgram {
  size: number;
  pivotRow: Int32Array;
  pivotCol: Int32Array;
  pivotSlot: Int32Array;
  lowerStart: Int32Array;
  lowerSlot: Int32Array;
  lowerRow: Int32Array;
  upperStart: Int32Array;
  upperSlot: Int32Array;
  upperCol: Int32Array;
  updateTarget: Int32Array;
}

export interface StraightLineLu {
  /** Factors v in place; false when a pivot falls below the threshold (order gone stale). */
  factor: (v: Float64Array) => boolean;
  /** Solves with the factors: b is overwritten, the answer goes to x. */
  solve: (v: Float64Array, b: Float64Array, x: Float64Array) => void;
}


export function generateStraightLineLu(program: EliminationProgram, pivotThreshold: number): StraightLineLu {
  const [v, b, x, fail] = ['v', 'b', 'x', 'return false;'];
  if (!(pivotThreshold > 0 && pivotThreshold < 1)) throw new Error('pivot threshold must be in (0, 1)');
  const threshold = pivotThreshold.toExponential(17);
  const f: string[] = ['let p = 0, a = 0, c = 0, m = 0;'];
  const s: string[] = ['let bk = 0;'];
  let t = 0;
  for (let k = 0; k < program.size; k++) {
    const l0 = program.lowerStart[k];
    const l1 = program.lowerStart[k + 1];
    const u0 = program.upperStart[k];
    const u1 = program.upperStart[k + 1];
    f.push(`p = ${v}[${int(program.pivotSlot[k])}]; c = p < 0 ? -p : p;`);
    if (l1 > l0) {
      f.push('m = 0;');
      for (let q = l0; q < l1; q++) f.push(`a = ${v}[${int(program.lowerSlot[q])}]; if (a < 0) a = -a; if (a > m) m = a;`);
      f.push(`if (!(c > ${threshold} * m) || c === 0) ${fail}`);
    } else {
      f.push(`if (c === 0 || c !== c) ${fail}`);
    }
    if (l1 > l0) f.push('p = 1 / p;');
    for (let q = l0; q < l1; q++) {
      const ls = int(program.lowerSlot[q]);
      f.push(`m = ${v}[${ls}] *= p;`);
      for (let u = u0; u < u1; u++) f.push(`${v}[${int(program.updateTarget[t++])}] -= m * ${v}[${int(program.upperSlot[u])}];`);
    }
    // Forward substitution for this pivot.
    if (l1 > l0) {
      s.push(`bk = ${b}[${int(program.pivotRow[k])}];`);
      for (let q = l0; q < l1; q++) s.push(`${b}[${int(program.lowerRow[q])}] -= ${v}[${int(program.lowerSlot[q])}] * bk;`);
    }
  }
  for (let k = program.size - 1; k >= 0; k--) {
    const terms: string[] = [];
    for (let u = program.upperStart[k]; u < program.upperStart[k + 1]; u++) {
      terms.push(` - ${v}[${int(program.upperSlot[u])}] * ${x}[${int(program.upperCol[u])}]`);
    }
    s.push(`${x}[${int(program.pivotCol[k])}] = (${b}[${int(program.pivotRow[k])}]${terms.join('')}) / ${v}[${int(program.pivotSlot[k])}];`);
  }
  const code = { factor: f.join('\n'), solve: s.join('\n') };
  return {
    factor: new Function(v, `${code.factor}\nreturn true;`) as StraightLineLu['factor'],
    solve: new Function(v, b, x, code.solve) as StraightLineLu['solve'],
  };
}
