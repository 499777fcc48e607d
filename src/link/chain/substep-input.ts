/**
 * A circuit's input between internal samples, when its stage takes several
 * integration steps per sample. The internal-rate signal is band-limited (it
 * comes out of the upsampler, or is the light that the transmitter's output
 * makes), so the values between samples are interpolated by an 8-point Lagrange
 * polynomial centred on the interval (Abramowitz & Stegun, Handbook of
 * Mathematical Functions, 25.2.2), not by a straight line: a straight line's
 * corners excite the circuits' fast poles, and a run with finer steps would then
 * converge to the corners rather than to the signal. Centring needs three samples
 * of look-ahead, so the stage runs `holdbackSamples` behind its input. With one
 * step per sample the samples pass straight through.
 */
export class SubstepInput {
  /** Internal samples held back for the look-ahead (0 with one step per sample). */
  readonly holdbackSamples: number;
  /** Weights for substeps 1 … substeps−1 of a sample, 8 each. */
  private readonly weights: Float64Array;
  /** x[e−4 … e+pending−1], where e is the next sample to hand on. */
  private readonly buffer: Float64Array;
  private pending = 0;

  constructor(
    readonly substeps: number,
    /** Look-ahead to keep, in internal samples (at least 3 when substeps > 1). */
    holdbackSamples: number,
    /** The input before the run starts (the value the operating point was found at). */
    restingValue: number,
    maxChunkSamples: number,
  ) {
    if (!(Number.isInteger(substeps) && substeps >= 1)) throw new Error(`substeps must be a whole number ≥ 1, got ${substeps}`);
    this.holdbackSamples = substeps === 1 ? 0 : holdbackSamples;
    if (substeps > 1 && holdbackSamples < 3) throw new Error('the substep interpolation needs at least three samples of look-ahead');
    this.weights = new Float64Array(8 * (substeps - 1));
    for (let j = 1; j < substeps; j++) {
      // Nodes at 0…7 (x[e−4] … x[e+3]); the interval x[e−1] → x[e] is from 3 to 4.
      const at = 3 + j / substeps;
      for (let p = 0; p < 8; p++) {
        let w = 1;
        for (let r = 0; r < 8; r++) if (r !== p) w *= (at - r) / (p - r);
        this.weights[8 * (j - 1) + p] = w;
      }
    }
    this.buffer = new Float64Array(4 + this.holdbackSamples + maxChunkSamples);
    this.buffer.fill(restingValue, 0, 4);
  }

  /**
   * Takes `m` new internal samples and writes `substeps` inputs for each sample
   * it hands on into `out` (the last of each group is the sample itself); returns
   * how many samples it handed on.
   */
  process(input: Float64Array, m: number, out: Float64Array): number {
    const s = this.substeps;
    if (s === 1) {
      for (let i = 0; i < m; i++) out[i] = input[i];
      return m;
    }
    const buffer = this.buffer;
    const weights = this.weights;
    for (let i = 0; i < m; i++) buffer[4 + this.pending + i] = input[i];
    this.pending += m;
    const count = Math.max(0, this.pending - this.holdbackSamples);
    for (let q = 0; q < count; q++) {
      for (let j = 1; j < s; j++) {
        const w = 8 * (j - 1);
        let v = 0;
        for (let p = 0; p < 8; p++) v += weights[w + p] * buffer[q + p];
        out[q * s + j - 1] = v;
      }
      out[q * s + s - 1] = buffer[q + 4];
    }
    buffer.copyWithin(0, count, 4 + this.pending);
    this.pending -= count;
    return count;
  }
}

/**
 * The look-ahead a stage keeps when it takes substeps: the three samples the
 * interpolation needs, rounded up to whole audio samples so the hold-back is a
 * whole number of audio samples at the end of the run.
 */
export function substepHoldback(factor: number): number {
  return factor * Math.ceil(3 / factor);
}
