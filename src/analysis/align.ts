/**
 * Time alignment and level matching of a degraded signal to its clean reference,
 * as needed before STOI or segmental SNR.
 *
 * Delay: the lag l in [−maxLag, +maxLag] maximising |r(l)|, r(l) = Σ_n c[n]·d[n + l],
 * computed for all lags in the range at once by FFT (cross-correlation.ts). The magnitude is used because an inverting amplifier stage flips
 * the sign; the gain below then comes out negative. Whole samples only.
 * Level: the least-squares gain g = Σ c·d′ / Σ d′² for the shifted signal d′,
 * which minimises Σ (c − g·d′)².
 */
import { InputError } from '../errors.ts';
import { crossCorrelation } from './cross-correlation.ts';
import { checkRange, checkRate, checkSamples } from './validate.ts';

export interface AlignOptions {
  /** Largest delay searched either way; default 0.5 s. */
  maxLagSeconds?: number;
  /** Scale by the least-squares gain; default true. */
  matchLevel?: boolean;
}

export interface Alignment {
  /** Delay of the degraded signal behind the clean one (negative: ahead). */
  readonly lagSamples: number;
  readonly lagSeconds: number;
  /** Gain applied to the shifted degraded signal (1 when matchLevel is false). */
  readonly gain: number;
  /** The degraded signal shifted (and scaled) onto the clean one's time base; the clean length; zeros where it had no samples. */
  readonly aligned: Float64Array;
}

export function align(clean: ArrayLike<number>, degraded: ArrayLike<number>, rateHertz: number, options: AlignOptions = {}): Alignment {
  checkRate('rateHertz', rateHertz);
  checkSamples('clean', clean);
  checkSamples('degraded', degraded);
  const maxLagSeconds = options.maxLagSeconds ?? 0.5;
  checkRange('maxLagSeconds', maxLagSeconds, 0, Infinity, 'a duration of 0 s or more');
  const maxLag = Math.round(maxLagSeconds * rateHertz);
  const highest = Math.min(maxLag, degraded.length - 1);
  const lowest = -Math.min(maxLag, clean.length - 1);
  const correlation = crossCorrelation(clean, degraded, lowest, highest);
  let bestLag = 0;
  let best = -1;
  for (let lag = lowest; lag <= highest; lag++) {
    const value = Math.abs(correlation[lag - lowest]);
    // Ties (e.g. silence) go to the smallest delay.
    if (value > best || (value === best && Math.abs(lag) < Math.abs(bestLag))) {
      best = value;
      bestLag = lag;
    }
  }
  const aligned = new Float64Array(clean.length);
  let cross = 0;
  let power = 0;
  for (let n = 0; n < clean.length; n++) {
    const source = n + bestLag;
    const value = source >= 0 && source < degraded.length ? degraded[source] : 0;
    aligned[n] = value;
    cross += clean[n] * value;
    power += value * value;
  }
  let gain = 1;
  if (options.matchLevel ?? true) {
    if (power === 0) throw new InputError('degraded', 'a signal that overlaps the clean one after alignment', 'it is silent there');
    gain = cross / power;
    for (let n = 0; n < aligned.length; n++) aligned[n] *= gain;
  }
  return { lagSamples: bestLag, lagSeconds: bestLag / rateHertz, gain, aligned };
}
