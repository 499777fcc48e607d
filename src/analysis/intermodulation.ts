/**
 * Intermodulation distortion from a two-tone record. Tone frequencies are
 * the known excitation's; each product is read by power summation (spectrum.ts).
 *
 * Modulation method (SMPTE RP120; DIN / IEC 60268-3 "modulation distortion"):
 * a low tone f1 (e.g. 60 Hz) and a high tone f2 (e.g. 7 kHz) at 4:1 amplitude.
 *   total = √(Σ_{n=1..orders} [A(f2−n·f1)² + A(f2+n·f1)²]) / A(f2)
 * (rms sum of the sidebands relative to the upper tone), and per order n
 *   d_{n+1} = [A(f2−n·f1) + A(f2+n·f1)] / A(f2)
 * (arithmetic sum of the order's pair: the IEC 60268-3 per-order form, from memory).
 *
 * Difference-frequency method (CCIF / ITU-R; IEC 60268-3): two equal tones
 * close together (e.g. 19 and 20 kHz), products referred to twice the f2
 * amplitude (the IEC 60268-3 reference level, as summarised in audio-analyser
 * documentation; from memory otherwise):
 *   d2 = A(f2−f1) / (2·A(f2)),  d3 = [A(2f1−f2) + A(2f2−f1)] / (2·A(f2)).
 */
import { InputError } from '../errors.ts';
import { amplitudeDb } from './decibels.ts';
import { highestToneHertz, powerSpectrum, toneAmplitude, type PowerSpectrum } from './spectrum.ts';
import { checkRange } from './validate.ts';

export interface ModulationImdOptions {
  lowToneHertz: number;
  highToneHertz: number;
  /** Sideband orders n = 1..orders; default 3. */
  orders?: number;
}

export interface ModulationImdResult {
  /** rms-summed sidebands / A(f2), ratio and dB. */
  readonly total: number;
  readonly totalDb: number;
  /** Per order n (index n−1): (A(f2−nf1) + A(f2+nf1)) / A(f2). */
  readonly perOrder: readonly number[];
  readonly highToneAmplitude: number;
  readonly orders: number;
}

export function modulationImd(samples: ArrayLike<number>, rateHertz: number, options: ModulationImdOptions): ModulationImdResult {
  const spectrum = powerSpectrum(samples, rateHertz);
  const { lowToneHertz, highToneHertz } = options;
  const orders = options.orders ?? 3;
  if (!Number.isInteger(orders) || orders < 1) throw new InputError('orders', 'a whole number of at least 1', `got ${orders}`);
  checkTones(spectrum, 'lowToneHertz', lowToneHertz, 'highToneHertz', highToneHertz);
  if (highToneHertz - orders * lowToneHertz <= 0 || highToneHertz + orders * lowToneHertz > highestToneHertz(spectrum)) {
    throw new InputError('orders', `sidebands f2 ± n·f1 between 0 Hz and ${highestToneHertz(spectrum).toFixed(1)} Hz`, `order ${orders} falls outside`);
  }
  const carrier = toneAmplitude(spectrum, highToneHertz);
  if (!(carrier > 0)) throw new InputError('samples', `a tone at ${highToneHertz} Hz`, 'its amplitude is zero');
  let squares = 0;
  const perOrder: number[] = [];
  for (let n = 1; n <= orders; n++) {
    const lower = toneAmplitude(spectrum, highToneHertz - n * lowToneHertz);
    const upper = toneAmplitude(spectrum, highToneHertz + n * lowToneHertz);
    squares += lower * lower + upper * upper;
    perOrder.push((lower + upper) / carrier);
  }
  const total = Math.sqrt(squares) / carrier;
  return { total, totalDb: amplitudeDb(total), perOrder, highToneAmplitude: carrier, orders };
}

export interface DifferenceFrequencyImdOptions {
  lowToneHertz: number;
  highToneHertz: number;
}

export interface DifferenceFrequencyImdResult {
  readonly secondOrder: number;
  readonly secondOrderDb: number;
  readonly thirdOrder: number;
  readonly thirdOrderDb: number;
  readonly highToneAmplitude: number;
}

export function differenceFrequencyImd(
  samples: ArrayLike<number>,
  rateHertz: number,
  options: DifferenceFrequencyImdOptions,
): DifferenceFrequencyImdResult {
  const spectrum = powerSpectrum(samples, rateHertz);
  const { lowToneHertz: f1, highToneHertz: f2 } = options;
  checkTones(spectrum, 'lowToneHertz', f1, 'highToneHertz', f2);
  if (2 * f2 - f1 > highestToneHertz(spectrum)) {
    throw new InputError('highToneHertz', `2·f2 − f1 below ${highestToneHertz(spectrum).toFixed(1)} Hz so the third-order product is measurable`, `got ${f2}`);
  }
  const reference = 2 * toneAmplitude(spectrum, f2);
  if (!(reference > 0)) throw new InputError('samples', `a tone at ${f2} Hz`, 'its amplitude is zero');
  const secondOrder = toneAmplitude(spectrum, f2 - f1) / reference;
  const thirdOrder = (toneAmplitude(spectrum, 2 * f1 - f2) + toneAmplitude(spectrum, 2 * f2 - f1)) / reference;
  return {
    secondOrder,
    secondOrderDb: amplitudeDb(secondOrder),
    thirdOrder,
    thirdOrderDb: amplitudeDb(thirdOrder),
    highToneAmplitude: reference / 2,
  };
}

/** Both tones in range, f1 < f2, and far enough apart that their lobes and products do not overlap. */
function checkTones(spectrum: PowerSpectrum, lowName: string, lowHertz: number, highName: string, highHertz: number): void {
  const top = highestToneHertz(spectrum);
  checkRange(lowName, lowHertz, 0, top, `a frequency from 0 to ${top.toFixed(1)} Hz`);
  checkRange(highName, highHertz, lowHertz, top, `a frequency above ${lowName} and below ${top.toFixed(1)} Hz`);
  const spacingHertz = Math.min(lowHertz, highHertz - lowHertz);
  const neededHertz = (2 * spectrum.toneHalfWidthBins + 1) * spectrum.binHertz;
  if (spacingHertz < neededHertz) {
    throw new InputError(
      'samples.length',
      `a record long enough to resolve tones ${spacingHertz} Hz apart (they need ${neededHertz.toFixed(2)} Hz at this length)`,
      `got ${spectrum.recordLength} samples`,
    );
  }
}
