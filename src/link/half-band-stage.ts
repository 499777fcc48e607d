/**
 * One 2× rate change through a half-band filter h (length 2c + 1, c odd, h[c] = 1/2, zeros at even
 * offsets from c). Polyphase: one branch is the centre tap alone (a pure delay), the other holds
 * the (c + 1)/2 symmetric pairs, so each stage costs (c + 1)/2 multiplies per low-rate sample.
 * Samples go through a block at a time: the block sits behind the last inputs it needs from
 * before, in one line (`DelayLine`), so every filter window is contiguous and the inner loop is
 * plain (a sample-at-a-time ring cost 2–3 ns per multiply here, the line under 2 ns).
 */

/**
 * The inputs a filter window reaches back to, followed by the block being filtered. The line moves
 * on when the next block comes in, so that nothing runs after a stage's filter loop: code the
 * engine compiles in the middle of a long loop has not seen what follows the loop and would drop
 * back to the interpreter there on every call.
 */
class DelayLine {
  /** line[0 … keep) are the last `keep` inputs before the block; the block follows. */
  line: Float64Array;
  /** The length of the block in the line, to move past when the next one comes. */
  private loaded = 0;

  constructor(private readonly keep: number) {
    this.line = new Float64Array(keep); // grows to the first block's length
  }

  /** Puts `count` inputs after the kept ones (growing the line if needed); returns the line. */
  load(input: Float64Array, count: number): Float64Array {
    const keep = this.keep;
    this.line.copyWithin(0, this.loaded, this.loaded + keep);
    this.loaded = count;
    if (this.line.length < keep + count) {
      const grown = new Float64Array(keep + count);
      grown.set(this.line.subarray(0, keep));
      this.line = grown;
    }
    const line = this.line;
    for (let j = 0; j < count; j++) line[keep + j] = input[j];
    return line;
  }
}

/** Low rate → twice the rate. For input x[m] the two outputs are v[2m−1], v[2m]. */
export class HalfBandUpStage {
  /** Latency in samples of this stage's input (low) rate: (c + 1)/2. */
  readonly latencyLowSamples: number;
  private readonly pairTaps: Float64Array;
  private readonly centre: number;
  private readonly delay: DelayLine;

  constructor(halfBandTaps: Float64Array) {
    const centre = (halfBandTaps.length - 1) / 2;
    this.centre = centre;
    this.delay = new DelayLine(centre); // v[2m] reaches back to x[m − c]
    // v[2m] = Σ_{a=0}^{(c−1)/2} 2·h[2a]·(x[m − a] + x[m − c + a])
    this.pairTaps = new Float64Array((centre + 1) / 2);
    for (let a = 0; a < this.pairTaps.length; a++) this.pairTaps[a] = 2 * halfBandTaps[2 * a];
    this.latencyLowSamples = (centre + 1) / 2;
  }

  /** Filters `count` inputs into 2 × count outputs. */
  process(input: Float64Array, count: number, output: Float64Array): void {
    const line = this.delay.load(input, count);
    const taps = this.pairTaps;
    const pairs = taps.length;
    const c = this.centre;
    const delayed = (c + 1) / 2;
    for (let j = 0; j < count; j++) {
      const newest = c + j; // line[newest − k] = x[m − k]
      const oldest = j;
      // Two running sums (even and odd pairs), so that each addition need not wait on the last.
      let even = 0;
      let odd = 0;
      let a = 0;
      for (; a + 1 < pairs; a += 2) {
        even += taps[a] * (line[newest - a] + line[oldest + a]);
        odd += taps[a + 1] * (line[newest - a - 1] + line[oldest + a + 1]);
      }
      if (a < pairs) even += taps[a] * (line[newest - a] + line[oldest + a]);
      output[2 * j] = line[newest - delayed]; // 2·h[c] = 1: the pure-delay branch
      output[2 * j + 1] = even + odd;
    }
  }
}

/** High rate → half the rate: one output for every second input (odd input index). */
export class HalfBandDownStage {
  /** Latency in samples of this stage's output (low) rate: (c − 1)/2. */
  readonly latencyLowSamples: number;
  private readonly pairTaps: Float64Array;
  private readonly centre: number;
  private readonly delay: DelayLine;
  /** The next input has an odd index (it completes an output). */
  private odd = false;

  constructor(halfBandTaps: Float64Array) {
    const centre = (halfBandTaps.length - 1) / 2;
    this.centre = centre;
    this.delay = new DelayLine(2 * centre);
    // y[m] = (h∗x)[2m+1] = x[i−c]/2 + Σ_j h[c−2j−1]·(x[i−c+2j+1] + x[i−c−2j−1]), i = 2m+1
    this.pairTaps = new Float64Array((centre + 1) / 2);
    for (let j = 0; j < this.pairTaps.length; j++) this.pairTaps[j] = halfBandTaps[centre - 2 * j - 1];
    this.latencyLowSamples = (centre - 1) / 2;
  }

  /** Filters `count` inputs; writes one output per completed pair and returns how many. */
  process(input: Float64Array, count: number, output: Float64Array): number {
    const line = this.delay.load(input, count);
    const taps = this.pairTaps;
    const pairs = taps.length;
    const c = this.centre;
    const first = this.odd ? 0 : 1;
    if (count % 2 === 1) this.odd = !this.odd;
    let written = 0;
    for (let j = first; j < count; j += 2) {
      const mid = c + j; // line[2c + j] is the input completing this output
      let even = 0;
      let odd = 0;
      let a = 0;
      for (; a + 1 < pairs; a += 2) {
        even += taps[a] * (line[mid + 2 * a + 1] + line[mid - 2 * a - 1]);
        odd += taps[a + 1] * (line[mid + 2 * a + 3] + line[mid - 2 * a - 3]);
      }
      if (a < pairs) even += taps[a] * (line[mid + 2 * a + 1] + line[mid - 2 * a - 1]);
      output[written++] = 0.5 * line[mid] + (even + odd);
    }
    return written;
  }
}
