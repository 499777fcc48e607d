/**
 * WAVE file reading, core (no Node APIs: the caller hands over the bytes).
 *
 * Layout followed: Microsoft/IBM "Multimedia Programming Interface and Data
 * Specifications 1.0" (1991), RIFF chapter (little-endian chunks: 4-char id, u32 size,
 * body padded to an even length) and WAVE chapter (`fmt ` = WAVEFORMAT + wBitsPerSample,
 * 8-bit PCM unsigned with offset 128, wider PCM signed two's complement); Microsoft
 * "Multiple Channel Audio Data and WAVE Files" for WAVE_FORMAT_EXTENSIBLE (cbSize 22,
 * wValidBitsPerSample, dwChannelMask, SubFormat GUID whose first two bytes are the format code).
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

export const WAVE_FORMAT_PCM = 0x0001;
export const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
export const WAVE_FORMAT_EXTENSIBLE = 0xfffe;
/** Bytes 2..15 of every KSDATAFORMAT_SUBTYPE GUID (after the 16-bit format code): 0000-0010-8000-00AA00389B71. */
export const SUBFORMAT_GUID_TAIL = [0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71];

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

const FORMAT_NAMES: Record<number, string> = {
  0x0002: 'Microsoft ADPCM',
  0x0006: 'A-law',
  0x0007: 'mu-law',
  0x0011: 'IMA ADPCM',
  0x0055: 'MPEG layer 3',
};

function fourCc(bytes: Uint8Array, offset: number): string {
  return String.fromCharCode(bytes[offset], bytes[offset + 1], bytes[offset + 2], bytes[offset + 3]);
}

/** Printable form of a chunk id for messages (binary junk shown as hex). */
function showId(id: string): string {
  return /^[\x20-\x7e]{4}$/.test(id)
    ? `"${id}"`
    : `0x${[...id].map((c) => c.charCodeAt(0).toString(16).padStart(2, '0')).join('')}`;
}

interface FmtChunk {
  encoding: 'pcm' | 'float';
  channelCount: number;
  sampleRateHertz: number;
  blockAlign: number;
  bitsPerSample: number;
}

function parseFmt(view: DataView, at: number, size: number, label: string): FmtChunk {
  const where = (offset: number): string => `${label} byte ${offset}`;
  if (size < 16) throw new InputError(where(at - 4), 'a "fmt " chunk of at least 16 bytes', `it declares ${size} bytes`);
  let formatCode = view.getUint16(at, true);
  const channelCount = view.getUint16(at + 2, true);
  const sampleRateHertz = view.getUint32(at + 4, true);
  const blockAlign = view.getUint16(at + 12, true);
  const bitsPerSample = view.getUint16(at + 14, true);
  if (formatCode === WAVE_FORMAT_EXTENSIBLE) {
    const cbSize = size >= 18 ? view.getUint16(at + 16, true) : 0;
    if (size < 40 || cbSize < 22) {
      throw new InputError(where(at + 16), 'cbSize 22 and a 40-byte "fmt " chunk for WAVE_FORMAT_EXTENSIBLE', `fmt size ${size}, cbSize ${cbSize}`);
    }
    const validBits = view.getUint16(at + 18, true);
    if (validBits > bitsPerSample) {
      throw new InputError(where(at + 18), `wValidBitsPerSample ≤ wBitsPerSample (${bitsPerSample})`, `found ${validBits}`);
    }
    formatCode = view.getUint16(at + 24, true);
    for (let i = 0; i < SUBFORMAT_GUID_TAIL.length; i++) {
      if (view.getUint8(at + 26 + i) !== SUBFORMAT_GUID_TAIL[i]) {
        throw new InputError(where(at + 24), 'a SubFormat GUID of the form xxxx0000-0000-0010-8000-00AA00389B71', 'unknown SubFormat GUID');
      }
    }
  }
  let encoding: 'pcm' | 'float';
  if (formatCode === WAVE_FORMAT_PCM) encoding = 'pcm';
  else if (formatCode === WAVE_FORMAT_IEEE_FLOAT) encoding = 'float';
  else {
    const name = FORMAT_NAMES[formatCode] ? ` (${FORMAT_NAMES[formatCode]})` : '';
    throw new InputError(where(at), 'format code 1 (PCM) or 3 (IEEE float)', `unsupported format code 0x${formatCode.toString(16).padStart(4, '0')}${name}`);
  }
  if (channelCount === 0) throw new InputError(where(at + 2), 'at least 1 channel', 'the file declares 0 channels');
  if (sampleRateHertz === 0) throw new InputError(where(at + 4), 'a sample rate above 0 Hz', 'the file declares 0 Hz');
  const supported = encoding === 'pcm' ? [8, 16, 24, 32] : [32, 64];
  if (!supported.includes(bitsPerSample)) {
    throw new InputError(where(at + 14), `${supported.join(', ')} bits per ${encoding === 'pcm' ? 'PCM' : 'float'} sample`, `the file declares ${bitsPerSample}`);
  }
  const expectedAlign = (channelCount * bitsPerSample) / 8;
  if (blockAlign !== expectedAlign) {
    throw new InputError(where(at + 12), `nBlockAlign = channels × bits / 8 = ${expectedAlign}`, `the file declares ${blockAlign}`);
  }
  return { encoding, channelCount, sampleRateHertz, blockAlign, bitsPerSample };
}

