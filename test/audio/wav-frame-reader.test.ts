import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { bytesReader, type ByteReader } from '../../src/audio/byte-reader.ts';
import { WavFrameReader } from '../../src/audio/wav-frame-reader.ts';
import { decodeWav } from '../../src/audio/wav-read.ts';
import { encodeWav, WAV_SAMPLE_FORMATS } from '../../src/audio/wav-write.ts';
import { SeededRandom } from '../../src/numeric/random.ts';
import { inputErrorOf } from '../helpers/input-error.ts';

/** Reads all frames in chunks of random length and joins them. */
function readAll(reader: WavFrameReader, rng: SeededRandom, maxChunk: number): Float64Array {
  const out = new Float64Array(reader.frames);
  let at = 0;
  for (;;) {
    const want = Math.max(1, Math.floor(rng.uniform() * maxChunk));
    const got = reader.read(at < out.length ? out.subarray(at, at + want) : new Float64Array(want));
    if (got === 0) break;
    at += got;
  }
  expect(at).toBe(reader.frames);
  return out;
}

describe('WavFrameReader', () => {
  const rng = new SeededRandom(31);
  const noise = (n: number): Float64Array => Float64Array.from({ length: n }, () => rng.uniform() * 1.8 - 0.9);

  for (const format of WAV_SAMPLE_FORMATS) {
    for (const channelCount of [1, 2, 3]) {
      it(`reads ${format} with ${channelCount} channel(s) in random chunks as decodeWav's mono, bit for bit`, () => {
        // More frames than one read block (16384), so block edges fall inside the chunks.
        const channels = Array.from({ length: channelCount }, () => noise(40_001));
        const bytes = encodeWav(channelCount === 1 ? channels[0] : channels, 44100, format).bytes;
        const whole = decodeWav(bytes, 'x.wav');
        const reader = new WavFrameReader(bytesReader(bytes), 'x.wav');
        expect(reader.sampleRateHertz).toBe(44100);
        expect(reader.frames).toBe(40_001);
        expect(reader.format).toEqual(whole.format);
        expect(readAll(reader, rng, 30_000)).toEqual(whole.mono);
        reader.rewind();
        expect(readAll(reader, rng, 7)).toEqual(whole.mono);
      });
    }
  }

  it('reads the bundled speech recording as decodeWav does', () => {
    const bytes = new Uint8Array(readFileSync(new URL('../../samples/speech/bay-talkback.wav', import.meta.url)));
    const reader = new WavFrameReader(bytesReader(bytes), 'bay-talkback.wav');
    expect(readAll(reader, rng, 5000)).toEqual(decodeWav(bytes, 'bay-talkback.wav').mono);
  });

  describe('bad input gives the same InputError as decodeWav, naming the byte', () => {
    const good = encodeWav(new Float64Array(44100).fill(0.25), 44100, 'pcm16').bytes; // 88200 data bytes at byte 44
    const same = (bytes: Uint8Array): void => {
      const expected = inputErrorOf(() => decodeWav(bytes, 'cut.wav')).message;
      expect(inputErrorOf(() => new WavFrameReader(bytesReader(bytes), 'cut.wav')).message).toBe(expected);
    };

    it('a truncated file (header and part of the samples)', () => {
      same(good.slice(0, 10));
      same(good.slice(0, 30));
      same(good.slice(0, 40));
      same(good.slice(0, 44 + 1000));
      expect(inputErrorOf(() => new WavFrameReader(bytesReader(good.slice(0, 44 + 1000)), 'cut.wav')).where).toBe('cut.wav byte 36');
    });

    it('a header that claims more data than the file holds', () => {
      const lying = good.slice();
      new DataView(lying.buffer).setUint32(40, 88200 + 2, true);
      same(lying);
      expect(inputErrorOf(() => new WavFrameReader(bytesReader(lying), 'cut.wav')).message).toMatch(/^cut\.wav byte 36: data chunk declares 88202 bytes but only 88200 follow/);
    });

    it('a non-finite float sample far into the file, with its byte offset', () => {
      const samples = new Float64Array(50_000);
      const bytes = encodeWav(samples, 8000, 'float32').bytes;
      const dataAt = bytes.length - 4 * 50_000; // header length of this writer
      new DataView(bytes.buffer).setFloat32(dataAt + 4 * 40_000, Number.POSITIVE_INFINITY, true);
      const reader = new WavFrameReader(bytesReader(bytes), 'f.wav');
      const expected = inputErrorOf(() => decodeWav(bytes, 'f.wav'));
      const error = inputErrorOf(() => readAll(reader, rng, 10_000));
      expect(error.message).toBe(expected.message);
      expect(error.where).toBe(`f.wav byte ${dataAt + 160_000}`);
    });

    it('a file that shrinks while it is read (the reader returns fewer bytes than asked)', () => {
      const shrinking: ByteReader = {
        byteLength: good.length,
        read: (offset, length) => good.subarray(offset, Math.min(offset + length, 44 + 5000)),
      };
      const reader = new WavFrameReader(shrinking, 'cut.wav');
      const error = inputErrorOf(() => reader.read(new Float64Array(44100)));
      expect(error.where).toBe('cut.wav byte 5044');
    });
  });
});
