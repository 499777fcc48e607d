/**
 * Total harmonic distortion of a single-tone record.
 *
 * THD_F = √(Σ_{n=2..N} V_n²) / V_1: relative to the fundamental (IEC 60050
 * IEV 551-20-13 "total harmonic factor", the IEC definition). THD_R =
 * √(Σ_{n=2..N} V_n²) / √(Σ_{n=1..N} V_n²): relative to the rms of the
 * fundamental plus the harmonics (the older "distortion factor"). V_n are
 * harmonic amplitudes read by power summation (see spectrum.ts); the mean is
 * removed first, so DC is not a harmonic. N is the harmonic count asked for,
 * or every harmonic up to the analysis bandwidth (default 20 kHz or the
 * highest frequency clear of Nyquist, whichever is lower); orders beyond the
 * bandwidth or Nyquist are left out and the result says so in `excluded`.
 * Harmonics that alias back below Nyquist in the sampled record are not
 * separated (as in any sampled measurement).
 */
import { InputError } from '../errors.ts';
import { amplitudeDb } from './decibels.ts';
import { fitSine } from './sine-fit.ts';
import { highestToneHertz, powerSpectrum, strongestToneHertz, toneAmplitude, type PowerSpectrum, type SpectrumOptions } from './spectrum.ts';
import { checkRange } from './validate.ts';

export interface ThdOptions extends SpectrumOptions {
  /** Known fundamental; default: the strongest tone in 10 Hz..bandUpperHertz, refined by a sine fit. */
  fundamentalHertz?: number;
  /** Highest harmonic order N to include (≥ 2); default: all within the band. */
  harmonicCount?: number;
  /** Upper edge of the analysis bandwidth; default 20 kHz (or less near Nyquist). */
  bandUpperHertz?: number;
}

export interface HarmonicLevel {
  readonly order: number;
  readonly hertz: number;
  /** Peak amplitude in signal units. */
  readonly amplitude: number;
  /** 20·log10(V_n / V_1). */
  readonly dbc: number;
}

export interface ThdResult {
  readonly fundamentalHertz: number;
  readonly fundamentalAmplitude: number;
  /** Orders 2..highestOrder. */
  readonly harmonics: readonly HarmonicLevel[];
  readonly highestOrder: number;
  readonly bandUpperHertz: number;
  /** THD_F as a ratio (not %), and in dB. */
  readonly thdFundamental: number;
  readonly thdFundamentalDb: number;
  /** THD_R: relative to the rms of fundamental plus harmonics. */
  readonly thdTotal: number;
  /** Orders asked for but left out, and why; null when none were. */
  readonly excluded: { readonly fromOrder: number; readonly toOrder: number; readonly reason: string } | null;
  readonly window: string;
  readonly coherent: boolean;
}

