import { describe, expect, it } from 'vitest';
import { segmentalSnr } from '../../src/analysis/segmental-snr.ts';
import { speechLike } from './speech-like.ts';

const RATE = 16000;

describe('segmentalSnr', () => {
  it('of y = (1 + c)·x is −20·log10|c| in every frame (definition, Quackenbush et al. 1988)', () => {
    const x = speechLike(RATE, 1.0).subarray(0, 16000); // first second: no pause
    const result = segmentalSnr(x, x.map((v) => 1.1 * v), RATE);
    expect(result.frameSamples).toBe(320); // 20 ms
    expect(result.framesUsed).toBe(50);
    expect(result.segmentalSnrDb).toBeCloseTo(20, 9);
  });

  it('clamps each frame to [−10, 35] dB (Hansen & Pellom 1998)', () => {
    const x = speechLike(RATE, 1.0).subarray(0, 16000);
    expect(segmentalSnr(x, x, RATE).segmentalSnrDb).toBe(35);
    expect(segmentalSnr(x, x.map((v) => -10 * v), RATE).segmentalSnrDb).toBe(-10);
    expect(segmentalSnr(x, x.map((v) => 1.001 * v), RATE).segmentalSnrDb).toBe(35); // 60 dB, clamped
  });

  it('counts pauses at the floor unless only active frames are averaged', () => {
    const x = speechLike(RATE, 2.5); // pauses 1.0–1.25 s and 2.25–2.5 s
    const y = x.map((v, n) => 1.1 * v + (n % 2 ? 1e-6 : -1e-6));
    const all = segmentalSnr(x, y, RATE);
    const active = segmentalSnr(x, y, RATE, { activeOnly: true });
    expect(all.framesUsed).toBe(125);
    expect(active.framesUsed).toBeLessThan(all.framesUsed);
    expect(active.framesUsed).toBeGreaterThanOrEqual(95);
    expect(all.segmentalSnrDb).toBeLessThan(active.segmentalSnrDb);
    expect(active.segmentalSnrDb).toBeCloseTo(20, 1);
  });

  it('rejects different lengths and records shorter than a frame', () => {
    expect(() => segmentalSnr(new Float64Array(400), new Float64Array(399), RATE)).toThrow(/degraded/);
    expect(() => segmentalSnr(new Float64Array(100), new Float64Array(100), RATE)).toThrow(/at least one 0.02 s frame/);
  });
});
