/**
 * WAVE file writing, by hand (core, returns bytes; the caller saves them).
 *
 * Headers follow the Microsoft/IBM "Multimedia Programming Interface and Data
 * Specifications 1.0" (1991): nBlockAlign = channels × bits / 8, nAvgBytesPerSec =
 * rate × nBlockAlign, chunk bodies padded to even length. Choices:
 * - PCM with 1 or 2 channels: the plain 16-byte PCM `fmt ` (44-byte header), read by everything.
 * - IEEE float: an 18-byte `fmt ` with cbSize = 0 plus a `fact` chunk (frame count), because
 *   the specification asks every non-PCM format for a `fact` chunk.
 * - More than 2 channels: WAVE_FORMAT_EXTENSIBLE (Microsoft, "Multiple Channel Audio Data and
 *   WAVE Files"), dwChannelMask 0 = no speaker positions claimed.
 *
 * Quantisation: code = round(x × 2^(N−1)) with ties away from zero (so encode(−x) = −encode(x)),
 * then clamped to [−2^(N−1), 2^(N−1) − 1]; 8-bit adds the offset 128. The factor is 2^(N−1)
 * (32768 for 16 bits), not 2^(N−1) − 1, because it is the one that wav-read.ts divides by:
 * every code is then an exact binary fraction, decode(encode(x)) equals x to within half a
 * step, and the 8/16/24/32-bit grids nest exactly. The price: +1.0 itself is not
 * representable and saturates to 1 − 2^(1−N); it is counted in `clippedSamples`.
 * Float formats do not clip (values beyond ±1 are kept).
 */
import { InputError } from '../errors.ts';
import { SUBFORMAT_GUID_TAIL, WAVE_FORMAT_EXTENSIBLE, WAVE_FORMAT_IEEE_FLOAT, WAVE_FORMAT_PCM } from './wav-read.ts';

export const WAV_SAMPLE_FORMATS = ['pcm8', 'pcm16', 'pcm24', 'pcm32', 'float32', 'float64'] as const;
export type WavSampleFormat = (typeof WAV_SAMPLE_FORMATS)[number];

export interface EncodedWav {
  bytes: Uint8Array;
  /** Samples (over all channels) that lay outside the format's range and were saturated. */
  clippedSamples: number;
}

const BITS: Record<WavSampleFormat, number> = { pcm8: 8, pcm16: 16, pcm24: 24, pcm32: 32, float32: 32, float64: 64 };

function roundHalfAwayFromZero(value: number): number {
  return value < 0 ? -Math.floor(-value + 0.5) : Math.floor(value + 0.5);
}

export function encodeWav(samples: Float64Array | Float64Array[], sampleRateHertz: number, format: WavSampleFormat): EncodedWav {
  const channels = Array.isArray(samples) ? samples : [samples];
  if (!WAV_SAMPLE_FORMATS.includes(format)) {
    throw new InputError('format', `one of ${WAV_SAMPLE_FORMATS.join(', ')}`, `got ${JSON.stringify(format)}`);
  }
  if (!Number.isInteger(sampleRateHertz) || sampleRateHertz < 1 || sampleRateHertz > 0xffffffff) {
    throw new InputError('sampleRateHertz', 'a whole number of hertz from 1 to 4294967295', `got ${sampleRateHertz}`);
  }
  if (channels.length === 0 || channels.length > 0xffff) {
    throw new InputError('samples', 'from 1 to 65535 channels', `got ${channels.length}`);
  }
  const frames = channels[0].length;
  if (frames === 0) throw new InputError('samples', 'at least one sample frame', 'got none');
  channels.forEach((channel, c) => {
    if (channel.length !== frames) {
      throw new InputError(`samples[${c}]`, `${frames} samples like channel 0`, `got ${channel.length}`);
    }
    for (let i = 0; i < frames; i++) {
      if (!Number.isFinite(channel[i])) throw new InputError(`samples[${c}][${i}]`, 'a finite number', `got ${channel[i]}`);
    }
  });

  const { bytes, dataAt, blockAlign } = wavLayout(frames, channels.length, sampleRateHertz, format);
  const view = new DataView(bytes.buffer);
  const clippedSamples = writeSamples(view, dataAt, channels, format, blockAlign);
  return { bytes, clippedSamples };
}

