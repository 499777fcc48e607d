import { describe, expect, it } from 'vitest';
import * as wavefileNs from 'wavefile';
import { decodeWav } from '../../src/audio/wav-read.ts';
import { encodeWav, WAV_SAMPLE_FORMATS, type WavSampleFormat } from '../../src/audio/wav-write.ts';
import { WavStreamEncoder } from '../../src/audio/wav-stream.ts';
import { SeededRandom } from '../../src/numeric/random.ts';
import { inputErrorOf } from '../helpers/input-error.ts';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
const WaveFile = (wavefileNs as any).WaveFile ?? (wavefileNs as any).default.WaveFile;

// Byte builders written from the RIFF/WAVE layout in the Microsoft/IBM "Multimedia Programming
// Interface and Data Specifications 1.0" (1991): little-endian, 4-char id + u32 size, even padding.
const ascii = (text: string): number[] => [...text].map((c) => c.charCodeAt(0));
function chunk(id: string, body: Uint8Array, declaredSize = body.length): Uint8Array {
  const out = new Uint8Array(8 + body.length + (body.length & 1));
  out.set(ascii(id), 0);
  new DataView(out.buffer).setUint32(4, declaredSize, true);
  out.set(body, 8);
  return out;
}
function riff(...chunks: Uint8Array[]): Uint8Array {
  const size = chunks.reduce((sum, c) => sum + c.length, 0);
  const out = new Uint8Array(12 + size);
  out.set(ascii('RIFF'), 0);
  new DataView(out.buffer).setUint32(4, 4 + size, true);
  out.set(ascii('WAVE'), 8);
  let at = 12;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}
/** fmt body; `subFormat` given = WAVE_FORMAT_EXTENSIBLE (Microsoft "Multiple Channel Audio Data and WAVE Files"). */
function fmtBody(code: number, channels: number, rate: number, bits: number, subFormat?: number): Uint8Array {
  const body = new Uint8Array(subFormat === undefined ? 16 : 40);
  const v = new DataView(body.buffer);
  v.setUint16(0, subFormat === undefined ? code : 0xfffe, true);
  v.setUint16(2, channels, true);
  v.setUint32(4, rate, true);
  v.setUint32(8, (rate * channels * bits) / 8, true);
  v.setUint16(12, (channels * bits) / 8, true);
  v.setUint16(14, bits, true);
  if (subFormat !== undefined) {
    v.setUint16(16, 22, true);
    v.setUint16(18, bits, true);
    v.setUint16(24, subFormat, true);
    body.set([0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71], 26);
  }
  return body;
}
const le = (array: Int16Array | Int32Array | Float32Array | Float64Array): Uint8Array => new Uint8Array(array.buffer);

