import { InputError } from '../errors.ts';
import { wavLayout, writeSamples, type WavSampleFormat } from './wav-write.ts';

/**
 * Encodes a mono WAV file chunk by chunk when the length is known in advance,
 * so a long render never holds its output in memory: `header()` first, then
 * `encode(chunk)` for the samples in order, then `trailer()`.
 */
export class WavStreamEncoder {
  private written = 0;
  clippedSamples = 0;
  private readonly blockAlign: number;
  private readonly layout: ReturnType<typeof wavLayout>;

  constructor(
    readonly frames: number,
    readonly sampleRateHertz: number,
    readonly format: WavSampleFormat,
  ) {
    this.layout = wavLayout(frames, 1, sampleRateHertz, format, true);
    this.blockAlign = this.layout.blockAlign;
  }

  header(): Uint8Array {
    return this.layout.bytes;
  }

  encode(chunk: ArrayLike<number>): Uint8Array {
    if (this.written + chunk.length > this.frames) {
      throw new InputError('wav stream', `${this.frames} frames in all`, `${this.written + chunk.length} given`);
    }
    const samples = chunk instanceof Float64Array ? chunk : Float64Array.from(chunk);
    const bytes = new Uint8Array(samples.length * this.blockAlign);
    this.clippedSamples += writeSamples(new DataView(bytes.buffer), 0, [samples], this.format, this.blockAlign);
    this.written += samples.length;
    return bytes;
  }

  /** The pad byte of an odd-length data chunk; throws if fewer frames came than announced. */
  trailer(): Uint8Array {
    if (this.written !== this.frames) throw new InputError('wav stream', `${this.frames} frames`, `${this.written} were written`);
    return new Uint8Array((this.frames * this.blockAlign) & 1);
  }
}