/**
 * Decode a WAVE file. `label` names the file in error messages, which also give the
 * byte offset and what was expected there.
 */
export function decodeWav(bytes: Uint8Array, label: string): DecodedWav {
  const where = (offset: number): string => `${label} byte ${offset}`;
  if (bytes.length === 0) throw new InputError(where(0), '"RIFF"', 'the file is empty (0 bytes)');
  if (bytes.length < 12) {
    throw new InputError(where(bytes.length), 'a 12-byte RIFF/WAVE header', `the file ends after ${bytes.length} bytes (truncated header)`);
  }
  const riffId = fourCc(bytes, 0);
  if (riffId !== 'RIFF') {
    const why = riffId === 'RIFX' ? 'big-endian RIFX is not supported' : riffId === 'RF64' ? 'RF64 (files over 4 GiB) is not supported' : `found ${showId(riffId)}; not a WAVE file`;
    throw new InputError(where(0), '"RIFF"', why);
  }
  const formType = fourCc(bytes, 8);
  if (formType !== 'WAVE') throw new InputError(where(8), '"WAVE"', `found ${showId(formType)}`);

  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let fmt: FmtChunk | null = null;
  let dataAt = -1;
  let dataSize = 0;
  let offset = 12;
  // Walk every chunk; bodies are padded to even length (RIFF spec), the pad byte is not counted in the size.
  while (offset + 8 <= bytes.length) {
    const id = fourCc(bytes, offset);
    const size = view.getUint32(offset + 4, true);
    const bodyAt = offset + 8;
    const present = bytes.length - bodyAt;
    if (id === 'data') {
      if (size > present) {
        throw new InputError(where(offset), `${size} bytes of sample data`, `data chunk declares ${size} bytes but only ${present} follow (file truncated)`);
      }
      if (dataAt < 0) {
        dataAt = bodyAt;
        dataSize = size;
      }
    } else if (id === 'fmt ') {
      if (size > present) {
        throw new InputError(where(offset), `${size} bytes of "fmt " chunk`, `"fmt " chunk declares ${size} bytes but only ${present} follow (file truncated)`);
      }
      if (fmt === null) fmt = parseFmt(view, bodyAt, size, label);
    } else if (size > present) {
      // A cut-off trailing chunk (metadata) is harmless once the samples are complete.
      if (fmt !== null && dataAt >= 0) break;
      throw new InputError(where(offset), `${size} bytes of chunk ${showId(id)}`, `chunk ${showId(id)} declares ${size} bytes but only ${present} follow (file truncated)`);
    }
    offset = bodyAt + size + (size & 1);
  }
  if (fmt === null) throw new InputError(where(offset), 'a "fmt " chunk', 'the file ends without one');
  if (dataAt < 0) throw new InputError(where(offset), 'a "data" chunk', 'the file ends without one (header only)');
  if (dataSize === 0) throw new InputError(where(dataAt - 8), 'at least one sample frame', 'the data chunk is empty');
  if (dataSize % fmt.blockAlign !== 0) {
    throw new InputError(where(dataAt - 4), `a data size that is a whole number of ${fmt.blockAlign}-byte frames`, `found ${dataSize} bytes`);
  }

  const frames = dataSize / fmt.blockAlign;
  const channels: Float64Array[] = [];
  for (let c = 0; c < fmt.channelCount; c++) channels.push(new Float64Array(frames));
  decodeSamples(view, dataAt, frames, fmt, channels, label);

  const mono = new Float64Array(frames);
  const share = 1 / fmt.channelCount;
  for (const channel of channels) for (let i = 0; i < frames; i++) mono[i] += channel[i] * share;
  return {
    sampleRateHertz: fmt.sampleRateHertz,
    channels,
    mono,
    format: { encoding: fmt.encoding, bitsPerSample: fmt.bitsPerSample, channelCount: fmt.channelCount },
  };
}

function decodeSamples(view: DataView, dataAt: number, frames: number, fmt: FmtChunk, channels: Float64Array[], label: string): void {
  const bytesPerSample = fmt.bitsPerSample / 8;
  const channelCount = fmt.channelCount;
  for (let c = 0; c < channelCount; c++) {
    const out = channels[c];
    let at = dataAt + c * bytesPerSample;
    const stride = fmt.blockAlign;
    if (fmt.encoding === 'float') {
      const wide = fmt.bitsPerSample === 64;
      for (let i = 0; i < frames; i++, at += stride) {
        const value = wide ? view.getFloat64(at, true) : view.getFloat32(at, true);
        if (!Number.isFinite(value)) {
          throw new InputError(`${label} byte ${at}`, 'a finite float sample', `found ${value} (frame ${i}, channel ${c})`);
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
