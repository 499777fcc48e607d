import { SlotMatrix } from './slot-matrix.ts';
import { generateStraightLineLu, type StraightLineLu } from './straight-line-lu.ts';

/**
 * Sparse LU factorisation for the MNA matrix, with the elimination order and
 * fill-in worked out once and then replayed as flat index lists.
 *
 * Entries live in a flat `values` array addressed by slot; slot 0 is a trash
 * slot that absorbs every stamp touching the ground row or column, so devices
 * stamp without branches. The pivot order is chosen by Markowitz's criterion
 * with threshold partial pivoting (Markowitz, Management Science 3(3), 1957;
 * Duff, Erisman & Reid, "Direct Methods for Sparse Matrices", ch. 7) on the
 * first numeric matrix, and chosen again whenever a pivot later falls below
 * the threshold relative to its column.
 */
export class SparseLu extends SlotMatrix {
  // The compiled elimination program (built by `order`).
  pivotRow = new Int32Array(0);
  pivotCol = new Int32Array(0);
  pivotSlot = new Int32Array(0);
  lowerStart = new Int32Array(0);
  lowerSlot = new Int32Array(0);
  lowerRow = new Int32Array(0);
  upperStart = new Int32Array(0);
  upperSlot = new Int32Array(0);
  upperCol = new Int32Array(0);
  updateTarget = new Int32Array(0);
  private ordered = false;
  /** How many times the pivot order has been (re)chosen. */
  orderings = 0;
  /** The program as straight-line code (null: run the index-list loops). */
  private generated: StraightLineLu | null = null;


  /** `generate`: replay the elimination as generated straight-line code (the fast path) or as loops over index lists. */
  constructor(
    size: number,
    private readonly generate = true,
  ) {
    super(size);
  }

  /** An elimination order has been chosen (by the first factor). */
  get isOrdered(): boolean {
    return this.ordered;
  }

  /** Relative pivot threshold (fraction of the largest entry below it in its column). */
  static readonly PIVOT_THRESHOLD = 1e-3;

  /**
   * Factors `values` in place; returns false if the matrix is singular, or if
   * a pivot of the current order has become too small: then `needsRestamp`
   * is set, and the next factor of a fresh stamp chooses a new order.
   */
  factor(): boolean {
    this.needsRestamp = false;
    if (this.ordered) {
      if (this.eliminate()) return true;
      this.ordered = false;
      this.needsRestamp = true;
      return false;
    }
    if (!this.order()) return false;
    return this.eliminate();
  }

  private eliminate(): boolean {
    if (this.generated) return this.generated.factor(this.values);
    const v = this.values;
    const n = this.size;
    let t = 0;
    for (let k = 0; k < n; k++) {
      const pivot = v[this.pivotSlot[k]];
      const l0 = this.lowerStart[k];
      const l1 = this.lowerStart[k + 1];
      let columnMax = Math.abs(pivot);
      for (let q = l0; q < l1; q++) {
        const a = Math.abs(v[this.lowerSlot[q]]);
        if (a > columnMax) columnMax = a;
      }
      if (!(Math.abs(pivot) > SparseLu.PIVOT_THRESHOLD * columnMax)) return false;
      const inverse = 1 / pivot;
      const u0 = this.upperStart[k];
      const u1 = this.upperStart[k + 1];
      for (let q = l0; q < l1; q++) {
        const ls = this.lowerSlot[q];
        const m = v[ls] * inverse;
        v[ls] = m;
        if (m === 0) {
          t += u1 - u0;
          continue;
        }
        for (let p = u0; p < u1; p++) v[this.updateTarget[t++]] -= m * v[this.upperSlot[p]];
      }
    }
    return true;
  }

  /** Solves with the factors: `rhs` (length ≥ size) is overwritten; the answer goes to `x`. */
  solve(rhs: Float64Array, x: Float64Array): void {
    if (this.generated) {
      this.generated.solve(this.values, rhs, x);
      return;
    }
    const v = this.values;
    const n = this.size;
    for (let k = 0; k < n; k++) {
      const bk = rhs[this.pivotRow[k]];
      if (bk === 0) continue;
      for (let q = this.lowerStart[k]; q < this.lowerStart[k + 1]; q++) rhs[this.lowerRow[q]] -= v[this.lowerSlot[q]] * bk;
    }
    for (let k = n - 1; k >= 0; k--) {
      let s = rhs[this.pivotRow[k]];
      for (let p = this.upperStart[k]; p < this.upperStart[k + 1]; p++) s -= v[this.upperSlot[p]] * x[this.upperCol[p]];
      x[this.pivotCol[k]] = s / v[this.pivotSlot[k]];
    }
  }

