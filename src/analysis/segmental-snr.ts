/**
 * Segmental SNR: the mean over frames of each frame's SNR in dB,
 *   SNR_m = 10·log10(Σ s² / Σ (s − ŝ)²), clamped to [−10, 35] dB,
 * with s the clean and ŝ the degraded signal (Quackenbush, Barnwell &
 * Clements, "Objective Measures of Speech Quality", Prentice-Hall 1988;
 * clamping limits as in Hansen & Pellom, "An effective quality evaluation
 * protocol for speech enhancement algorithms", ICSLP 1998). Frames are 20 ms
 * by default, not overlapped; a last partial frame is dropped. The clamp keeps
 * silent frames (where any error gives a hugely negative SNR) and perfect
 * frames (+∞) from dominating. Optionally only active frames count: those
 * within `activeRangeDb` (default 40 dB) of the loudest clean frame (common
 * practice, no source). The signals must already be time-aligned
 * and level-matched (see align.ts): segmental SNR punishes any delay.
 */
import { InputError } from '../errors.ts';
import { checkRange, checkRate, checkSameLength, checkSamples } from './validate.ts';

export interface SegmentalSnrOptions {
  /** Frame length; default 0.02 s. */
  frameSeconds?: number;
  /** Clamp limits per frame; default −10 and 35 dB. */
  floorDb?: number;
  ceilingDb?: number;
  /** Average over active frames only; default false. */
  activeOnly?: boolean;
  activeRangeDb?: number;
}

export interface SegmentalSnrResult {
  readonly segmentalSnrDb: number;
  /** Each frame's clamped SNR, in order. */
  readonly frameSnrDb: Float64Array;
  readonly frameSamples: number;
  readonly framesUsed: number;
}

export function segmentalSnr(
  clean: ArrayLike<number>,
  degraded: ArrayLike<number>,
  rateHertz: number,
  options: SegmentalSnrOptions = {},
): SegmentalSnrResult {
  checkRate('rateHertz', rateHertz);
  checkSamples('clean', clean);
  checkSamples('degraded', degraded);
  checkSameLength('clean', clean, 'degraded', degraded);
  const frameSeconds = options.frameSeconds ?? 0.02;
  checkRange('frameSeconds', frameSeconds, 0, Infinity, 'a positive duration in seconds');
  const floorDb = options.floorDb ?? -10;
  const ceilingDb = options.ceilingDb ?? 35;
  if (!(ceilingDb > floorDb)) throw new InputError('ceilingDb', `above floorDb (${floorDb})`, `got ${ceilingDb}`);
  const frameSamples = Math.round(frameSeconds * rateHertz);
  const frameCount = Math.floor(clean.length / frameSamples);
  if (frameSamples < 1 || frameCount < 1) {
    throw new InputError('clean', `at least one ${frameSeconds} s frame (${Math.max(1, frameSamples)} samples)`, `got ${clean.length} samples`);
  }
  const frameSnrDb = new Float64Array(frameCount);
  const signalEnergy = new Float64Array(frameCount);
  for (let m = 0; m < frameCount; m++) {
    let signal = 0;
    let error = 0;
    for (let n = m * frameSamples; n < (m + 1) * frameSamples; n++) {
      const difference = clean[n] - degraded[n];
      signal += clean[n] * clean[n];
      error += difference * difference;
    }
    signalEnergy[m] = signal;
    // Exact frames (error 0) take the ceiling; silent clean frames with any error take the floor.
    const snrDb = error === 0 ? ceilingDb : signal === 0 ? floorDb : 10 * Math.log10(signal / error);
    frameSnrDb[m] = Math.min(ceilingDb, Math.max(floorDb, snrDb));
  }
  let threshold = -Infinity;
  if (options.activeOnly) {
    const rangeDb = options.activeRangeDb ?? 40;
    checkRange('activeRangeDb', rangeDb, 0, Infinity, 'a positive range in dB');
    let loudest = 0;
    for (let m = 0; m < frameCount; m++) loudest = Math.max(loudest, signalEnergy[m]);
    if (loudest === 0) throw new InputError('clean', 'some non-silent frames when activeOnly is set', 'the clean signal is silent');
    threshold = loudest * 10 ** (-rangeDb / 10);
  }
  let sum = 0;
  let used = 0;
  for (let m = 0; m < frameCount; m++) {
    if (signalEnergy[m] >= threshold && (!options.activeOnly || signalEnergy[m] > 0)) {
      sum += frameSnrDb[m];
      used++;
    }
  }
  return { segmentalSnrDb: sum / used, frameSnrDb, frameSamples, framesUsed: used };
}
