/**
 * THD+N and SINAD, in the style of AES17 and IEC 60268-3: the rms of what is
 * left after the fundamental is notched out, measured in a stated band
 * (default 20 Hz–20 kHz), relative to the rms of the whole signal in that band.
 *
 * The notch here is exact rather than a filter: a least-squares sine (IEEE
 * Std 1057 four-parameter fit: frequency, amplitude, phase, offset) is fitted
 * and subtracted, so the residual holds harmonics, noise and anything else.
 * The residual is band-limited by summing its windowed power spectrum
 * (Blackman–Harris) over the band; the total in the band is that plus the
 * fundamental's A²/2 when the fundamental is in the band.
 *   THD+N = √(residual in band / total in band),  SINAD = −20·log10(THD+N).
 */
import { InputError } from '../errors.ts';
import { amplitudeDb } from './decibels.ts';
import { fitSine, sineFitValue } from './sine-fit.ts';
import { bandPower, highestToneHertz, powerSpectrum } from './spectrum.ts';
import { findFundamental } from './thd.ts';
import { checkRange } from './validate.ts';

export interface ThdPlusNoiseOptions {
  /** Known fundamental; default: the strongest tone in the band. Refined by the fit either way. */
  fundamentalHertz?: number;
  /** Measurement band; default 20 Hz to 20 kHz (clipped to Nyquist). */
  bandLowHertz?: number;
  bandHighHertz?: number;
}

export interface ThdPlusNoiseResult {
  readonly fundamentalHertz: number;
  readonly fundamentalAmplitude: number;
  /** THD+N as a ratio, and −SINAD in dB. */
  readonly thdPlusNoise: number;
  readonly thdPlusNoiseDb: number;
  readonly sinadDb: number;
  /** Rms of the residual and of the whole signal, both within the band. */
  readonly residualRms: number;
  readonly totalRms: number;
  readonly bandLowHertz: number;
  readonly bandHighHertz: number;
}

export function thdPlusNoise(samples: ArrayLike<number>, rateHertz: number, options: ThdPlusNoiseOptions = {}): ThdPlusNoiseResult {
  const spectrum = powerSpectrum(samples, rateHertz, { window: 'blackman-harris' });
  const nyquistHertz = rateHertz / 2;
  const bandLowHertz = options.bandLowHertz ?? 20;
  const bandHighHertz = Math.min(options.bandHighHertz ?? 20000, nyquistHertz);
  checkRange('bandLowHertz', bandLowHertz, 0, nyquistHertz, `a frequency from 0 to ${nyquistHertz} Hz`);
  checkRange('bandHighHertz', options.bandHighHertz ?? bandHighHertz, 0, Infinity, 'a positive frequency in hertz');
  if (bandHighHertz <= bandLowHertz) {
    throw new InputError('bandHighHertz', `above bandLowHertz (${bandLowHertz} Hz)`, `got ${bandHighHertz}`);
  }
  const estimate = findFundamental(samples, spectrum, options.fundamentalHertz, Math.min(bandHighHertz, highestToneHertz(spectrum)));
  const fit = fitSine(samples, rateHertz, estimate);
  const length = samples.length;
  const residual = new Float64Array(length);
  for (let n = 0; n < length; n++) residual[n] = samples[n] - sineFitValue(fit, rateHertz, length, n);
  const residualSpectrum = powerSpectrum(residual, rateHertz, { window: 'blackman-harris' });
  const residualPower = bandPower(residualSpectrum, bandLowHertz, bandHighHertz);
  const fundamentalInBand = fit.hertz >= bandLowHertz && fit.hertz <= bandHighHertz;
  const totalPower = residualPower + (fundamentalInBand ? (fit.amplitude * fit.amplitude) / 2 : 0);
  if (!(totalPower > 0)) {
    throw new InputError('samples', `a signal with content between ${bandLowHertz} and ${bandHighHertz} Hz`, 'the band is silent');
  }
  const ratio = Math.sqrt(residualPower / totalPower);
  return {
    fundamentalHertz: fit.hertz,
    fundamentalAmplitude: fit.amplitude,
    thdPlusNoise: ratio,
    thdPlusNoiseDb: amplitudeDb(ratio),
    sinadDb: -amplitudeDb(ratio),
    residualRms: Math.sqrt(residualPower),
    totalRms: Math.sqrt(totalPower),
    bandLowHertz,
    bandHighHertz,
  };
}
