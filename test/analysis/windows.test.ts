import { describe, expect, it } from 'vitest';
import { realFft } from '../../src/analysis/fft.ts';
import { equivalentNoiseBandwidthBins, windowCoefficients, type WindowKind } from '../../src/analysis/windows.ts';

const LENGTH = 4096; // long enough that the periodic kernel's aliasing does not lift far sidelobes
const OVERSAMPLE = 16; // zero-pad to see the window's continuous spectrum finely

/** |W(f)| in dB re its peak, at fine frequency steps of 1/OVERSAMPLE bin. */
function responseDb(kind: WindowKind): Float64Array {
  const size = LENGTH * OVERSAMPLE;
  const spectrum = realFft(windowCoefficients(kind, LENGTH), size);
  const db = new Float64Array(size / 2 + 1);
  const peak = Math.hypot(spectrum[0], spectrum[1]);
  for (let k = 0; k <= size / 2; k++) db[k] = 20 * Math.log10(Math.hypot(spectrum[2 * k], spectrum[2 * k + 1]) / peak + 1e-300);
  return db;
}

/** Highest level beyond `fromBins` (the first sidelobe region). */
function highestSidelobeDb(db: Float64Array, fromBins: number): number {
  let highest = -Infinity;
  for (let k = fromBins * OVERSAMPLE; k < db.length; k++) highest = Math.max(highest, db[k]);
  return highest;
}

describe('windows', () => {
  it('Hann has an equivalent noise bandwidth of exactly 1.5 bins (Harris 1978, Table 1)', () => {
    expect(equivalentNoiseBandwidthBins(windowCoefficients('hann', LENGTH))).toBeCloseTo(1.5, 12);
  });

  it('Blackman–Harris 4-term has ENBW 2.0044 bins and sidelobes at or below −92 dB (Harris 1978, Table 1)', () => {
    expect(equivalentNoiseBandwidthBins(windowCoefficients('blackman-harris', LENGTH))).toBeCloseTo(2.0044, 4);
    const sidelobe = highestSidelobeDb(responseDb('blackman-harris'), 4);
    expect(sidelobe).toBeLessThan(-92);
    expect(sidelobe).toBeGreaterThan(-93); // and it is the −92 dB design, not a different window
  });

  it('flat-top HFT95 has ENBW 3.8112 bins, sidelobes −95 dB and a passband flat to 0.0044 dB (Heinzel, Rüdiger & Schilling 2002, HFT95)', () => {
    expect(equivalentNoiseBandwidthBins(windowCoefficients('flat-top', LENGTH))).toBeCloseTo(3.8112, 4);
    const db = responseDb('flat-top');
    const sidelobe = highestSidelobeDb(db, 5);
    expect(sidelobe).toBeLessThan(-94.9);
    expect(sidelobe).toBeGreaterThan(-95.5);
    // Flatness: within ±½ bin of a tone the reading stays within 0.0044 dB.
    let worst = 0;
    for (let k = 0; k <= OVERSAMPLE / 2; k++) worst = Math.max(worst, Math.abs(db[k]));
    expect(worst).toBeCloseTo(0.0044, 4);
  });

  it('the rectangular window is all ones', () => {
    expect(Array.from(windowCoefficients('rectangular', 4))).toEqual([1, 1, 1, 1]);
  });

  it('hands out its own copy each time: a caller that writes into one changes nothing for the next', () => {
    const first = windowCoefficients('hann', 1024);
    // Hann at n = L/4 is 0.5 − 0.5·cos(π/2) = 0.5 (Harris 1978, periodic form).
    expect(first[256]).toBeCloseTo(0.5, 15);
    first.fill(7);
    const again = windowCoefficients('hann', 1024);
    expect(again).not.toBe(first);
    expect(again[256]).toBeCloseTo(0.5, 15);
    expect(again[0]).toBe(0);
    const long = windowCoefficients('hann', (1 << 16) + 4);
    long.fill(7);
    expect(windowCoefficients('hann', (1 << 16) + 4)[0]).toBe(0);
  });

  it('rejects unknown kinds and bad lengths', () => {
    expect(() => windowCoefficients('kaiser' as WindowKind, 8)).toThrow(/window: .*expected one of/);
    expect(() => windowCoefficients('hann', 0)).toThrow(/window length/);
  });
});
