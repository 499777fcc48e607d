import { describe, expect, it } from 'vitest';
import { resample } from '../../src/audio/resample.ts';
import { StreamResampler } from '../../src/audio/resample-stream.ts';
import { InputError } from '../../src/errors.ts';
import { SeededRandom } from '../../src/numeric/random.ts';

/** Feeds `signal` in chunks of random length (0…maxChunk) and joins the outputs. */
function streamed(signal: Float64Array, from: number, to: number, rng: SeededRandom, maxChunk: number): Float64Array {
  const resampler = new StreamResampler(from, to);
  const parts: number[] = [];
  let at = 0;
  while (at < signal.length) {
    const n = Math.min(signal.length - at, Math.floor(rng.uniform() * (maxChunk + 1)));
    parts.push(...resampler.push(signal.subarray(at, at + n)));
    at += n;
  }
  parts.push(...resampler.finish());
  return Float64Array.from(parts);
}

const maxDifference = (a: Float64Array, b: Float64Array): number => a.reduce((m, v, i) => Math.max(m, Math.abs(v - b[i])), 0);

describe('StreamResampler', () => {
  // Pairs cover both branches of the kernel: integer rates (the phase bank) and an irrational ratio (the table).
  const pairs: Array<[number, number]> = [
    [44100, 48000],
    [22050, 48000],
    [48000, 44100],
    [48000, 8000],
    [8000, 48000],
    [48000, 10000 * Math.PI],
    [48000, 48000],
  ];
  for (const [from, to] of pairs) {
    it(`fed random chunks of random signals gives resample()'s output for ${from} Hz to ${to.toFixed(1)} Hz (within 1e-12)`, () => {
      const rng = new SeededRandom(Math.round(from + to));
      for (const length of [0, 1, 7, 150, 3001, 20000]) {
        const signal = Float64Array.from({ length }, () => rng.uniform() * 2 - 1);
        const whole = resample(signal, from, to);
        for (const maxChunk of [1, 37, 1024, 50000]) {
          const parts = streamed(signal, from, to, rng, maxChunk);
          expect(parts.length).toBe(whole.length);
          expect(maxDifference(parts, whole)).toBeLessThanOrEqual(1e-12);
          expect(parts).toEqual(whole); // in fact bit-identical: the same weights in the same order
        }
      }
    });
  }

  it('holds a bounded number of inputs however long the signal', () => {
    const resampler = new StreamResampler(44100, 48000);
    const chunk = new Float64Array(1000).fill(0.5);
    let outputs = 0;
    for (let i = 0; i < 500; i++) outputs += resampler.push(chunk).length;
    outputs += resampler.finish().length;
    expect(outputs).toBe(Math.round((500_000 * 48000) / 44100));
    // The kernel reaches about 67 input samples either side; a chunk more is all it keeps.
    expect((resampler as unknown as { held: Float64Array }).held.length).toBeLessThanOrEqual(4096);
  });

  it('rejects a non-finite sample naming its index in the whole signal, and bad rates', () => {
    const resampler = new StreamResampler(44100, 48000);
    resampler.push(new Float64Array(10));
    const error = (() => {
      try {
        resampler.push(Float64Array.from([0, 0, Number.NaN]));
      } catch (e) {
        return e;
      }
    })();
    expect(error).toBeInstanceOf(InputError);
    expect((error as InputError).where).toBe('samples[12]');
    expect(() => new StreamResampler(0, 48000)).toThrow(/fromHertz/);
  });
});
