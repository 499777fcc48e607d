/** A sine tone: x[n] = A·sin(2π f n / fs + φ), time from the sample index (no accumulated phase). */
import { applyFades, requireAudibleAt, requireFinite, requireNonNegative, sampleCount } from './arguments.ts';

export interface ToneOptions {
  sampleRateHertz: number;
  frequencyHertz: number;
  /** Peak amplitude A (the rms is A/√2). */
  peakAmplitude: number;
  seconds: number;
  /** Raised-cosine fade at both ends against clicks; default 0 (none). */
  fadeSeconds?: number;
  /** Starting phase; default 0. */
  phaseRadians?: number;
}

export function tone(options: ToneOptions): Float64Array {
  const { sampleRateHertz, frequencyHertz, peakAmplitude, seconds } = options;
  const count = sampleCount(seconds, sampleRateHertz);
  requireAudibleAt('frequencyHertz', frequencyHertz, sampleRateHertz);
  requireNonNegative('peakAmplitude', peakAmplitude);
  const phase = requireFinite('phaseRadians', options.phaseRadians ?? 0);
  const samples = new Float64Array(count);
  const radiansPerSample = (2 * Math.PI * frequencyHertz) / sampleRateHertz;
  for (let n = 0; n < count; n++) samples[n] = peakAmplitude * Math.sin(radiansPerSample * n + phase);
  applyFades(samples, options.fadeSeconds ?? 0, sampleRateHertz);
  return samples;
}
