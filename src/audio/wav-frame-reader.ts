/**
 * Reads a WAVE file's frames block by block as mono (the mean of the channels),
 * through a ByteReader, so a recording of any length is read in constant memory.
 * Same formats, same mono mix (bit for bit) and same error messages as decodeWav,
 * whose header parsing and sample decoding it shares.
 */
import { InputError } from '../errors.ts';
import type { ByteReader } from './byte-reader.ts';
import { decodeFrames, mixToMono, type WavFormat } from './wav-read.ts';
import { parseWavHeader, type WavHeader } from './wav-header.ts';

/** Frames decoded per read of the file (bounds the scratch memory). */
const BLOCK_FRAMES = 16384;

export class WavFrameReader {
  readonly sampleRateHertz: number;
  /** Frames in the file. */
  readonly frames: number;
  readonly format: WavFormat;
  private readonly header: WavHeader;
  private readonly scratch: Float64Array[];
  private position = 0;

  constructor(
    private readonly reader: ByteReader,
    readonly label: string,
  ) {
    this.header = parseWavHeader(reader, label);
    const fmt = this.header.fmt;
    this.sampleRateHertz = fmt.sampleRateHertz;
    this.frames = this.header.frames;
    this.format = { encoding: fmt.encoding, bitsPerSample: fmt.bitsPerSample, channelCount: fmt.channelCount };
    this.scratch = Array.from({ length: fmt.channelCount }, () => new Float64Array(BLOCK_FRAMES));
  }

  /** Frames read so far. */
  get framesRead(): number {
    return this.position;
  }

  /** Back to the first frame (for another pass). */
  rewind(): void {
    this.position = 0;
  }

  /**
   * Fills `mono` with the next frames (as many as fit and remain) and returns how
   * many; 0 at the end of the data.
   */
  read(mono: Float64Array): number {
    const { fmt, dataAt } = this.header;
    const count = Math.min(mono.length, this.frames - this.position);
    let done = 0;
    while (done < count) {
      const frames = Math.min(BLOCK_FRAMES, count - done);
      const at = dataAt + (this.position + done) * fmt.blockAlign;
      const bytes = this.reader.read(at, frames * fmt.blockAlign);
      if (bytes.length !== frames * fmt.blockAlign) {
        throw new InputError(`${this.label} byte ${at + bytes.length}`, `${frames * fmt.blockAlign} bytes of sample data from byte ${at}`, `only ${bytes.length} could be read`);
      }
      decodeFrames(bytes, at, frames, fmt, this.scratch, this.label, this.position + done);
      mixToMono(this.scratch, frames, mono.subarray(done, done + frames));
      done += frames;
    }
    this.position += count;
    return count;
  }
}