describe('decodeWav', () => {
  it('maps 16-bit codes c to c/32768 (full negative scale is exactly −1)', () => {
    const bytes = riff(chunk('fmt ', fmtBody(1, 1, 8000, 16)), chunk('data', le(new Int16Array([0, 16384, -32768, 32767, -1]))));
    const wav = decodeWav(bytes, 'a.wav');
    expect(wav.sampleRateHertz).toBe(8000);
    expect(wav.format).toEqual({ encoding: 'pcm', bitsPerSample: 16, channelCount: 1 });
    expect(Array.from(wav.mono)).toEqual([0, 0.5, -1, 32767 / 32768, -1 / 32768]);
  });

  it('reads unsigned 8-bit PCM with offset 128 (RIFF spec 1991, WAVE data format)', () => {
    const bytes = riff(chunk('fmt ', fmtBody(1, 1, 8000, 8)), chunk('data', new Uint8Array([128, 192, 0, 255])));
    expect(Array.from(decodeWav(bytes, 'a.wav').mono)).toEqual([0, 0.5, -1, 127 / 128]);
  });

  it('reads signed 24-bit and 32-bit PCM little-endian', () => {
    const codes24 = [0, 1, -1, 8388607, -8388608, 4194304];
    const data24 = new Uint8Array(codes24.length * 3);
    codes24.forEach((code, i) => {
      const u = code & 0xffffff;
      data24.set([u & 0xff, (u >> 8) & 0xff, (u >> 16) & 0xff], 3 * i);
    });
    const wav24 = decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 48000, 24)), chunk('data', data24)), 'b.wav');
    expect(Array.from(wav24.mono)).toEqual(codes24.map((c) => c / 8388608));
    const codes32 = [0, 1, -1, 2147483647, -2147483648];
    const wav32 = decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 48000, 32)), chunk('data', le(new Int32Array(codes32)))), 'c.wav');
    expect(Array.from(wav32.mono)).toEqual(codes32.map((c) => c / 2147483648));
  });

  it('reads 32-bit and 64-bit float, plain and WAVE_FORMAT_EXTENSIBLE', () => {
    const values = [0, 0.5, -0.25, 1.5, -3];
    for (const [bits, data] of [[32, le(new Float32Array(values))], [64, le(new Float64Array(values))]] as const) {
      for (const sub of [undefined, 3]) {
        const wav = decodeWav(riff(chunk('fmt ', fmtBody(3, 1, 44100, bits, sub)), chunk('data', data)), 'f.wav');
        expect(wav.format).toEqual({ encoding: 'float', bitsPerSample: bits, channelCount: 1 });
        expect(Array.from(wav.mono)).toEqual(values);
      }
    }
  });

  it('deinterleaves stereo and three-channel files and mixes mono as the mean of the channels', () => {
    const stereo = decodeWav(riff(chunk('fmt ', fmtBody(1, 2, 8000, 16)), chunk('data', le(new Int16Array([16384, -16384, 8192, 0])))), 's.wav');
    expect(stereo.channels.map((c) => Array.from(c))).toEqual([[0.5, 0.25], [-0.5, 0]]);
    expect(Array.from(stereo.mono)).toEqual([0, 0.125]);
    const three = decodeWav(riff(chunk('fmt ', fmtBody(1, 3, 8000, 16, 1)), chunk('data', le(new Int16Array([3, 6, 9, -3, -6, -9])))), 't.wav');
    expect(three.channels.length).toBe(3);
    expect(Array.from(three.channels[2])).toEqual([9 / 32768, -9 / 32768]);
    expect(Array.from(three.mono)).toEqual([6 / 32768, -6 / 32768]);
  });

  it('skips odd-sized chunks and their pad byte, and does not read the pad byte of odd data as a sample', () => {
    const list = chunk('LIST', new Uint8Array([1, 2, 3, 4, 5]));
    const before = decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 8000, 16)), list, chunk('data', le(new Int16Array([100, -200]))), ), 'p.wav');
    expect(Array.from(before.mono)).toEqual([100 / 32768, -200 / 32768]);
    const odd = decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 8000, 8)), chunk('data', new Uint8Array([129, 130, 131])), list), 'q.wav');
    expect(Array.from(odd.mono)).toEqual([1 / 128, 2 / 128, 3 / 128]);
  });

  it('agrees with the wavefile package on files wavefile writes, 64-bit float included', () => {
    const rng = new SeededRandom(7);
    const cases: [string, number, (x: number) => number][] = [
      ['8', 128, (x) => Math.round(x * 127) + 128],
      ['16', 32768, (x) => Math.round(x * 32767)],
      ['24', 8388608, (x) => Math.round(x * 8388607)],
      ['32', 2147483648, (x) => Math.round(x * 2147483647)],
      ['32f', 1, (x) => Math.fround(x)],
      ['64', 1, (x) => x],
    ];
    for (const [depth, scale, make] of cases) {
      const raw = Array.from({ length: 64 }, () => make(rng.uniform() * 2 - 1));
      const written = new WaveFile();
      written.fromScratch(2, 22050, depth, [raw, raw.slice().reverse()]);
      const ours = decodeWav(written.toBuffer(), `wavefile-${depth}.wav`);
      const reference = new WaveFile();
      reference.fromBuffer(written.toBuffer());
      const theirs = reference.getSamples(false, Float64Array) as Float64Array[];
      const offset = depth === '8' ? 128 : 0;
      for (let c = 0; c < 2; c++) {
        expect(Array.from(ours.channels[c])).toEqual(Array.from(theirs[c], (v) => (v - offset) / scale));
      }
      expect(ours.sampleRateHertz).toBe(22050);
    }
  });

  describe('bad input gives an InputError naming the byte and what was expected', () => {
    const good = encodeWav(new Float64Array(44100).fill(0.25), 44100, 'pcm16').bytes; // 88200 data bytes at byte 44

    it('a file that is not WAVE', () => {
      const text = new TextEncoder().encode('Control, bay two is clear.\n');
      expect(inputErrorOf(() => decodeWav(text, 'notes.txt')).message).toBe('notes.txt byte 0: found "Cont"; not a WAVE file; expected "RIFF"');
    });
    it('a zero-length file', () => {
      expect(inputErrorOf(() => decodeWav(new Uint8Array(0), 'empty.wav')).message).toBe('empty.wav byte 0: the file is empty (0 bytes); expected "RIFF"');
    });
    it('a truncated header', () => {
      expect(inputErrorOf(() => decodeWav(good.slice(0, 10), 'cut.wav')).message).toMatch(/^cut\.wav byte 10: the file ends after 10 bytes \(truncated header\)/);
      expect(inputErrorOf(() => decodeWav(good.slice(0, 30), 'cut.wav')).message).toMatch(/^cut\.wav byte 12: .*"fmt " chunk.*only 10 follow \(file truncated\)/);
      expect(inputErrorOf(() => decodeWav(good.slice(0, 40), 'cut.wav')).message).toBe('cut.wav byte 36: the file ends without one (header only); expected a "data" chunk');
    });
    it('a data chunk longer than the file', () => {
      expect(inputErrorOf(() => decodeWav(good.slice(0, 44 + 1000), 'song.wav')).message).toBe(
        'song.wav byte 36: data chunk declares 88200 bytes but only 1000 follow (file truncated); expected 88200 bytes of sample data',
      );
    });
    it('an unsupported format code, zero channels, a zero sample rate, odd sizes', () => {
      const data = chunk('data', new Uint8Array(4));
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(6, 1, 8000, 8)), data), 'x.wav')).message).toBe(
        'x.wav byte 20: unsupported format code 0x0006 (A-law); expected format code 1 (PCM) or 3 (IEEE float)',
      );
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(1, 0, 8000, 16)), data), 'x.wav')).where).toBe('x.wav byte 22');
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 0, 16)), data), 'x.wav')).message).toBe(
        'x.wav byte 24: the file declares 0 Hz; expected a sample rate above 0 Hz',
      );
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 8000, 12)), data), 'x.wav')).where).toBe('x.wav byte 34');
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 8000, 16)), chunk('data', new Uint8Array(3))), 'x.wav')).expected).toMatch(/whole number of 2-byte frames/);
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(1, 1, 8000, 16)), chunk('data', new Uint8Array(0))), 'x.wav')).message).toBe(
        'x.wav byte 36: the data chunk is empty; expected at least one sample frame',
      );
      const nan = le(new Float32Array([0, Number.NaN]));
      expect(inputErrorOf(() => decodeWav(riff(chunk('fmt ', fmtBody(3, 1, 8000, 32)), chunk('data', nan)), 'x.wav')).where).toBe('x.wav byte 48');
    });
  });
});

