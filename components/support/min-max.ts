/**
 * Min/max-per-column decimation for drawing long records: each pixel column
 * gets the lowest and highest sample it covers, so no peak is lost however
 * far out the view is zoomed. A one-level summary (min and max of every block
 * of BLOCK samples) keeps a wide view fast: a minute at 192 kHz is 11.5 M
 * samples but only 45 k blocks.
 */

const BLOCK = 256;

export interface TraceData {
  /** Seconds of each point, ascending (two points per column when decimated). */
  x: Float64Array;
  y: Float64Array;
}

export class MinMaxTrace {
  private readonly blockMin: Float32Array;
  private readonly blockMax: Float32Array;

  constructor(
    readonly samples: ArrayLike<number>,
    readonly rateHertz: number,
  ) {
    const blocks = Math.ceil(samples.length / BLOCK);
    this.blockMin = new Float32Array(blocks);
    this.blockMax = new Float32Array(blocks);
    for (let b = 0; b < blocks; b++) {
      let lo = Infinity;
      let hi = -Infinity;
      const end = Math.min(samples.length, (b + 1) * BLOCK);
      for (let i = b * BLOCK; i < end; i++) {
        const v = samples[i];
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      this.blockMin[b] = lo;
      this.blockMax[b] = hi;
    }
  }

  get durationSeconds(): number {
    return this.samples.length / this.rateHertz;
  }

  /** Sample value nearest to a time (null outside the record). */
  valueAt(seconds: number): number | null {
    const i = Math.round(seconds * this.rateHertz);
    return i >= 0 && i < this.samples.length ? this.samples[i] : null;
  }

  /** Points for `columns` pixel columns between two times. */
  view(startSeconds: number, endSeconds: number, columns: number): TraceData {
    const n = this.samples.length;
    const first = Math.max(0, Math.floor(startSeconds * this.rateHertz));
    const last = Math.min(n, Math.ceil(endSeconds * this.rateHertz) + 1);
    const count = Math.max(0, last - first);
    const cols = Math.max(1, Math.floor(columns));
    if (count <= 2 * cols) {
      const x = new Float64Array(count);
      const y = new Float64Array(count);
      for (let i = 0; i < count; i++) {
        x[i] = (first + i) / this.rateHertz;
        y[i] = this.samples[first + i];
      }
      return { x, y };
    }
    const x = new Float64Array(2 * cols);
    const y = new Float64Array(2 * cols);
    const perColumn = count / cols;
    for (let c = 0; c < cols; c++) {
      const from = first + Math.floor(c * perColumn);
      const to = first + Math.floor((c + 1) * perColumn);
      const [lo, hi] = this.range(from, to);
      const t = from / this.rateHertz;
      x[2 * c] = t;
      x[2 * c + 1] = t;
      y[2 * c] = lo;
      y[2 * c + 1] = hi;
    }
    return { x, y };
  }

  /** Min and max of samples [from, to), using whole blocks where they fit. */
  private range(from: number, to: number): [number, number] {
    let lo = Infinity;
    let hi = -Infinity;
    let i = from;
    const s = this.samples;
    while (i < to && i % BLOCK !== 0) {
      if (s[i] < lo) lo = s[i];
      if (s[i] > hi) hi = s[i];
      i++;
    }
    while (i + BLOCK <= to) {
      const b = i / BLOCK;
      if (this.blockMin[b] < lo) lo = this.blockMin[b];
      if (this.blockMax[b] > hi) hi = this.blockMax[b];
      i += BLOCK;
    }
    while (i < to) {
      if (s[i] < lo) lo = s[i];
      if (s[i] > hi) hi = s[i];
      i++;
    }
    return [lo, hi];
  }
}
