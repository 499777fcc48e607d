/**
 * One 2× rate change through a half-band filter h (length 2c + 1, c odd, h[c] = 1/2, zeros at even
 * offsets from c). Polyphase: one branch is the centre tap alone (a pure delay), the other holds
 * the (c + 1)/2 symmetric pairs, so each stage costs (c + 1)/2 multiplies per low-rate sample.
 * Samples are pushed one at a time; state lives in a doubled ring buffer so every filter window
 * is contiguous and nothing is allocated after construction.
 */

/** Low rate → twice the rate. After push(x[m]) the two new outputs are out0 = v[2m−1], out1 = v[2m]. */
export class HalfBandUpStage {
  /** Latency in samples of this stage's input (low) rate: (c + 1)/2. */
  readonly latencyLowSamples: number;
  out0 = 0;
  out1 = 0;
  private readonly pairTaps: Float64Array;
  private readonly centre: number;
  private readonly size: number;
  private readonly ring: Float64Array;
  private newest: number;

  constructor(halfBandTaps: Float64Array) {
    const centre = (halfBandTaps.length - 1) / 2;
    this.centre = centre;
    this.size = centre + 1; // v[2m] reaches back to x[m − c]
    this.ring = new Float64Array(2 * this.size);
    this.newest = this.size - 1;
    // v[2m] = Σ_{a=0}^{(c−1)/2} 2·h[2a]·(x[m − a] + x[m − c + a])
    this.pairTaps = new Float64Array((centre + 1) / 2);
    for (let a = 0; a < this.pairTaps.length; a++) this.pairTaps[a] = 2 * halfBandTaps[2 * a];
    this.latencyLowSamples = (centre + 1) / 2;
  }

  push(x: number): void {
    const size = this.size;
    let newest = this.newest + 1;
    if (newest === 2 * size) newest = size;
    this.newest = newest;
    this.ring[newest] = x;
    this.ring[newest - size] = x;
    // ring[newest − k] = x[m − k] for k = 0..size−1
    const ring = this.ring;
    const taps = this.pairTaps;
    const oldest = newest - this.centre;
    let sum = 0;
    for (let a = 0; a < taps.length; a++) sum += taps[a] * (ring[newest - a] + ring[oldest + a]);
    this.out0 = ring[newest - (this.centre + 1) / 2]; // 2·h[c] = 1: the pure-delay branch
    this.out1 = sum;
  }
}

/** High rate → half the rate. push() returns true on every second input (odd input index). */
export class HalfBandDownStage {
  /** Latency in samples of this stage's output (low) rate: (c − 1)/2. */
  readonly latencyLowSamples: number;
  out = 0;
  private readonly pairTaps: Float64Array;
  private readonly centre: number;
  private readonly size: number;
  private readonly ring: Float64Array;
  private newest: number;
  private odd = false;

  constructor(halfBandTaps: Float64Array) {
    const centre = (halfBandTaps.length - 1) / 2;
    this.centre = centre;
    this.size = halfBandTaps.length;
    this.ring = new Float64Array(2 * this.size);
    this.newest = this.size - 1;
    // y[m] = (h∗x)[2m+1] = x[i−c]/2 + Σ_j h[c−2j−1]·(x[i−c+2j+1] + x[i−c−2j−1]), i = 2m+1
    this.pairTaps = new Float64Array((centre + 1) / 2);
    for (let j = 0; j < this.pairTaps.length; j++) this.pairTaps[j] = halfBandTaps[centre - 2 * j - 1];
    this.latencyLowSamples = (centre - 1) / 2;
  }

  push(x: number): boolean {
    const size = this.size;
    let newest = this.newest + 1;
    if (newest === 2 * size) newest = size;
    this.newest = newest;
    this.ring[newest] = x;
    this.ring[newest - size] = x;
    this.odd = !this.odd;
    if (this.odd) return false;
    const ring = this.ring;
    const taps = this.pairTaps;
    const mid = newest - this.centre;
    let sum = 0.5 * ring[mid];
    for (let j = 0; j < taps.length; j++) sum += taps[j] * (ring[mid + 2 * j + 1] + ring[mid - 2 * j - 1]);
    this.out = sum;
    return true;
  }
}
