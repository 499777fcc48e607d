/**
 * WAVE file reading, core (no Node APIs: the caller hands over the bytes). The header
 * is parsed by wav-header.ts; the sample decoding here is shared with the streaming
 * reader (wav-frame-reader.ts), which decodes the same frames block by block.
 *
 * The samples are decoded here rather than by the wavefile package: wavefile 11.0.0
 * returns the raw integer bits for an EXTENSIBLE 32-bit float file, counts the pad byte
 * of an odd-length data chunk as a sample, and silently returns fewer frames for a
 * truncated file (each seen on this machine; test/audio/wav.test.ts keeps it as a
 * cross-check for the files it does read correctly).
 *
 * Scaling: PCM code c of an N-bit sample becomes c / 2^(N−1) (8-bit: (c − 128) / 128),
 * so full negative scale is exactly −1 and full positive scale is 1 − 2^(1−N).
 * wav-write.ts uses the same factor, so decode(encode(x)) is x rounded to the grid.
 */
import { InputError } from '../errors.ts';
import { bytesReader } from './byte-reader.ts';
import { parseWavHeader, type FmtChunk } from './wav-header.ts';

export { SUBFORMAT_GUID_TAIL, WAVE_FORMAT_EXTENSIBLE, WAVE_FORMAT_IEEE_FLOAT, WAVE_FORMAT_PCM } from './wav-header.ts';

export interface WavFormat {
  encoding: 'pcm' | 'float';
  bitsPerSample: number;
  channelCount: number;
}

export interface DecodedWav {
  sampleRateHertz: number;
  /** One array per channel, full scale ±1. */
  channels: Float64Array[];
  /** Mean of the channels (a copy even for mono). */
  mono: Float64Array;
  format: WavFormat;
}

/**
 * Decode a WAVE file. `label` names the file in error messages, which also give the
 * byte offset and what was expected there.
 */
export function decodeWav(bytes: Uint8Array, label: string): DecodedWav {
  const { fmt, dataAt, dataSize, frames } = parseWavHeader(bytesReader(bytes), label);
  const channels: Float64Array[] = [];
  for (let c = 0; c < fmt.channelCount; c++) channels.push(new Float64Array(frames));
  decodeFrames(bytes.subarray(dataAt, dataAt + dataSize), dataAt, frames, fmt, channels, label, 0);
  const mono = new Float64Array(frames);
  mixToMono(channels, frames, mono);
  return {
    sampleRateHertz: fmt.sampleRateHertz,
    channels,
    mono,
    format: { encoding: fmt.encoding, bitsPerSample: fmt.bitsPerSample, channelCount: fmt.channelCount },
  };
}

/** The mean of the channels' first `frames` samples into `mono` (channel by channel, in order). */
export function mixToMono(channels: readonly Float64Array[], frames: number, mono: Float64Array): void {
  mono.fill(0, 0, frames);
  const share = 1 / channels.length;
  for (const channel of channels) for (let i = 0; i < frames; i++) mono[i] += channel[i] * share;
}

/**
 * Decodes `frames` interleaved frames from `bytes`, which start at byte `fileAt` of the
 * file, into `channels[c][0…frames)`. `firstFrame` numbers the frames in messages.
 */
export function decodeFrames(
  bytes: Uint8Array,
  fileAt: number,
  frames: number,
  fmt: FmtChunk,
  channels: readonly Float64Array[],
  label: string,
  firstFrame: number,
): void {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const bytesPerSample = fmt.bitsPerSample / 8;
  const channelCount = fmt.channelCount;
  for (let c = 0; c < channelCount; c++) {
    const out = channels[c];
    let at = c * bytesPerSample;
    const stride = fmt.blockAlign;
    if (fmt.encoding === 'float') {
      const wide = fmt.bitsPerSample === 64;
      for (let i = 0; i < frames; i++, at += stride) {
        const value = wide ? view.getFloat64(at, true) : view.getFloat32(at, true);
        if (!Number.isFinite(value)) {
          throw new InputError(`${label} byte ${fileAt + at}`, 'a finite float sample', `found ${value} (frame ${firstFrame + i}, channel ${c})`);
        }
        out[i] = value;
      }
    } else if (fmt.bitsPerSample === 8) {
      for (let i = 0; i < frames; i++, at += stride) out[i] = (view.getUint8(at) - 128) / 128;
    } else if (fmt.bitsPerSample === 16) {
      for (let i = 0; i < frames; i++, at += stride) out[i] = view.getInt16(at, true) / 32768;
    } else if (fmt.bitsPerSample === 24) {
      for (let i = 0; i < frames; i++, at += stride) {
        // Low 16 bits unsigned plus the signed top byte.
        const code = view.getUint16(at, true) + view.getInt8(at + 2) * 65536;
        out[i] = code / 8388608;
      }
    } else {
      for (let i = 0; i < frames; i++, at += stride) out[i] = view.getInt32(at, true) / 2147483648;
    }
  }
}