  /**
   * Chooses the pivot order from the current numeric values (on a dense copy;
   * circuits are small and this runs rarely), then compiles the program.
   */
  private order(): boolean {
    const n = this.size;
    const dense = new Float64Array(n * n);
    const structural = new Uint8Array(n * n);
    for (let s = 1; s < this.stampedCount; s++) {
      const at = this.rowOf[s] * n + this.colOf[s];
      dense[at] += this.values[s];
      structural[at] = 1;
    }
    const rowDone = new Uint8Array(n);
    const colDone = new Uint8Array(n);
    const rows: number[] = [];
    const cols: number[] = [];
    for (let k = 0; k < n; k++) {
      const rowCount = new Int32Array(n);
      const colCount = new Int32Array(n);
      const colMax = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        if (rowDone[i]) continue;
        for (let j = 0; j < n; j++) {
          if (colDone[j] || !structural[i * n + j]) continue;
          rowCount[i]++;
          colCount[j]++;
          const a = Math.abs(dense[i * n + j]);
          if (a > colMax[j]) colMax[j] = a;
        }
      }
      let best = -1;
      let bestCost = Infinity;
      let bestMagnitude = 0;
      for (let i = 0; i < n; i++) {
        if (rowDone[i]) continue;
        for (let j = 0; j < n; j++) {
          if (colDone[j] || !structural[i * n + j]) continue;
          const a = Math.abs(dense[i * n + j]);
          if (a === 0 || a < 0.01 * colMax[j]) continue;
          const cost = (rowCount[i] - 1) * (colCount[j] - 1);
          // Prefer the diagonal on ties: it keeps node rows well conditioned.
          const relative = a / colMax[j] + (i === j ? 0.5 : 0);
          if (cost < bestCost || (cost === bestCost && relative > bestMagnitude)) {
            best = i * n + j;
            bestCost = cost;
            bestMagnitude = relative;
          }
        }
      }
      if (best < 0) {
        this.singularUnknown = colDone.indexOf(0);
        return false;
      }
      const pr = Math.floor(best / n);
      const pc = best % n;
      rows.push(pr);
      cols.push(pc);
      rowDone[pr] = 1;
      colDone[pc] = 1;
      const pivot = dense[best];
      for (let i = 0; i < n; i++) {
        if (rowDone[i] || !structural[i * n + pc]) continue;
        const m = dense[i * n + pc] / pivot;
        for (let j = 0; j < n; j++) {
          if (colDone[j] || !structural[pr * n + j]) continue;
          dense[i * n + j] -= m * dense[pr * n + j];
          structural[i * n + j] = 1;
        }
      }
    }
    this.compile(rows, cols);
    this.orderings++;
    this.ordered = true;
    return true;
  }

  /** Symbolic elimination in the chosen order: fill-in slots and flat index lists. */
  private compile(rows: number[], cols: number[]): void {
    const n = this.size;
    const pattern = new Uint8Array(n * n);
    for (let s = 1; s < this.stampedCount; s++) pattern[this.rowOf[s] * n + this.colOf[s]] = 1;
    const slotAt = (i: number, j: number): number => {
      const key = i * n + j;
      return this.slotByKey.get(key) ?? this.addSlot(i, j, key);
    };
    const rowDone = new Uint8Array(n);
    const colDone = new Uint8Array(n);
    const pivotSlot: number[] = [];
    const lowerStart = [0];
    const lowerSlot: number[] = [];
    const lowerRow: number[] = [];
    const upperStart = [0];
    const upperSlot: number[] = [];
    const upperCol: number[] = [];
    const updateTarget: number[] = [];
    for (let k = 0; k < n; k++) {
      const pr = rows[k];
      const pc = cols[k];
      rowDone[pr] = 1;
      colDone[pc] = 1;
      pivotSlot.push(slotAt(pr, pc));
      const lower: number[] = [];
      const upper: number[] = [];
      for (let i = 0; i < n; i++) if (!rowDone[i] && pattern[i * n + pc]) lower.push(i);
      for (let j = 0; j < n; j++) if (!colDone[j] && pattern[pr * n + j]) upper.push(j);
      for (const i of lower) {
        lowerSlot.push(slotAt(i, pc));
        lowerRow.push(i);
      }
      for (const j of upper) {
        upperSlot.push(slotAt(pr, j));
        upperCol.push(j);
      }
      for (const i of lower) {
        for (const j of upper) {
          pattern[i * n + j] = 1;
          updateTarget.push(slotAt(i, j));
        }
      }
      lowerStart.push(lowerSlot.length);
      upperStart.push(upperSlot.length);
    }
    this.pivotRow = Int32Array.from(rows);
    this.pivotCol = Int32Array.from(cols);
    this.pivotSlot = Int32Array.from(pivotSlot);
    this.lowerStart = Int32Array.from(lowerStart);
    this.lowerSlot = Int32Array.from(lowerSlot);
    this.lowerRow = Int32Array.from(lowerRow);
    this.upperStart = Int32Array.from(upperStart);
    this.upperSlot = Int32Array.from(upperSlot);
    this.upperCol = Int32Array.from(upperCol);
    this.updateTarget = Int32Array.from(updateTarget);
    this.generated = this.generate ? generateStraightLineLu(this, SparseLu.PIVOT_THRESHOLD) : null;
    // Fill-in slots extend the storage; stamped entries keep their slots.
    if (this.values.length < this.rowOf.length) {
      const grown = new Float64Array(this.rowOf.length);
      grown.set(this.values.subarray(0, this.stampedCount));
      this.values = grown;
    } else {
      this.values.fill(0, this.stampedCount);
    }
  }
}
