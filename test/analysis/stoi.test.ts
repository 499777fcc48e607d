import { describe, expect, it } from 'vitest';
import { STOI_CLIP_FACTOR, STOI_PARAMETERS, stoi, stoiAligned, stoiBands } from '../../src/analysis/stoi.ts';
import { speechLike as speechSignal } from '../../src/audio/signals/speech-like.ts';
import { withNoise } from './speech-like.ts';

const RATE = 16000;

/** The project's own speech-like signal (src/audio/signals/speech-like.ts), 0.1 rms. */
function speechLike(rateHertz: number, seconds: number, seed = 1): Float64Array {
  return speechSignal({ sampleRateHertz: rateHertz, seconds, rmsAmplitude: 0.1, seed });
}

describe('stoi', () => {
  it('uses the paper’s parameters (Taal et al., IEEE TASLP 19(7), 2011, sec. II)', () => {
    expect(STOI_PARAMETERS).toMatchObject({
      rateHertz: 10000,
      frameSamples: 256,
      hopSamples: 128,
      fftSize: 512,
      bandCount: 15,
      lowestCentreHertz: 150,
      segmentFrames: 30,
      betaDb: -15,
      dynamicRangeDb: 40,
    });
    // 1 + 10^(15/20) = 1 + 5.623413 (β = −15 dB)
    expect(STOI_CLIP_FACTOR).toBeCloseTo(6.623413, 6);
    const { centresHertz, lowBins, highBins } = stoiBands();
    for (let k = 0; k < 15; k++) expect(centresHertz[k]).toBeCloseTo(150 * 2 ** (k / 3), 9);
    expect(centresHertz[14]).toBeCloseTo(3809.76, 2);
    // Edges 133.63 Hz and 4276.31 Hz fall nearest to bins 7 (136.7 Hz) and 219 (4277.3 Hz) at 10 kHz / 512.
    expect(lowBins[0]).toBe(7);
    expect(highBins[14]).toBe(219);
    for (let k = 1; k < 15; k++) expect(lowBins[k]).toBe(highBins[k - 1]); // contiguous bands
  });

  it('scores identical signals 1 (to 1e−6)', () => {
    const x = speechLike(RATE, 3);
    expect(stoi(x, x, RATE)).toBeCloseTo(1, 6);
  });

  it('falls monotonically as white noise is added at +20, +10, 0, −5, −10 dB SNR', () => {
    const x = speechLike(RATE, 4);
    const scores = [20, 10, 0, -5, -10].map((snr, i) => stoi(x, withNoise(x, snr, 100 + i), RATE));
    for (let i = 1; i < scores.length; i++) expect(scores[i]).toBeLessThan(scores[i - 1]);
    expect(scores[0]).toBeGreaterThan(0.9);
    expect(scores[0] - scores[4]).toBeGreaterThan(0.2);
  });

  it('ignores a change of gain (exactly, to rounding)', () => {
    const x = speechLike(10000, 3);
    const y = withNoise(x, 0, 5);
    const louder = y.map((v) => v * 7.3);
    expect(stoi(x, louder, 10000)).toBeCloseTo(stoi(x, y, 10000), 12);
  });

  it('after alignment, ignores a delay within the search range (within 0.01)', () => {
    const x = speechLike(RATE, 4);
    const y = withNoise(x, 0, 9);
    const delaySamples = 2194; // 0.137125 s: not a whole number of 10 kHz samples (1371.25), so alignment is not exact
    // A recording that captured all of the delayed output: longer than the clean signal.
    const delayed = new Float64Array(y.length + delaySamples);
    for (let n = 0; n < y.length; n++) delayed[n + delaySamples] = 0.4 * y[n];
    const reference = stoi(x, y, RATE);
    expect(Math.abs(stoiAligned(x, delayed, RATE, { maxLagSeconds: 0.5 }) - reference)).toBeLessThan(0.01);
    // Without alignment the delay ruins the score.
    expect(stoi(x, delayed.subarray(0, x.length), RATE)).toBeLessThan(reference - 0.1);
  });

  it('takes well under a second for 10 s at 48 kHz', () => {
    const x = speechLike(48000, 10);
    const y = withNoise(x, 5, 2);
    const start = performance.now();
    const score = stoiAligned(x, y, 48000);
    const elapsed = performance.now() - start;
    expect(score).toBeGreaterThan(0);
    expect(elapsed).toBeLessThan(1500); // generous for a shared 2-core machine; see the report for the figure
  });

  it('keeps the last clean signal at 10 kHz for the next call, with the same score to the bit as resampling it afresh', () => {
    const x = speechLike(48000, 3);
    const other = speechLike(48000, 3, 7);
    const y1 = withNoise(x, 5, 1);
    const y2 = withNoise(x, 0, 2);
    stoi(other, other, 48000);
    const fresh = stoi(x, y2, 48000); // x resampled: another clean signal was kept
    stoi(x, y1, 48000);
    expect(stoi(x, y2, 48000)).toBe(fresh); // x kept from the call before
    expect(stoiAligned(x, y2, 48000)).toBe(stoiAligned(x, y2, 48000));
    // A clean signal changed in place after a call is resampled again, not taken for the kept one.
    x[24000] += 0.2;
    const changed = stoi(x, y2, 48000);
    expect(changed).not.toBe(fresh);
    stoi(other, other, 48000);
    expect(stoi(x, y2, 48000)).toBe(changed);
  });

  it('rejects signals too short for one 30-frame segment, and silence', () => {
    const short = speechLike(10000, 0.3);
    expect(() => stoi(short, short, 10000)).toThrow(/at least 30 frames/);
    expect(() => stoi(new Float64Array(10000), new Float64Array(10000), 10000)).toThrow(/clean: .*silent/);
    expect(() => stoi(new Float64Array(10), new Float64Array(11), 10000)).toThrow(/degraded/);
  });
});