describe('encodeWav', () => {
  const rng = new SeededRandom(2024);
  const noise = (n: number, peak: number): Float64Array => Float64Array.from({ length: n }, () => (rng.uniform() * 2 - 1) * peak);
  const step: Record<WavSampleFormat, number> = { pcm8: 2 ** -7, pcm16: 2 ** -15, pcm24: 2 ** -23, pcm32: 2 ** -31, float32: 0, float64: 0 };

  for (const format of WAV_SAMPLE_FORMATS) {
    for (const channelCount of [1, 2]) {
      it(`round-trips ${format} ${channelCount === 1 ? 'mono' : 'stereo'} to within half a quantisation step`, () => {
        const input = Array.from({ length: channelCount }, () => noise(1001, 0.99));
        const { bytes, clippedSamples } = encodeWav(channelCount === 1 ? input[0] : input, 32000, format);
        expect(clippedSamples).toBe(0);
        const wav = decodeWav(bytes, `rt.${format}.wav`);
        expect(wav.sampleRateHertz).toBe(32000);
        expect(wav.format.channelCount).toBe(channelCount);
        for (let c = 0; c < channelCount; c++) {
          const q = step[format];
          for (let i = 0; i < 1001; i++) {
            const x = input[c][i];
            // Grid values with ties away from zero (the rule wav-write.ts states); + 0 turns −0 into 0.
            const nearest = (v: number): number => Math.sign(v) * Math.floor(Math.abs(v) + 0.5) + 0;
            const expected = q === 0 ? (format === 'float32' ? Math.fround(x) : x) : nearest(x / q) * q;
            expect(wav.channels[c][i]).toBe(expected);
            if (q > 0) expect(Math.abs(wav.channels[c][i] - x)).toBeLessThanOrEqual(q / 2);
          }
        }
      });
    }
  }

  it('writes the header values of the RIFF/WAVE specification', () => {
    // Expected values: nBlockAlign = channels·bits/8, nAvgBytesPerSec = rate·nBlockAlign
    // (Microsoft/IBM, Multimedia Programming Interface and Data Specifications 1.0, 1991).
    const header = (bytes: Uint8Array) => {
      const v = new DataView(bytes.buffer);
      return { riffSize: v.getUint32(4, true), fmtSize: v.getUint32(16, true), code: v.getUint16(20, true), byteRate: v.getUint32(28, true), blockAlign: v.getUint16(32, true), bits: v.getUint16(34, true) };
    };
    const mono16 = encodeWav(new Float64Array(10), 44100, 'pcm16').bytes;
    expect(mono16.length).toBe(44 + 20);
    expect(header(mono16)).toEqual({ riffSize: 56, fmtSize: 16, code: 1, byteRate: 88200, blockAlign: 2, bits: 16 });
    expect(String.fromCharCode(...mono16.slice(36, 40))).toBe('data');
    const stereo24 = encodeWav([new Float64Array(4), new Float64Array(4)], 48000, 'pcm24').bytes;
    expect(header(stereo24)).toMatchObject({ code: 1, blockAlign: 6, byteRate: 288000, bits: 24 });
    const stereoFloat = encodeWav([new Float64Array(5), new Float64Array(5)], 48000, 'float32').bytes;
    expect(header(stereoFloat)).toMatchObject({ fmtSize: 18, code: 3, blockAlign: 8, byteRate: 384000, bits: 32 });
    const v = new DataView(stereoFloat.buffer);
    expect(v.getUint16(36, true)).toBe(0); // cbSize
    expect(String.fromCharCode(...stereoFloat.slice(38, 42))).toBe('fact');
    expect(v.getUint32(46, true)).toBe(5); // frames per channel
    expect(String.fromCharCode(...stereoFloat.slice(50, 54))).toBe('data');
    expect(stereoFloat.length).toBe(58 + 40);
  });

  it('writes more than two channels as WAVE_FORMAT_EXTENSIBLE and reads them back', () => {
    const input = [noise(9, 0.5), noise(9, 0.5), noise(9, 0.5)];
    const { bytes } = encodeWav(input, 96000, 'float64');
    const v = new DataView(bytes.buffer);
    expect(v.getUint16(20, true)).toBe(0xfffe);
    expect(v.getUint16(36, true)).toBe(22);
    expect(v.getUint16(44, true)).toBe(3);
    expect(decodeWav(bytes, 'x.wav').channels.map((c) => Array.from(c))).toEqual(input.map((c) => Array.from(c)));
  });

  it('pads an odd-length data chunk and counts the pad in the RIFF size', () => {
    const { bytes } = encodeWav(new Float64Array([0, 0.5, -0.5]), 8000, 'pcm8');
    expect(bytes.length).toBe(48);
    expect(new DataView(bytes.buffer).getUint32(4, true)).toBe(40);
    expect(new DataView(bytes.buffer).getUint32(40, true)).toBe(3);
    expect(Array.from(bytes.slice(44))).toEqual([128, 192, 64, 0]);
  });

  it('rounds to nearest with ties away from zero, and saturates and counts samples outside full scale', () => {
    const ties = encodeWav(new Float64Array([0.5 / 32768, -0.5 / 32768, 1.49 / 32768, -1.5 / 32768]), 8000, 'pcm16').bytes;
    expect(Array.from(new Int16Array(ties.slice(44).buffer))).toEqual([1, -1, 1, -2]);
    const loud = encodeWav(new Float64Array([1.2, -1.2, 1, -1, 0.999]), 8000, 'pcm16');
    expect(loud.clippedSamples).toBe(3); // +1.0 is one step beyond 32767/32768
    expect(Array.from(new Int16Array(loud.bytes.slice(44).buffer))).toEqual([32767, -32768, 32767, -32768, 32735]);
    expect(encodeWav(new Float64Array([1.2, -3]), 8000, 'float32').clippedSamples).toBe(0);
  });

  it('files it writes are read identically by the wavefile package', () => {
    for (const format of WAV_SAMPLE_FORMATS) {
      const input = [noise(50, 0.9), noise(50, 0.9)];
      const { bytes } = encodeWav(input, 44100, format);
      const reference = new WaveFile();
      reference.fromBuffer(bytes);
      const theirs = reference.getSamples(false, Float64Array) as Float64Array[];
      const ours = decodeWav(bytes, 'x.wav').channels;
      const scale = format.startsWith('float') ? 1 : 2 ** (Number(format.slice(3)) - 1);
      const offset = format === 'pcm8' ? 128 : 0;
      expect(Array.from(theirs[1], (v) => (v - offset) / scale)).toEqual(Array.from(ours[1]));
    }
  });

  it('rejects non-finite samples, a bad rate, mismatched channels and empty input', () => {
    expect(inputErrorOf(() => encodeWav(new Float64Array([0, Number.NaN]), 8000, 'pcm16')).where).toBe('samples[0][1]');
    expect(inputErrorOf(() => encodeWav(new Float64Array(2), 44100.5, 'pcm16')).where).toBe('sampleRateHertz');
    expect(inputErrorOf(() => encodeWav([new Float64Array(2), new Float64Array(3)], 8000, 'pcm16')).where).toBe('samples[1]');
    expect(inputErrorOf(() => encodeWav(new Float64Array(0), 8000, 'pcm16')).expected).toBe('at least one sample frame');
    expect(inputErrorOf(() => encodeWav(new Float64Array(2), 8000, 'mp3' as WavSampleFormat)).where).toBe('format');
  });
});

describe('WavStreamEncoder', () => {
  it('writes, chunk by chunk, the same bytes as encodeWav writes in one go', () => {
    const samples = Float64Array.from({ length: 1001 }, (_, i) => Math.sin(i / 7) * 1.2);
    for (const format of ['pcm8', 'pcm16', 'pcm24', 'float32', 'float64'] as const) {
      const whole = encodeWav(samples, 22050, format);
      const stream = new WavStreamEncoder(samples.length, 22050, format);
      const parts = [stream.header(), stream.encode(samples.subarray(0, 333)), stream.encode(samples.subarray(333)), stream.trailer()];
      const joined = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
      let at = 0;
      for (const p of parts) {
        joined.set(p, at);
        at += p.length;
      }
      expect(joined).toEqual(whole.bytes);
      expect(stream.clippedSamples).toBe(whole.clippedSamples);
    }
  });
});
