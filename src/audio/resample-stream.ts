/**
 * resample() chunk by chunk: the same output, sample for sample (the same kernel and
 * loop, resample-kernel.ts), holding only the inputs that outputs still to come will
 * read (about 2 × 67 samples of the lower rate plus one chunk). An output is computed
 * once every input it reads has arrived; finish() ends the signal (zero past its end,
 * as in resample) and gives the last round(n·to/from) − (outputs so far) samples.
 */
import { InputError } from '../errors.ts';
import { checkRate, resampledLength } from './resample.ts';
import { firstInputOf, lastInputOf, resampleKernel, resampleSpan, type ResampleKernel } from './resample-kernel.ts';

export class StreamResampler {
  private readonly kernel: ResampleKernel | null;
  /** Held inputs: held[j] is input sample heldFrom + j. */
  private held = new Float64Array(4096);
  private heldFrom = 0;
  private heldCount = 0;
  private received = 0;
  private produced = 0;
  private output = new Float64Array(4096);
  private finished = false;

  constructor(
    readonly fromHertz: number,
    readonly toHertz: number,
  ) {
    checkRate('fromHertz', fromHertz);
    checkRate('toHertz', toHertz);
    this.kernel = fromHertz === toHertz ? null : resampleKernel(fromHertz, toHertz);
  }

  /** Output samples given so far. */
  get outputSamples(): number {
    return this.produced;
  }

  /**
   * Feeds the next input samples; returns the outputs now complete (a view that the
   * next call overwrites).
   */
  push(input: Float64Array): Float64Array {
    if (this.finished) throw new InputError('resampler', 'no input after finish()', `got ${input.length} more samples`);
    for (let i = 0; i < input.length; i++) {
      if (!Number.isFinite(input[i])) throw new InputError(`samples[${this.received + i}]`, 'a finite sample value', `got ${input[i]}`);
    }
    const kernel = this.kernel;
    if (kernel === null) {
      const out = this.outputRoom(input.length);
      out.set(input);
      this.received += input.length;
      this.produced += input.length;
      return out;
    }
    this.hold(input, firstInputOf(kernel, this.produced));
    this.received += input.length;
    // Output k is ready once its last input has arrived (the signal's end cannot clip it then).
    let ready = this.produced;
    while (lastInputOf(kernel, ready) < this.received) ready++;
    return this.emit(kernel, ready, this.received - 1);
  }

  /** Ends the input; returns the remaining outputs (a view as for push). */
  finish(): Float64Array {
    if (this.finished) return this.output.subarray(0, 0);
    this.finished = true;
    const kernel = this.kernel;
    const total = resampledLength(this.received, this.fromHertz, this.toHertz);
    if (kernel === null || this.received === 0) return this.output.subarray(0, 0);
    return this.emit(kernel, total, this.received - 1);
  }

  private emit(kernel: ResampleKernel, end: number, last: number): Float64Array {
    const count = end - this.produced;
    const out = this.outputRoom(count);
    resampleSpan(kernel, this.held, this.heldFrom, last, this.produced, end, out, 0);
    this.produced = end;
    return out;
  }

  /** Drops held inputs before `keepFrom`, then appends `input`. */
  private hold(input: Float64Array, keepFrom: number): void {
    const drop = Math.min(Math.max(0, keepFrom - this.heldFrom), this.heldCount);
    if (drop > 0) {
      this.held.copyWithin(0, drop, this.heldCount);
      this.heldFrom += drop;
      this.heldCount -= drop;
    }
    const needed = this.heldCount + input.length;
    if (needed > this.held.length) {
      const grown = new Float64Array(Math.max(needed, 2 * this.held.length));
      grown.set(this.held.subarray(0, this.heldCount));
      this.held = grown;
    }
    this.held.set(input, this.heldCount);
    this.heldCount = needed;
  }

  private outputRoom(count: number): Float64Array {
    if (count > this.output.length) this.output = new Float64Array(Math.max(count, 2 * this.output.length));
    return this.output.subarray(0, count);
  }
}