/**
 * A whole file's bytes with the header filled in and the sample data left
 * zero: `dataAt` is where the samples start. With `headerOnly`, just the header
 * (for writing the samples chunk by chunk after it).
 */
export function wavLayout(
  frames: number,
  channelCount: number,
  sampleRateHertz: number,
  format: WavSampleFormat,
  headerOnly = false,
): { bytes: Uint8Array; dataAt: number; blockAlign: number; totalBytes: number } {
  const isFloat = format === 'float32' || format === 'float64';
  const bits = BITS[format];
  const extensible = channelCount > 2;
  const blockAlign = (channelCount * bits) / 8;
  const dataSize = frames * blockAlign;
  const fmtSize = extensible ? 40 : isFloat ? 18 : 16;
  const factChunkSize = isFloat ? 12 : 0;
  const headerSize = 12 + 8 + fmtSize + factChunkSize + 8;
  const total = headerSize + dataSize + (dataSize & 1);
  if (total - 8 > 0xffffffff) {
    throw new InputError('samples', 'under 4 GiB of sample data (RIFF size limit)', `${dataSize} bytes needed`);
  }

  const bytes = new Uint8Array(headerOnly ? headerSize : total);
  const view = new DataView(bytes.buffer);
  const ascii = (at: number, text: string): void => {
    for (let i = 0; i < 4; i++) bytes[at + i] = text.charCodeAt(i);
  };
  ascii(0, 'RIFF');
  view.setUint32(4, total - 8, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  view.setUint32(16, fmtSize, true);
  const formatCode = isFloat ? WAVE_FORMAT_IEEE_FLOAT : WAVE_FORMAT_PCM;
  view.setUint16(20, extensible ? WAVE_FORMAT_EXTENSIBLE : formatCode, true);
  view.setUint16(22, channelCount, true);
  view.setUint32(24, sampleRateHertz, true);
  view.setUint32(28, sampleRateHertz * blockAlign, true);
  view.setUint16(32, blockAlign, true);
  view.setUint16(34, bits, true);
  if (fmtSize >= 18) view.setUint16(36, fmtSize - 18, true); // cbSize: 0, or 22 for EXTENSIBLE
  if (extensible) {
    view.setUint16(38, bits, true); // wValidBitsPerSample
    view.setUint32(40, 0, true); // dwChannelMask
    view.setUint16(44, formatCode, true);
    bytes.set(SUBFORMAT_GUID_TAIL, 46);
  }
  let at = 20 + fmtSize;
  if (isFloat) {
    ascii(at, 'fact');
    view.setUint32(at + 4, 4, true);
    view.setUint32(at + 8, frames, true);
    at += 12;
  }
  ascii(at, 'data');
  view.setUint32(at + 4, dataSize, true);
  at += 8;

  return { bytes, dataAt: at, blockAlign, totalBytes: total };
}

/** Writes interleaved samples at `dataAt`; returns how many saturated. */
export function writeSamples(view: DataView, dataAt: number, channels: Float64Array[], format: WavSampleFormat, blockAlign: number): number {
  const bytesPerSample = BITS[format] / 8;
  const scale = 2 ** (BITS[format] - 1);
  const lowest = -scale;
  const highest = scale - 1;
  let clipped = 0;
  channels.forEach((channel, c) => {
    let at = dataAt + c * bytesPerSample;
    for (let i = 0; i < channel.length; i++, at += blockAlign) {
      const x = channel[i];
      if (format === 'float64') {
        view.setFloat64(at, x, true);
        continue;
      }
      if (format === 'float32') {
        if (!Number.isFinite(Math.fround(x))) {
          throw new InputError(`samples[${c}][${i}]`, 'a value within the float32 range (±3.4e38)', `got ${x}`);
        }
        view.setFloat32(at, x, true);
        continue;
      }
      let code = roundHalfAwayFromZero(x * scale);
      if (code > highest) {
        code = highest;
        clipped++;
      } else if (code < lowest) {
        code = lowest;
        clipped++;
      }
      if (format === 'pcm8') view.setUint8(at, code + 128);
      else if (format === 'pcm16') view.setInt16(at, code, true);
      else if (format === 'pcm24') {
        view.setUint16(at, code & 0xffff, true);
        view.setInt8(at + 2, code >> 16);
      } else view.setInt32(at, code, true);
    }
  });
  return clipped;
}
