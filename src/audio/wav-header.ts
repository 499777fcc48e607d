/**
 * WAVE header parsing, shared by the whole-file decoder (wav-read.ts) and the
 * streaming frame reader (wav-frame-reader.ts). It reads only the chunk headers
 * and the "fmt " body through a ByteReader, so a file of any length costs a few
 * small reads.
 *
 * Layout followed: Microsoft/IBM "Multimedia Programming Interface and Data
 * Specifications 1.0" (1991), RIFF chapter (little-endian chunks: 4-char id, u32 size,
 * body padded to an even length) and WAVE chapter (`fmt ` = WAVEFORMAT + wBitsPerSample,
 * 8-bit PCM unsigned with offset 128, wider PCM signed two's complement); Microsoft
 * "Multiple Channel Audio Data and WAVE Files" for WAVE_FORMAT_EXTENSIBLE (cbSize 22,
 * wValidBitsPerSample, dwChannelMask, SubFormat GUID whose first two bytes are the format code).
 */
import { InputError } from '../errors.ts';
import type { ByteReader } from './byte-reader.ts';

export const WAVE_FORMAT_PCM = 0x0001;
export const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
export const WAVE_FORMAT_EXTENSIBLE = 0xfffe;
/** Bytes 2..15 of every KSDATAFORMAT_SUBTYPE GUID (after the 16-bit format code): 0000-0010-8000-00AA00389B71. */
export const SUBFORMAT_GUID_TAIL = [0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71];

/** The "fmt " chunk as the decoders need it. */
export interface FmtChunk {
  encoding: 'pcm' | 'float';
  channelCount: number;
  sampleRateHertz: number;
  blockAlign: number;
  bitsPerSample: number;
}

/** Where the samples are and how they are laid out. */
export interface WavHeader {
  fmt: FmtChunk;
  /** Byte offset of the first sample frame. */
  dataAt: number;
  /** Bytes of sample data (a whole number of frames, at least one). */
  dataSize: number;
  frames: number;
}

const FORMAT_NAMES: Record<number, string> = {
  0x0002: 'Microsoft ADPCM',
  0x0006: 'A-law',
  0x0007: 'mu-law',
  0x0011: 'IMA ADPCM',
  0x0055: 'MPEG layer 3',
};

/** The largest "fmt " body read: WAVE_FORMAT_EXTENSIBLE's 40 bytes (anything after is not used). */
const FMT_BYTES_USED = 40;

function fourCc(bytes: Uint8Array, offset: number): string {
  return String.fromCharCode(bytes[offset], bytes[offset + 1], bytes[offset + 2], bytes[offset + 3]);
}

/** Printable form of a chunk id for messages (binary junk shown as hex). */
function showId(id: string): string {
  return /^[\x20-\x7e]{4}$/.test(id)
    ? `"${id}"`
    : `0x${[...id].map((c) => c.charCodeAt(0).toString(16).padStart(2, '0')).join('')}`;
}

/** `body` holds the chunk body from byte `at` of the file (at least min(size, 40) bytes). */
function parseFmt(body: Uint8Array, at: number, size: number, label: string): FmtChunk {
  const view = new DataView(body.buffer, body.byteOffset, body.byteLength);
  const where = (offset: number): string => `${label} byte ${offset}`;
  if (size < 16) throw new InputError(where(at - 4), 'a "fmt " chunk of at least 16 bytes', `it declares ${size} bytes`);
  let formatCode = view.getUint16(0, true);
  const channelCount = view.getUint16(2, true);
  const sampleRateHertz = view.getUint32(4, true);
  const blockAlign = view.getUint16(12, true);
  const bitsPerSample = view.getUint16(14, true);
  if (formatCode === WAVE_FORMAT_EXTENSIBLE) {
    const cbSize = size >= 18 ? view.getUint16(16, true) : 0;
    if (size < 40 || cbSize < 22) {
      throw new InputError(where(at + 16), 'cbSize 22 and a 40-byte "fmt " chunk for WAVE_FORMAT_EXTENSIBLE', `fmt size ${size}, cbSize ${cbSize}`);
    }
    const validBits = view.getUint16(18, true);
    if (validBits > bitsPerSample) {
      throw new InputError(where(at + 18), `wValidBitsPerSample ≤ wBitsPerSample (${bitsPerSample})`, `found ${validBits}`);
    }
    formatCode = view.getUint16(24, true);
    for (let i = 0; i < SUBFORMAT_GUID_TAIL.length; i++) {
      if (view.getUint8(26 + i) !== SUBFORMAT_GUID_TAIL[i]) {
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
 * Walks the RIFF chunks of a WAVE file and checks them against its length.
 * `label` names the file in error messages, which also give the byte offset and
 * what was expected there.
 */
export function parseWavHeader(reader: ByteReader, label: string): WavHeader {
  const where = (offset: number): string => `${label} byte ${offset}`;
  const length = reader.byteLength;
  if (length === 0) throw new InputError(where(0), '"RIFF"', 'the file is empty (0 bytes)');
  if (length < 12) {
    throw new InputError(where(length), 'a 12-byte RIFF/WAVE header', `the file ends after ${length} bytes (truncated header)`);
  }
  const head = reader.read(0, 12);
  const riffId = fourCc(head, 0);
  const formType = fourCc(head, 8);
  if (riffId !== 'RIFF') {
    const why = riffId === 'RIFX' ? 'big-endian RIFX is not supported' : riffId === 'RF64' ? 'RF64 (files over 4 GiB) is not supported' : `found ${showId(riffId)}; not a WAVE file`;
    throw new InputError(where(0), '"RIFF"', why);
  }
  if (formType !== 'WAVE') throw new InputError(where(8), '"WAVE"', `found ${showId(formType)}`);

  let fmt: FmtChunk | null = null;
  let dataAt = -1;
  let dataSize = 0;
  let offset = 12;
  // Walk every chunk; bodies are padded to even length (RIFF spec), the pad byte is not counted in the size.
  while (offset + 8 <= length) {
    const chunkHead = reader.read(offset, 8);
    const id = fourCc(chunkHead, 0);
    const size = new DataView(chunkHead.buffer, chunkHead.byteOffset, 8).getUint32(4, true);
    const bodyAt = offset + 8;
    const present = length - bodyAt;
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
      if (fmt === null) fmt = parseFmt(reader.read(bodyAt, Math.min(size, FMT_BYTES_USED)), bodyAt, size, label);
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
  return { fmt, dataAt, dataSize, frames: dataSize / fmt.blockAlign };
}
