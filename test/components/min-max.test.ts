import { describe, expect, it } from 'vitest';
import { MinMaxTrace } from '../../components/support/min-max.ts';

/** Seeded xorshift so the record is the same every run. */
function noise(length: number, seed: number): Float32Array {
  const out = new Float32Array(length);
  let s = seed >>> 0 || 1;
  for (let i = 0; i < length; i++) {
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    out[i] = (s >>> 0) / 4294967296 - 0.5;
  }
  return out;
}

describe('min/max decimation for drawing', () => {
  it('gives each pixel column exactly the lowest and highest sample it covers', () => {
    const rate = 1000;
    const x = noise(100_003, 42);
    const trace = new MinMaxTrace(x, rate);
    const start = 1.2345;
    const end = 77.7;
    const columns = 640;
    const view = trace.view(start, end, columns);
    expect(view.x.length).toBe(2 * columns);
    const first = Math.floor(start * rate);
    const count = Math.min(x.length, Math.ceil(end * rate) + 1) - first;
    for (let c = 0; c < columns; c++) {
      const from = first + Math.floor((c * count) / columns);
      const to = first + Math.floor(((c + 1) * count) / columns);
      let lo = Infinity;
      let hi = -Infinity;
      for (let i = from; i < to; i++) {
        lo = Math.min(lo, x[i]);
        hi = Math.max(hi, x[i]);
      }
      expect(view.y[2 * c]).toBe(lo);
      expect(view.y[2 * c + 1]).toBe(hi);
      expect(view.x[2 * c]).toBe(from / rate);
    }
  });

  it('keeps a one-sample spike at any zoom', () => {
    const x = new Float32Array(2_000_000);
    x[1_234_567] = 5;
    x[7] = -3;
    const trace = new MinMaxTrace(x, 192000);
    const view = trace.view(0, x.length / 192000, 300);
    expect(Math.max(...view.y)).toBe(5);
    expect(Math.min(...view.y)).toBe(-3);
  });

  it('returns the raw samples when the view holds fewer than two per column', () => {
    const x = noise(50, 3);
    const trace = new MinMaxTrace(x, 100);
    const view = trace.view(0.1, 0.3, 400);
    expect(Array.from(view.y)).toEqual(Array.from(x.subarray(10, 31)));
    expect(view.x[0]).toBeCloseTo(0.1, 12);
    expect(trace.valueAt(0.2)).toBe(x[20]);
    expect(trace.valueAt(5)).toBeNull();
  });

  it('summarises a minute at 192 kHz for a 1500-pixel view in a few milliseconds', () => {
    const x = noise(60 * 192000, 9);
    const trace = new MinMaxTrace(x, 192000);
    const started = performance.now();
    for (let k = 0; k < 10; k++) trace.view(0, 60, 1500);
    const perViewMs = (performance.now() - started) / 10;
    // Block summaries: about 45 k blocks per view instead of 11.5 M samples (a generous bound for a shared 2-core machine).
    expect(perViewMs).toBeLessThan(40);
  });
});
