/**
 * Level matching for listening: every signal is played at the same rms, so
 * switching between the clean source, a tap and the far end compares sound,
 * not loudness. The mean is removed first (an LED current rides on its bias).
 * The safe-level limiter of toAudioBuffer comes after this gain, always.
 */
import { formatEngineering } from '../../src/units/engineering.ts';

/** Level every signal is played at, before the limiter (common practice for speech material, no source). */
export const MATCHED_RMS_DBFS = -26;

export interface PlayableSignal {
  id: string;
  label: string;
  samples: ArrayLike<number>;
  rateHertz: number;
  /** SI unit of the samples: V, A, W or Pa. */
  unit: string;
}

export interface MatchedSignal {
  /** Samples scaled to unit rms about their mean (multiply by 10^(MATCHED_RMS_DBFS/20) to play). */
  normalised: Float64Array;
  rms: number;
  /** dB added to bring 1 unit (1 V, 1 A…) to full scale and then to the matched level. */
  gainDb: number;
}

export function matchLevel(signal: PlayableSignal): MatchedSignal | null {
  const n = signal.samples.length;
  if (n === 0) return null;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += signal.samples[i];
  mean /= n;
  let squares = 0;
  for (let i = 0; i < n; i++) squares += (signal.samples[i] - mean) ** 2;
  const rms = Math.sqrt(squares / n);
  if (!(rms > 0) || !Number.isFinite(rms)) return null;
  const normalised = new Float64Array(n);
  for (let i = 0; i < n; i++) normalised[i] = (signal.samples[i] - mean) / rms;
  return { normalised, rms, gainDb: MATCHED_RMS_DBFS - 20 * Math.log10(rms) };
}

/** "12.3 mV rms, raised 7.2 dB" for the page. */
export function describeMatch(signal: PlayableSignal, match: MatchedSignal): string {
  const sign = match.gainDb >= 0 ? '+' : '−';
  return `${signal.label}: ${formatEngineering(match.rms, signal.unit)} rms → ${MATCHED_RMS_DBFS} dBFS (${sign}${Math.abs(match.gainDb).toFixed(1)} dB re 1 ${signal.unit} = full scale)`;
}
