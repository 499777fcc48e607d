import { SlotMatrix } from './slot-matrix.ts';

/**
 * The straightforward reference: copy the stamped entries into a dense matrix
 * and eliminate with partial pivoting every time (Golub & Van Loan, "Matrix
 * Computations", alg. 3.4.1). Slow but simple; the fast paths are checked against it.
 */
export class DenseLu extends SlotMatrix {
  private dense = new Float64Array(0);
  private permutation = new Int32Array(0);

  override finalise(): void {
    super.finalise();
    this.dense = new Float64Array(this.size * this.size);
    this.permutation = new Int32Array(this.size);
  }

  factor(): boolean {
    const n = this.size;
    const a = this.dense;
    a.fill(0);
    for (let s = 1; s < this.stampedCount; s++) a[this.rowOf[s] * n + this.colOf[s]] += this.values[s];
    const perm = this.permutation;
    for (let i = 0; i < n; i++) perm[i] = i;
    for (let k = 0; k < n; k++) {
      let best = k;
      let bestMagnitude = Math.abs(a[k * n + k]);
      for (let i = k + 1; i < n; i++) {
        const m = Math.abs(a[i * n + k]);
        if (m > bestMagnitude) {
          best = i;
          bestMagnitude = m;
        }
      }
      if (!(bestMagnitude > 0)) {
        this.singularUnknown = k;
        return false;
      }
      if (best !== k) {
        for (let j = 0; j < n; j++) {
          const t = a[k * n + j];
          a[k * n + j] = a[best * n + j];
          a[best * n + j] = t;
        }
        const t = perm[k];
        perm[k] = perm[best];
        perm[best] = t;
      }
      const inverse = 1 / a[k * n + k];
      for (let i = k + 1; i < n; i++) {
        const m = a[i * n + k] * inverse;
        a[i * n + k] = m;
        if (m === 0) continue;
        for (let j = k + 1; j < n; j++) a[i * n + j] -= m * a[k * n + j];
      }
    }
    return true;
  }

  solve(rhs: Float64Array, x: Float64Array): void {
    const n = this.size;
    const a = this.dense;
    const perm = this.permutation;
    for (let i = 0; i < n; i++) {
      let s = rhs[perm[i]];
      for (let j = 0; j < i; j++) s -= a[i * n + j] * x[j];
      x[i] = s;
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = x[i];
      for (let j = i + 1; j < n; j++) s -= a[i * n + j] * x[j];
      x[i] = s / a[i * n + i];
    }
  }
}
