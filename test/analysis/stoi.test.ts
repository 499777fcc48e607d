import { describe, expect, it } from 'vitest';
import { STOI_CLIP_FACTOR, STOI_PARAMETERS, stoi, stoiAligned, stoiBands } from '../../src/analysis/stoi.ts';
import { speechLike, withNoise } from './speech-like.ts';

const RATE = 16000;

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
    expect(scores[4]).toBeLessThan(0.6);
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
    const delaySamples = Math.round(0.137 * RATE);
    const delayed = new Float64Array(y.length);
    for (let n = delaySamples; n < y.length; n++) delayed[n] = 0.4 * y[n - delaySamples];
    const reference = stoi(x, y, RATE);
    expect(Math.abs(stoiAligned(x, delayed, RATE, { maxLagSeconds: 0.5 }) - reference)).toBeLessThan(0.01);
    // Without alignment the delay ruins the score.
    expect(stoi(x, delayed, RATE)).toBeLessThan(reference - 0.1);
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

  it('rejects signals too short for one 30-frame segment, and silence', () => {
    const short = speechLike(10000, 0.3);
    expect(() => stoi(short, short, 10000)).toThrow(/at least 30 frames/);
    expect(() => stoi(new Float64Array(10000), new Float64Array(10000), 10000)).toThrow(/clean: .*silent/);
    expect(() => stoi(new Float64Array(10), new Float64Array(11), 10000)).toThrow(/degraded/);
  });
});