export function thd(samples: ArrayLike<number>, rateHertz: number, options: ThdOptions = {}): ThdResult {
  const spectrum = powerSpectrum(samples, rateHertz, options);
  const edgeHertz = highestToneHertz(spectrum);
  const bandUpperHertz = Math.min(options.bandUpperHertz ?? 20000, edgeHertz);
  if (options.bandUpperHertz !== undefined) checkRange('bandUpperHertz', options.bandUpperHertz, 0, Infinity, 'a positive frequency in hertz');
  const fundamentalHertz = findFundamental(samples, spectrum, options.fundamentalHertz, bandUpperHertz);
  const fundamentalAmplitude = toneAmplitude(spectrum, fundamentalHertz);
  if (!(fundamentalAmplitude > 0)) {
    throw new InputError('samples', `a tone at ${fundamentalHertz} Hz`, 'its amplitude is zero');
  }
  const fitsInBand = Math.floor(bandUpperHertz / fundamentalHertz + 1e-9);
  let highestOrder = fitsInBand;
  let excluded: ThdResult['excluded'] = null;
  if (options.harmonicCount !== undefined) {
    if (!Number.isInteger(options.harmonicCount) || options.harmonicCount < 2) {
      throw new InputError('harmonicCount', 'a whole number of at least 2', `got ${options.harmonicCount}`);
    }
    highestOrder = Math.min(options.harmonicCount, fitsInBand);
    if (options.harmonicCount > fitsInBand) {
      const limitedByNyquist = bandUpperHertz === edgeHertz;
      excluded = {
        fromOrder: fitsInBand + 1,
        toOrder: options.harmonicCount,
        reason: limitedByNyquist
          ? `above ${edgeHertz.toFixed(1)} Hz, the highest frequency clear of Nyquist`
          : `above the ${bandUpperHertz} Hz analysis bandwidth`,
      };
    }
  }
  if (excluded === null && fitsInBand < 2) {
    const limitedByNyquist = bandUpperHertz === edgeHertz;
    excluded = { fromOrder: 2, toOrder: 2, reason: limitedByNyquist ? 'above the highest frequency clear of Nyquist' : `above the ${bandUpperHertz} Hz analysis bandwidth` };
  }
  const harmonics: HarmonicLevel[] = [];
  let harmonicSquares = 0;
  for (let order = 2; order <= highestOrder; order++) {
    const hertz = order * fundamentalHertz;
    const amplitude = toneAmplitude(spectrum, hertz);
    harmonicSquares += amplitude * amplitude;
    harmonics.push({ order, hertz, amplitude, dbc: amplitudeDb(amplitude / fundamentalAmplitude) });
  }
  const thdFundamental = Math.sqrt(harmonicSquares) / fundamentalAmplitude;
  const thdTotal = Math.sqrt(harmonicSquares / (harmonicSquares + fundamentalAmplitude * fundamentalAmplitude));
  return {
    fundamentalHertz,
    fundamentalAmplitude,
    harmonics,
    highestOrder: Math.max(1, highestOrder),
    bandUpperHertz,
    thdFundamental,
    thdFundamentalDb: amplitudeDb(thdFundamental),
    thdTotal,
    excluded,
    window: spectrum.window,
    coherent: spectrum.coherent,
  };
}

/** The fundamental: as given (checked), or found and refined. Shared with THD+N. */
export function findFundamental(
  samples: ArrayLike<number>,
  spectrum: PowerSpectrum,
  givenHertz: number | undefined,
  searchUpperHertz: number,
): number {
  const recordBinHertz = spectrum.rateHertz / spectrum.recordLength;
  // Harmonic lobes must not overlap: the fundamental needs 2·halfWidth+1 padded bins.
  const lowestHertz = Math.max(2 * spectrum.toneHalfWidthBins + 1, 1) * spectrum.binHertz;
  let hertz: number;
  if (givenHertz !== undefined) {
    checkRange('fundamentalHertz', givenHertz, 0, Infinity, 'a positive frequency in hertz');
    hertz = givenHertz;
  } else {
    const estimate = strongestToneHertz(spectrum, Math.max(10, lowestHertz), searchUpperHertz);
    hertz = spectrum.coherent ? estimate : fitSine(samples, spectrum.rateHertz, estimate).hertz;
  }
  if (hertz < lowestHertz) {
    throw new InputError(
      'fundamentalHertz',
      `at least ${lowestHertz.toFixed(3)} Hz for a ${spectrum.recordLength}-sample record (or a longer record)`,
      `got ${hertz}`,
    );
  }
  if (hertz > highestToneHertz(spectrum)) {
    throw new InputError('fundamentalHertz', `below ${highestToneHertz(spectrum).toFixed(1)} Hz (clear of Nyquist)`, `got ${hertz}`);
  }
  if (spectrum.coherent) {
    const cycles = hertz / recordBinHertz;
    if (Math.abs(cycles - Math.round(cycles)) > 1e-6) {
      throw new InputError('fundamentalHertz', 'a whole number of cycles in the record for coherent analysis', `got ${cycles} cycles`);
    }
  }
  return hertz;
}
